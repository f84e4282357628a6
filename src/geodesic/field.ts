/**
 * Moved to shared/field.ts (the solvers' shared types live below the solver
 * folders, so geodesic/exact/ and geodesic/flip/ import them without
 * importing geodesic/). Re-exported here for existing importers.
 */
export * from './shared/field.js';
