/**
 * Mesh health summary: counts, topology, repairs, geometry and the
 * Gauss–Bonnet check. Everything here is plain data for JSON output; the keys
 * are documented in the README and kept stable (new keys are added, never
 * renamed).
 *
 * Counts are those of the surface as given: duplicate faces are dropped
 * before anything is counted, and a non-orientable surface is counted with its
 * orientation seams glued (see `mesh/seams.ts`).
 *
 * Triangle quality, with h the mean edge length (the mesh scale):
 * - zero-area: thickness 2A / ℓ_max (the height over the longest side) at
 *   most {@link ZERO_THICKNESS}·h, exact zeros included; collinear corners,
 *   coincident corners and whole meshes collapsed to a point land here;
 * - cap: not zero-area, largest angle at least {@link CAP_ANGLE_DEG}°;
 * - needle: not zero-area nor a cap, smallest angle at most {@link NEEDLE_ANGLE_DEG}°.
 * Angle thresholds are scale-free; the zero-area one scales with h.
 *
 * Boundary loops are listed with the ids that source specs use (`loop:ID`,
 * `query/loop-spec.ts`): longest first, equally long loops (within
 * `LOOP_LENGTH_TIE`) by smallest file vertex index; seams of a
 * non-orientable surface are glued back, not boundary.
 */
import type { Surface } from '../mesh/surface.js';
import { components } from '../mesh/components.js';
import { boundaryLoops, namedBoundaryLoops } from '../mesh/boundary.js';
import { surfaceIntrinsic, attachedMetric } from '../metric/user/surface-metric.js';
import { cornerAngles, faceAreas } from '../metric/triangle.js';
import { gaussianCurvature, gaussBonnetResidual, type Curvature } from '../metric/curvature.js';
import type { IntrinsicMesh } from '../metric/intrinsic.js';
import type { NonManifoldEdge, DuplicateFace } from '../mesh/build.js';
import type { StlReport } from '../io/mesh-data.js';

/** A triangle is zero-area when its thickness 2A/ℓ_max is at most this fraction of the mean edge length. */
export const ZERO_THICKNESS = 1e-9;
/** A triangle with a largest angle at least this (degrees) is a cap. */
export const CAP_ANGLE_DEG = 160;
/** A triangle with a smallest angle at most this (degrees) is a needle (unless it is a cap). */
export const NEEDLE_ANGLE_DEG = 5;
/** How many locations each list carries. */
const LISTED = 1000;
/** How many boundary loops the report lists (longest first). */
export const LISTED_LOOPS = 1000;

/** One boundary loop as `inspect` lists it (ids as `loop:ID` specs use them). */
export interface BoundaryLoopInfo {
  /** The loop's id: 0 is the longest loop. */
  id: number;
  /** Number of vertices on the loop (= its number of edges). */
  vertices: number;
  /** Sum of its edge lengths, in mesh units. */
  length: number;
  /** Bounding box of its vertices. */
  boundingBox: { min: [number, number, number]; max: [number, number, number] };
  /** One point on the loop: its vertex of smallest file index, and where it is. */
  point: { vertex: number; position: [number, number, number] };
  /**
   * File vertex indices (from 0) along the loop, starting at `point.vertex`; on an orientable surface the
   * surface lies on the left (seen from the normal side). The loop closes from the last back to the first.
   */
  vertexList: number[];
}

