/**
 * Scores one surface: the metrics of the selected groups (catalog.ts), as
 * plain data. Browser-safe; the CLI runs it in worker threads.
 *
 * The health group is the `inspect` report (report/inspect.ts) flattened;
 * quality is quality.ts; curvature is the `curvature` summary
 * (report/curvature.ts); landmarks, diameter and the heat error share one
 * exact solver per mesh (window propagation, prepared once). The solvers
 * are imported on first use, so a run of the linear groups (or landmarks
 * without pairs) never loads them: less start-up for each worker thread.
 *
 * What several groups need is made once per surface: the edge lengths
 * (`intrinsicOf`, shared with the solvers too), the corner angles, face
 * areas and cotangents, and the angle defects, whose totals the health
 * group takes from the curvature group when both run (the same functions of
 * the same lengths, so the same numbers).
 */
import type { Surface } from '../mesh/surface.js';
import { inspectSurface } from '../report/inspect.js';
import { curvatureSummary, type CurvatureResult } from '../report/curvature.js';
import { intrinsicOf } from '../api/parts.js';
import { cornerAngles, faceAreas, halfedgeCotans, type FaceArrays } from '../metric/triangle.js';
import type { DistanceSolver } from '../geodesic/solver.js';
import { metricsOf, type MetricGroup, type Metrics } from './catalog.js';
import { triangleQuality } from './quality.js';
import { mainComponentVertices, twoSweepDiameter, heatError, sampleVertices } from './sweeps.js';
import { measureLandmarks, landmarkExtremes, type LandmarkSpec, type LandmarkResult } from './landmarks.js';

/** Default number of sources for the heat-versus-exact error. */
export const DEFAULT_HEAT_SAMPLES = 3;

/** What to compute for one mesh. */
export interface ScoreOptions {
  /** Metric groups. */
  groups: readonly MetricGroup[];
  /** Landmark pairs of this mesh (group `landmarks`). */
  landmarks?: LandmarkSpec[];
  /** Sources sampled for the heat error (default {@link DEFAULT_HEAT_SAMPLES}). */
  heatSamples?: number;
  /** Memory budget of each exact solve, bytes (over it: a `LIMIT` error). */
  memoryBudget?: number;
}

/** The score of one surface. */
export interface SurfaceScore {
  /** Every metric of the selected groups (null where the mesh has no value). */
  metrics: Metrics;
  /** Each landmark pair measured (group `landmarks`). */
  landmarks: LandmarkResult[];
}

/** Finite numbers as they are; anything else (NaN, ±Infinity) as null, so no NaN reaches a report. */
const finite = (x: number | null | undefined): number | null => (x !== null && x !== undefined && Number.isFinite(x) ? x : null);

