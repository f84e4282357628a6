/**
 * Per-vertex curvature of a surface and its summary (interior vertices only
 * for the statistics; boundary vertices carry the turning instead).
 */
import type { Surface } from '../mesh/surface.js';
import { surfaceIntrinsic, attachedMetric } from '../metric/user/surface-metric.js';
import { gaussianCurvature, meanCurvature, gaussBonnetResidual } from '../metric/curvature.js';
import { components } from '../mesh/components.js';
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import type { FaceArrays } from '../metric/triangle.js';
import { glueSeams } from '../mesh/seams.js';

/** Min / mean / max of a statistic. */
export interface Stat {
  min: number;
  mean: number;
  max: number;
}

/** Per-vertex curvature arrays plus summary. */
export interface CurvatureResult {
  angleDefect: Float64Array;
  /**
   * Gaussian curvature per vertex; NaN at boundary vertices and at interior
   * vertices of zero area (not defined there; written as empty / null).
   */
  gaussianCurvature: Float64Array;
  /** Mean curvature per vertex; NaN where the Gaussian curvature is (not defined there). */
  meanCurvature: Float64Array;
  boundary: Uint8Array;
  summary: {
    interiorVertices: number;
    boundaryVertices: number;
    gaussian: Stat;
    mean: Stat;
    totalAngleDefect: number;
    totalBoundaryTurning: number;
    eulerCharacteristic: number;
    gaussBonnetResidual: number;
    /** Interior vertices of zero area (all their triangles have zero area): Gaussian curvature is not defined there (NaN, written as empty / null). */
    zeroAreaVertices: number;
  };
}

function stat(values: Float64Array, mask: Uint8Array, active: (v: number) => boolean): Stat {
  let min = Infinity, max = -Infinity, sum = 0, n = 0;
  for (let v = 0; v < values.length; v++) {
    if (mask[v] || !active(v)) continue;
    const x = values[v]!;
    if (Number.isNaN(x)) continue; // not defined there
    if (x < min) min = x;
    if (x > max) max = x;
    sum += x;
    n++;
  }
  return n ? { min, mean: sum / n, max } : { min: 0, mean: 0, max: 0 };
}

/**
 * Computes curvature per topology vertex and its summary. `intrinsic`, when
 * given, must be `surfaceIntrinsic(s)`'s mesh, already made by the caller,
 * and `faces` that mesh's angles, cotangents and areas when it has them.
 */
export function curvatureSummary(s: Surface, intrinsic?: IntrinsicMesh, faces: FaceArrays = {}): CurvatureResult {
  const t = s.topology;
  const im = intrinsic ?? surfaceIntrinsic(s); // a user metric's lengths when one is attached
  const seams = s.report.orientationSeams;
  const c = gaussianCurvature(im, seams, faces);
  const H = meanCurvature(im, s.positions, c.vertexArea, c.boundary, seams, faces.cotans);
  if (attachedMetric(s)) H.fill(NaN); // mean curvature belongs to the embedding: not defined by a user metric
  const chi = components(t, seams).info.reduce((a, x) => a + x.eulerCharacteristic, 0);
  const copy = seams.length > 0 ? glueSeams(t, seams).rep : null;
  const used = (v: number) => t.vertexHalfedge[v]! >= 0;
  let nb = 0, ni = 0;
  for (let v = 0; v < t.nv; v++) if (used(v) && (!copy || copy[v] === v)) c.boundary[v] ? nb++ : ni++;
  // Gaussian and mean curvature are not defined at boundary vertices by these formulas
  for (let v = 0; v < t.nv; v++) {
    if (c.boundary[v]) {
      c.gaussian[v] = NaN;
      H[v] = NaN;
    } else if (used(v) && !(c.vertexArea[v]! > 0)) {
      c.gaussian[v] = NaN; // defect over zero area
      H[v] = NaN;
    }
  }
  return {
    angleDefect: c.angleDefect,
    gaussianCurvature: c.gaussian,
    meanCurvature: H,
    boundary: c.boundary,
    summary: {
      interiorVertices: ni,
      boundaryVertices: nb,
      gaussian: stat(c.gaussian, c.boundary, used),
      mean: stat(H, c.boundary, used),
      totalAngleDefect: c.totalInteriorDefect,
      totalBoundaryTurning: c.totalBoundaryTurning,
      eulerCharacteristic: chi,
      gaussBonnetResidual: gaussBonnetResidual(c, chi),
      zeroAreaVertices: c.zeroAreaVertices,
    },
  };
}