/** The `inspect` report (see README for each key). */
export interface InspectReport {
  file: string;
  vertices: number;
  faces: number;
  triangles: number;
  edges: number;
  components: number;
  boundaryLoops: number;
  eulerCharacteristic: number;
  genus: number | null;
  orientable: boolean;
  flippedFaces: number;
  nonManifoldEdges: number;
  nonManifoldVertices: number;
  degenerateFacesDropped: number;
  /**
   * Faces dropped because an earlier face has the same vertex set: file faces
   * (a repeated polygon counts once), plus any triangle of a polygon that
   * repeats another triangle.
   */
  duplicateFacesDropped: number;
  /** Triangles of zero area (see the module comment). */
  zeroAreaTriangles: number;
  /** Triangles with a largest angle ≥ {@link CAP_ANGLE_DEG}° (not zero-area). */
  capTriangles: number;
  /** Triangles with a smallest angle ≤ {@link NEEDLE_ANGLE_DEG}° (not zero-area, not caps). */
  needleTriangles: number;
  /** Edges of zero length (their two ends coincide). */
  zeroLengthEdges: number;
  /** Interior vertices whose area is zero: Gaussian curvature is not defined there. */
  zeroAreaVertices: number;
  isolatedVertices: number;
  area: number;
  boundingBox: { min: [number, number, number]; max: [number, number, number] };
  edgeLength: { min: number; mean: number; max: number };
  minAngleDeg: number;
  maxAngleDeg: number;
  obtuseFraction: number;
  totalAngleDefect: number;
  totalBoundaryTurning: number;
  gaussBonnetResidual: number;
  /** STL input only (else null): encoding, facets, the weld (tolerance, merged corners, near pairs) and the stored-normal check. */
  stl: StlReport | null;
  /** The problems found, one short phrase each, as `inspect` prints them (empty for a healthy mesh). */
  problems: string[];
  /** The boundary loops by id (the first {@link LISTED_LOOPS}; `boundaryLoops` counts them all). */
  boundaryLoopList: BoundaryLoopInfo[];
  componentList: {
    faces: number;
    vertices: number;
    edges: number;
    boundaryLoops: number;
    eulerCharacteristic: number;
    genus: number | null;
  }[];
  locations: {
    nonManifoldEdges: NonManifoldEdge[];
    nonManifoldVertices: number[];
    degenerateFaces: number[];
    /** Dropped duplicates: `face` repeats the vertex set of the earlier `of` (file faces, from 0). */
    duplicateFaces: DuplicateFace[];
    /** File faces (from 0) of the first zero-area, cap and needle triangles. */
    zeroAreaTriangles: number[];
    capTriangles: number[];
    needleTriangles: number[];
  };
}

/** Problems as short phrases, in the order `inspect` prints them; empty for a healthy mesh. */
export function inspectProblems(r: InspectReport): string[] {
  const probs: string[] = [];
  const first = (xs: number[]) => (xs.length ? ` (first: face ${xs[0]})` : '');
  if (r.nonManifoldEdges) {
    const e = r.locations.nonManifoldEdges[0]!;
    probs.push(`${r.nonManifoldEdges} non-manifold edge(s) (first: vertices ${e.a}–${e.b}, faces ${e.faces.join(', ')})`);
  }
  if (r.nonManifoldVertices) probs.push(`${r.nonManifoldVertices} non-manifold vertex(es) (first: vertex ${r.locations.nonManifoldVertices[0]})`);
  if (!r.orientable) probs.push('not orientable');
  if (r.flippedFaces) probs.push(`${r.flippedFaces} face(s) had inconsistent orientation (re-oriented)`);
  if (r.degenerateFacesDropped) probs.push(`${r.degenerateFacesDropped} degenerate face(s) dropped (first: face ${r.locations.degenerateFaces[0]})`);
  if (r.duplicateFacesDropped) {
    const d = r.locations.duplicateFaces[0]!;
    probs.push(`${r.duplicateFacesDropped} duplicate face(s) dropped (first: face ${d.face} repeats face ${d.of})`);
  }
  if (r.triangles > 0 && r.zeroAreaTriangles === r.triangles) probs.push(`every triangle has zero area (the mesh has no extent: area ${r.area} units²)`);
  else if (r.zeroAreaTriangles) probs.push(`${r.zeroAreaTriangles} zero-area triangle(s)${first(r.locations.zeroAreaTriangles)}`);
  if (r.zeroLengthEdges) probs.push(`${r.zeroLengthEdges} zero-length edge(s) (coincident vertices)`);
  if (r.capTriangles) probs.push(`${r.capTriangles} cap triangle(s) (an angle ≥ ${CAP_ANGLE_DEG}°)${first(r.locations.capTriangles)}`);
  if (r.needleTriangles) probs.push(`${r.needleTriangles} needle triangle(s) (an angle ≤ ${NEEDLE_ANGLE_DEG}°)${first(r.locations.needleTriangles)}`);
  if (r.zeroAreaVertices) probs.push(`${r.zeroAreaVertices} interior vertex(es) of zero area (Gaussian curvature undefined there)`);
  if (r.isolatedVertices) probs.push(`${r.isolatedVertices} vertex(es) used by no face`);
  return probs;
}

