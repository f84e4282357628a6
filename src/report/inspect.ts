/**
 * Mesh health summary: counts, topology, repairs, geometry and the
 * Gauss–Bonnet check. Everything here is plain data for JSON output; the keys
 * are documented in the README and kept stable.
 */
import type { Surface } from '../mesh/surface.js';
import { components } from '../mesh/components.js';
import { boundaryLoops } from '../mesh/boundary.js';
import { intrinsicFromPositions } from '../metric/intrinsic.js';
import { cornerAngles, faceAreas } from '../metric/triangle.js';
import { gaussianCurvature, gaussBonnetResidual } from '../metric/curvature.js';
import type { NonManifoldEdge } from '../mesh/build.js';

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
  };
}

/** Computes the health summary of a surface. */
export function inspectSurface(s: Surface): InspectReport {
  const t = s.topology;
  const comps = components(t);
  const im = intrinsicFromPositions(t, s.positions);
  const ang = cornerAngles(im);
  const A = faceAreas(im);
  const curv = gaussianCurvature(im);
  const chi = comps.info.reduce((a, c) => a + c.eulerCharacteristic, 0);
  const orientable = s.report.nonOrientableComponents === 0;

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
  let lmin = Infinity, lmax = 0, lsum = 0;
  for (let e = 0; e < t.ne; e++) {
    const l = im.edgeLength[e]!;
    if (l < lmin) lmin = l;
    if (l > lmax) lmax = l;
    lsum += l;
  }
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
  return {
    file: s.data.name,
    vertices: s.data.positions.length / 3,
    faces: s.data.faceOffsets.length - 1,
    triangles: t.nf,
    edges: t.ne,
    components: comps.count,
    boundaryLoops: boundaryLoops(t).length,
    eulerCharacteristic: chi,
    genus: genusOf(genusSum),
    orientable,
    flippedFaces: s.report.flippedFaces,
    nonManifoldEdges: s.report.nonManifoldEdgeCount,
    nonManifoldVertices: s.report.nonManifoldVertexCount,
    degenerateFacesDropped: s.report.degenerateFaces.length,
    isolatedVertices: s.report.isolatedVertices,
    area,
    boundingBox: { min, max },
    edgeLength: { min: lmin, mean: t.ne ? lsum / t.ne : 0, max: lmax },
    minAngleDeg: minA * deg,
    maxAngleDeg: maxA * deg,
    obtuseFraction: t.nf ? obtuse / t.nf : 0,
    totalAngleDefect: curv.totalInteriorDefect,
    totalBoundaryTurning: curv.totalBoundaryTurning,
    gaussBonnetResidual: gaussBonnetResidual(curv, chi),
    componentList: comps.info.map((c) => ({ ...c, genus: genusOf(c.genus) })),
    locations: {
      nonManifoldEdges: s.report.nonManifoldEdges,
      nonManifoldVertices: s.report.nonManifoldVertices,
      degenerateFaces: s.report.degenerateFaces.slice(0, 1000),
    },
  };
}