/** Computes the metrics of `opts.groups` on `s` (see the module comment). */
export async function scoreSurface(s: Surface, opts: ScoreOptions): Promise<SurfaceScore> {
  const g = new Set(opts.groups);
  const out: Metrics = {};
  // the surface's edge lengths (its user metric's when one is attached), made once for every group and solver
  const im = g.has('health') || g.has('quality') || g.has('curvature') ? intrinsicOf(s) : null;
  // and its per-face angles and areas (both groups), cotangents (curvature), each made once
  const faces: FaceArrays = {};
  if (g.has('health') || g.has('curvature')) {
    faces.angles = cornerAngles(im!);
    faces.areas = faceAreas(im!);
  }
  if (g.has('curvature')) faces.cotans = halfedgeCotans(im!);
  // curvature first: its angle-defect totals are the health group's (metrics go out in catalogue order all the same)
  let curvature: CurvatureResult['summary'] | null = null;
  if (g.has('curvature')) {
    curvature = curvatureSummary(s, im!, faces).summary;
    const c = curvature;
    const some = c.interiorVertices > 0 && c.interiorVertices > c.zeroAreaVertices;
    const v = (x: number) => (some ? finite(x) : null); // the summary's zeros mean "no interior vertex", not zero curvature
    Object.assign(out, {
      gaussianCurvatureMin: v(c.gaussian.min), gaussianCurvatureMean: v(c.gaussian.mean), gaussianCurvatureMax: v(c.gaussian.max),
      meanCurvatureMin: v(c.mean.min), meanCurvatureMean: v(c.mean.mean), meanCurvatureMax: v(c.mean.max),
      interiorVertices: c.interiorVertices, boundaryVertices: c.boundaryVertices,
    });
  }
  const budget = opts.memoryBudget !== undefined ? { memoryBudget: opts.memoryBudget } : {};
  let exact: DistanceSolver | undefined;
  const solvers = () => import('../api/distance.js');
  const exactSolver = async (): Promise<DistanceSolver> => (exact ??= (await solvers()).prepareDistances(s, 'exact', budget));

  if (g.has('health')) {
    const totals = curvature
      ? { totalInteriorDefect: curvature.totalAngleDefect, totalBoundaryTurning: curvature.totalBoundaryTurning, zeroAreaVertices: curvature.zeroAreaVertices }
      : undefined;
    const r = inspectSurface(s, { intrinsic: im!, angles: faces.angles, areas: faces.areas, curvature: totals });
    const { min, max } = r.boundingBox;
    const diag = r.vertices ? Math.hypot(max[0] - min[0], max[1] - min[1], max[2] - min[2]) : 0;
    Object.assign(out, {
      vertices: r.vertices, faces: r.faces, triangles: r.triangles, edges: r.edges, components: r.components,
      boundaryLoops: r.boundaryLoops, eulerCharacteristic: r.eulerCharacteristic, genus: r.genus, orientable: r.orientable,
      flippedFaces: r.flippedFaces, nonManifoldEdges: r.nonManifoldEdges, nonManifoldVertices: r.nonManifoldVertices,
      degenerateFacesDropped: r.degenerateFacesDropped, duplicateFacesDropped: r.duplicateFacesDropped,
      zeroAreaTriangles: r.zeroAreaTriangles, capTriangles: r.capTriangles, needleTriangles: r.needleTriangles,
      sliverTriangles: r.capTriangles + r.needleTriangles, zeroLengthEdges: r.zeroLengthEdges, zeroAreaVertices: r.zeroAreaVertices,
      isolatedVertices: r.isolatedVertices, problems: r.problems.length, area: finite(r.area), boundingBoxDiagonal: finite(diag),
      edgeLengthMin: finite(r.edgeLength.min), edgeLengthMean: finite(r.edgeLength.mean), edgeLengthMax: finite(r.edgeLength.max),
      minAngleDeg: finite(r.minAngleDeg), maxAngleDeg: finite(r.maxAngleDeg), obtuseFraction: finite(r.obtuseFraction),
      totalAngleDefect: finite(r.totalAngleDefect), totalBoundaryTurning: finite(r.totalBoundaryTurning),
      gaussBonnetResidual: finite(r.gaussBonnetResidual),
    });
  }
  if (g.has('quality')) {
    const q = triangleQuality(im!);
    Object.assign(out, {
      aspectRatioP50: finite(q.aspectRatioP50), aspectRatioP90: finite(q.aspectRatioP90), aspectRatioP99: finite(q.aspectRatioP99),
      aspectRatioMax: finite(q.aspectRatioMax), nonDelaunayEdges: q.nonDelaunayEdges, nonDelaunayFraction: finite(q.nonDelaunayFraction),
    });
  }
  let landmarks: LandmarkResult[] = [];
  if (g.has('landmarks')) {
    const specs = opts.landmarks ?? [];
    landmarks = specs.length ? await measureLandmarks(s, specs, await exactSolver()) : [];
    const x = landmarkExtremes(landmarks);
    Object.assign(out, { landmarkCount: specs.length, landmarkMaxAbsDeviation: finite(x.maxAbs), landmarkMaxRelDeviation: finite(x.maxRel) });
  }
  const main = g.has('diameter') || g.has('heat') ? mainComponentVertices(s.topology, s.report.orientationSeams) : new Int32Array(0);
  if (g.has('diameter')) {
    const d = main.length ? twoSweepDiameter(await exactSolver(), main) : null;
    const file = (v: number) => s.topology.vertexOrigin[v]!;
    Object.assign(out, {
      diameterLowerBound: d ? finite(d.lowerBound) : null, diameterFrom: d ? file(d.from) : null, diameterTo: d ? file(d.to) : null,
    });
  }
  if (g.has('heat')) {
    const sources = sampleVertices(main, opts.heatSamples ?? DEFAULT_HEAT_SAMPLES);
    const e = sources.length ? heatError((await solvers()).prepareDistances(s, 'heat', budget), await exactSolver(), sources) : null;
    Object.assign(out, { heatSamples: e ? e.samples : 0, heatErrorMax: e ? finite(e.max) : null, heatErrorMean: e ? finite(e.mean) : null });
  }
  // every metric of the groups is present, in catalogue order
  const metrics: Metrics = {};
  for (const mi of metricsOf([...g])) metrics[mi.name] = out[mi.name] ?? null;
  return { metrics, landmarks };
}