/**
 * What a caller that computes more than the report has already made for the
 * same surface, so it is not made twice (`score` does): `intrinsic` must be
 * `surfaceIntrinsic(s)`'s mesh, `angles` and `areas` its `cornerAngles` and
 * `faceAreas`, `curvature` the totals of
 * `gaussianCurvature(intrinsic, s.report.orientationSeams)`.
 */
export interface InspectParts {
  intrinsic?: IntrinsicMesh;
  angles?: Float64Array;
  areas?: Float64Array;
  curvature?: Pick<Curvature, 'totalInteriorDefect' | 'totalBoundaryTurning' | 'zeroAreaVertices'>;
}

/** Computes the health summary of a surface (`given`: parts already made, {@link InspectParts}). */
export function inspectSurface(s: Surface, given: InspectParts = {}): InspectReport {
  const t = s.topology;
  const seams = s.report.orientationSeams;
  const comps = components(t, seams);
  const im = given.intrinsic ?? surfaceIntrinsic(s); // a user metric's lengths when one is attached
  const ang = given.angles ?? cornerAngles(im);
  const A = given.areas ?? faceAreas(im);
  const curv = given.curvature ?? gaussianCurvature(im, seams, { angles: ang, areas: A });
  const chi = comps.info.reduce((a, c) => a + c.eulerCharacteristic, 0);
  const orientable = s.report.nonOrientableComponents === 0;
  const quality = triangleQuality(s, im.edgeLength, A, ang);

  let area = 0;
  for (let f = 0; f < t.nf; f++) area += A[f]!;
  let minA = Infinity, maxA = 0, obtuse = 0;
  for (let f = 0; f < t.nf; f++) {
    let fo = false;
    for (let k = 0; k < 3; k++) {
      const a = ang[3 * f + k]!;
      if (a < minA) minA = a;
      if (a > maxA) maxA = a;
      if (a > Math.PI / 2 + 1e-12) fo = true;
    }
    if (fo) obtuse++;
  }
  let lmin = Infinity, lmax = 0, lsum = 0, zeroLengthEdges = 0;
  for (let e = 0; e < t.ne; e++) {
    const l = im.edgeLength[e]!;
    if (l < lmin) lmin = l;
    if (l > lmax) lmax = l;
    lsum += l;
    if (l === 0) zeroLengthEdges++;
  }
  // seams are one edge of the surface as given, counted twice in the topology
  const seamEdges = seams.length / 2;
  const edges = t.ne - seamEdges;
  const min: [number, number, number] = [Infinity, Infinity, Infinity];
  const max: [number, number, number] = [-Infinity, -Infinity, -Infinity];
  const P = s.data.positions;
  for (let i = 0; i < P.length; i += 3) {
    for (let d = 0; d < 3; d++) {
      const x = P[i + d]!;
      if (x < min[d]!) min[d] = x;
      if (x > max[d]!) max[d] = x;
    }
  }
  const deg = 180 / Math.PI;
  const genusOf = (g: number) => (orientable && Number.isInteger(g) ? g : null);
  const genusSum = comps.info.reduce((a, c) => a + c.genus, 0);
  const report: InspectReport = {
    file: s.data.name,
    vertices: s.data.positions.length / 3,
    faces: s.data.faceOffsets.length - 1,
    triangles: t.nf,
    edges,
    components: comps.count,
    boundaryLoops: seams.length ? comps.info.reduce((a, c) => a + c.boundaryLoops, 0) : boundaryLoops(t).length,
    eulerCharacteristic: chi,
    genus: genusOf(genusSum),
    orientable,
    flippedFaces: s.report.flippedFaces,
    nonManifoldEdges: s.report.nonManifoldEdgeCount,
    nonManifoldVertices: s.report.nonManifoldVertexCount,
    degenerateFacesDropped: s.report.degenerateFaces.length,
    duplicateFacesDropped: s.report.duplicateFaceCount,
    zeroAreaTriangles: quality.zero.length,
    capTriangles: quality.cap.length,
    needleTriangles: quality.needle.length,
    zeroLengthEdges,
    zeroAreaVertices: curv.zeroAreaVertices,
    isolatedVertices: s.report.isolatedVertices,
    area,
    boundingBox: { min, max },
    edgeLength: { min: t.ne ? lmin : 0, mean: t.ne ? lsum / t.ne : 0, max: lmax },
    minAngleDeg: minA * deg,
    maxAngleDeg: maxA * deg,
    obtuseFraction: t.nf ? obtuse / t.nf : 0,
    totalAngleDefect: curv.totalInteriorDefect,
    totalBoundaryTurning: curv.totalBoundaryTurning,
    gaussBonnetResidual: gaussBonnetResidual(curv, chi),
    stl: s.data.stl ?? null,
    problems: [],
    boundaryLoopList: loopList(s),
    componentList: comps.info.map((c) => ({ ...c, genus: genusOf(c.genus) })),
    locations: {
      nonManifoldEdges: s.report.nonManifoldEdges,
      nonManifoldVertices: s.report.nonManifoldVertices,
      degenerateFaces: s.report.degenerateFaces.slice(0, LISTED),
      duplicateFaces: s.report.duplicateFaces.slice(0, LISTED),
      zeroAreaTriangles: quality.zero.slice(0, LISTED),
      capTriangles: quality.cap.slice(0, LISTED),
      needleTriangles: quality.needle.slice(0, LISTED),
    },
  };
  report.problems = inspectProblems(report);
  return report;
}

