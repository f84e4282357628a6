/**
 * Surface points moved to `src/mesh/surface-point.ts` (a core type, now beside the topology it
 * indexes, away from the three.js snapping code). This re-export keeps older imports working.
 * @deprecated Import from `../mesh/surface-point.js` (or the `orthodrome/points` subpath).
 */
export * from '../mesh/surface-point.js';
