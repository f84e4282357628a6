/**
 * Moved: face layouts live in src/metric/layout.ts and surface points in
 * faces in src/metric/face-points.ts (shared by every solver, not only this
 * one). This re-export keeps importers working during the move; import from
 * those files instead.
 * @deprecated
 */
export { layoutAlong, layoutFace, pointSegmentDistance, planarLength } from '../../metric/layout.js';
export { pointInLayout, facesOfPoint, commonFaces, baryInFace } from '../../metric/face-points.js';