/** The first {@link LISTED_LOOPS} boundary loops by id, with file vertex indices. */
function loopList(s: Surface): BoundaryLoopInfo[] {
  const origin = s.topology.vertexOrigin, P = s.positions;
  const user = attachedMetric(s)?.mesh.edgeLength; // under a user metric a loop's length is measured in it (ids stay those of the embedding)
  return namedBoundaryLoops(s.topology, P, s.report.orientationSeams)
    .slice(0, LISTED_LOOPS)
    .map((l) => {
      const r = l.representative;
      return {
        id: l.id,
        vertices: l.vertices.length,
        length: user ? l.halfedges.reduce((a, h) => a + user[s.topology.edgeOf[h]!]!, 0) : l.length,
        boundingBox: { min: l.min, max: l.max },
        point: { vertex: origin[r]!, position: [P[3 * r]!, P[3 * r + 1]!, P[3 * r + 2]!] },
        vertexList: Array.from(l.vertices, (v) => origin[v]!),
      };
    });
}

/** Zero-area, cap and needle triangles as file faces (see the module comment); lists hold every hit. */
function triangleQuality(
  s: Surface,
  len: Float64Array,
  area: Float64Array,
  ang: Float64Array,
): { zero: number[]; cap: number[]; needle: number[] } {
  const t = s.topology;
  let sum = 0;
  for (let e = 0; e < len.length; e++) sum += len[e]!;
  const h = len.length ? sum / len.length : 0;
  const cap = (CAP_ANGLE_DEG * Math.PI) / 180, needle = (NEEDLE_ANGLE_DEG * Math.PI) / 180;
  const out = { zero: [] as number[], cap: [] as number[], needle: [] as number[] };
  for (let f = 0; f < t.nf; f++) {
    const lmax = Math.max(len[t.edgeOf[3 * f]!]!, len[t.edgeOf[3 * f + 1]!]!, len[t.edgeOf[3 * f + 2]!]!);
    const thickness = lmax > 0 ? (2 * area[f]!) / lmax : 0;
    const face = s.facePolygon[f]!;
    if (thickness <= ZERO_THICKNESS * h) {
      out.zero.push(face);
      continue;
    }
    const a0 = ang[3 * f]!, a1 = ang[3 * f + 1]!, a2 = ang[3 * f + 2]!;
    if (Math.max(a0, a1, a2) >= cap) out.cap.push(face);
    else if (Math.min(a0, a1, a2) <= needle) out.needle.push(face);
  }
  return out;
}

