/**
 * Paths by intrinsic edge flips (src/geodesic/flip) against closed forms on
 * surfaces that unfold into the plane, and against window propagation
 * (exactDistance) on the same meshes: both to 1e-9 relative. Every traced
 * path must also be a surface path whose measured length is its length.
 *
 * The flips alone give a geodesic in the class of the edge-graph route,
 * which on a cube can go round another corner than the shortest path; the
 * `path` entry (shortestPathThrough with method 'flip' and positions) checks
 * each flip leg by window propagation in the ellipsoid that holds every
 * shorter path (flip/verify.ts) and must always give the shortest length.
 */
import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions, type IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { exactDistance } from '../../src/geodesic/exact/index.js';
import { pointSources } from '../../src/geodesic/shared/sources.js';
import { flipGeodesicPath } from '../../src/geodesic/flip/index.js';
import { pathLength, isSurfacePath } from '../../src/geodesic/path.js';
import { shortestPathThrough } from '../../src/geodesic/waypoints.js';
import { flatGrid, cylinder, rng } from '../fixtures/shapes.js';
import { delaunay } from '../fixtures/holed-plates.js';
import { canonicalSurfacePoint, surfacePointPosition, type SurfacePoint } from '../../src/mesh/surface-point.js';
import { subdivide, type V3 } from '../fixtures/subdivide.js';

const TOL = 1e-9;

function meshOf(positions: Float64Array, triangles: Uint32Array): IntrinsicMesh {
  return intrinsicFromPositions(buildTopology(triangles, positions.length / 3).topology, positions);
}

function expectRel(actual: number, expected: number, scale: number): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(TOL * Math.max(expected, scale));
}

/** Paths corrected by the ellipsoid check in this file's runs (the flips alone went round another corner). */
let corrected = 0;

/**
 * Path from a to b by flips: the flips alone give a surface path of its stated length, no
 * longer than the edge path they start from and no shorter than window propagation's
 * distance; with `classRight` (the edge-graph route is in the shortest path's class) equal to
 * it. The checked `path` entry always equals it. Returns the checked length.
 */
function flipChecked(m: IntrinsicMesh, P: Float64Array, a0: number | SurfacePoint, b0: number | SurfacePoint, scale: number, classRight = false): number {
  const pt = (p: number | SurfacePoint): SurfacePoint => (typeof p === 'number' ? { kind: 'vertex', vertex: p } : p);
  const a = pt(a0), b = pt(b0);
  const r = flipGeodesicPath(m, a, b);
  expect(r.status).toBe('ok');
  expect(isSurfacePath(m.topology, r.path.points)).toBe(true);
  expectRel(pathLength(m, r.path.points), r.path.length, scale);
  const w = exactDistance(m, pointSources([a]), { targets: [b] }).distanceAt(b);
  expect(r.path.length).toBeLessThanOrEqual(r.startLength + TOL * scale); // never longer than the edge path it started from
  expect(r.path.length).toBeGreaterThanOrEqual(w - TOL * scale); // window propagation: the shortest, same metric
  if (classRight) expectRel(r.path.length, w, scale);
  const v = shortestPathThrough(m, [a, b], { method: 'flip', positions: P });
  expect(v.path.points[0]).toEqual(a);
  expect(v.path.points[v.path.points.length - 1]).toEqual(b);
  expect(v.legs[0]!.proven).toBe(true);
  expectRel(v.length, w, scale);
  expect(isSurfacePath(m.topology, v.path.points)).toBe(true);
  expectRel(pathLength(m, v.path.points), v.length, scale);
  if (v.legs[0]!.method === 'windows') corrected++;
  return v.length;
}


const quad = (p: V3, q: V3, r: V3, s: V3): V3[][] => [[p, q, r], [p, r, s]];
/** The six faces of the box [0,a]×[0,b]×[0,c], outward normals. */
function box(a: number, b: number, c: number): V3[][] {
  const v = (x: number, y: number, z: number): V3 => [x * a, y * b, z * c];
  return [
    ...quad(v(0, 0, 0), v(0, 1, 0), v(1, 1, 0), v(1, 0, 0)),
    ...quad(v(0, 0, 1), v(1, 0, 1), v(1, 1, 1), v(0, 1, 1)),
    ...quad(v(0, 0, 0), v(1, 0, 0), v(1, 0, 1), v(0, 0, 1)),
    ...quad(v(0, 1, 0), v(0, 1, 1), v(1, 1, 1), v(1, 1, 0)),
    ...quad(v(0, 0, 0), v(0, 0, 1), v(0, 1, 1), v(0, 1, 0)),
    ...quad(v(1, 0, 0), v(1, 1, 0), v(1, 1, 1), v(1, 0, 1)),
  ];
}
const vertexAt = (P: Float64Array, x: number, y: number, z: number) =>
  [...Array(P.length / 3).keys()].find((v) => Math.hypot(P[3 * v]! - x, P[3 * v + 1]! - y, P[3 * v + 2]! - z) < 1e-12)!;

describe('flat convex domains: the path is the straight segment (elementary)', () => {
  it('jittered grid 3 × 2: random vertex pairs, including boundary vertices', () => {
    const s = flatGrid(30, 20, 3, 2, 0.35, 11);
    const m = meshOf(s.positions, s.triangles);
    const P = s.positions, rand = rng(3);
    for (let i = 0; i < 12; i++) {
      const a = Math.floor(rand() * m.topology.nv), b = Math.floor(rand() * m.topology.nv);
      expectRel(flipChecked(m, P, a, b, 3, true), Math.hypot(P[3 * a]! - P[3 * b]!, P[3 * a + 1]! - P[3 * b + 1]!), 3);
    }
    // corner to corner along the boundary-free diagonal, and along the bottom boundary
    expectRel(flipChecked(m, P, 0, m.topology.nv - 1, 3, true), Math.hypot(3, 2), 3);
    expectRel(flipChecked(m, P, 0, 30, 3, true), 3, 3);
  });

  it('edge and face points (inserted as vertices first): path length = Euclidean distance', () => {
    const s = flatGrid(30, 20, 3, 2, 0.35, 11);
    const m = meshOf(s.positions, s.triangles), t = m.topology, P = s.positions;
    const rand = rng(12);
    const point = (k: number): SurfacePoint => {
      if (k % 2) return canonicalSurfacePoint({ kind: 'edge', edge: Math.floor(rand() * t.ne), t: rand() }, t);
      const b0 = rand(), b1 = rand() * (1 - b0);
      return canonicalSurfacePoint({ kind: 'face', face: Math.floor(rand() * t.nf), bary: [b0, b1, 1 - b0 - b1] }, t);
    };
    for (let i = 0; i < 10; i++) {
      const a = point(i), b = point(i + (i >> 1));
      const x = surfacePointPosition(a, t, P), y = surfacePointPosition(b, t, P);
      expectRel(flipChecked(m, P, a, b, 3, true), Math.hypot(x[0]! - y[0]!, x[1]! - y[1]!), 3);
    }
  });

  it('random Delaunay triangulations of the unit square: path length = Euclidean distance', () => {
    for (const seed of [1, 2, 3]) {
      const rand = rng(seed);
      const xs = [0, 1, 1, 0], ys = [0, 0, 1, 1];
      for (let i = 0; i < 150; i++) { xs.push(rand()); ys.push(rand()); }
      const tris = Uint32Array.from(delaunay(xs, ys));
      const P = new Float64Array(3 * xs.length);
      xs.forEach((x, v) => { P[3 * v] = x; P[3 * v + 1] = ys[v]!; });
      const m = meshOf(P, tris);
      for (let i = 0; i < 10; i++) {
        const a = Math.floor(rand() * xs.length), b = Math.floor(rand() * xs.length);
        expectRel(flipChecked(m, P, a, b, 1, true), Math.hypot(xs[a]! - xs[b]!, ys[a]! - ys[b]!), 1);
      }
    }
  });
});

describe('flat L-shaped domain: the path bends only at the reflex corner (Lee & Preparata, Networks 14, 1984)', () => {
  it('[0,2]² minus (1,2]²: pairs across the two arms go through R = (1, 1)', () => {
    const g = flatGrid(8, 8, 2, 2);
    const keep: number[] = [];
    for (let f = 0; f < g.triangles.length; f += 3) {
      const c = [0, 1].map((d) => [0, 1, 2].reduce((a, k) => a + g.positions[3 * g.triangles[f + k]! + d]!, 0) / 3);
      if (!(c[0]! > 1 && c[1]! > 1)) keep.push(g.triangles[f]!, g.triangles[f + 1]!, g.triangles[f + 2]!);
    }
    const m = meshOf(g.positions, Uint32Array.from(keep));
    const P = g.positions;
    const at = (x: number, y: number) => vertexAt(P, x, y, 0);
    const R = at(1, 1);
    for (const [[sx, sy], [tx, ty]] of [[[2, 0.5], [0.5, 2]], [[2, 0.75], [0.25, 2]], [[1.5, 1], [1, 1.75]], [[2, 0], [0, 2]]] as [number, number][][]) {
      const a = at(sx!, sy!), b = at(tx!, ty!);
      const r = flipGeodesicPath(m, a, b);
      expect(r.path.points.some((p) => p.kind === 'vertex' && p.vertex === R)).toBe(true);
      expectRel(flipChecked(m, P, a, b, 2, true), Math.hypot(sx! - 1, sy! - 1) + Math.hypot(tx! - 1, ty! - 1), 2);
    }
    // within one arm: straight
    expectRel(flipChecked(m, P, at(0, 0), at(2, 1), 2, true), Math.hypot(2, 1), 2);
  });
});

describe('lateral surface of a prism: unrolls onto a strip (elementary)', () => {
  it('regular pentagonal prism, R = 1, H = 1.5: from a bottom vertex to every top-ring vertex', () => {
    const n = 5, H = 1.5;
    const c = cylinder(n, 4, 1, H);
    const sub = subdivide(Array.from({ length: c.triangles.length / 3 }, (_, f) => [0, 1, 2].map((k) => Array.from(c.positions.subarray(3 * c.triangles[3 * f + k]!, 3 * c.triangles[3 * f + k]! + 3)) as V3)), 2);
    const m = meshOf(sub.positions, sub.triangles);
    const P = sub.positions, side = 2 * Math.sin(Math.PI / n), per = n * side;
    const unroll = (x: number, y: number): number => {
      let th = Math.atan2(y, x);
      if (th < -1e-12) th += 2 * Math.PI;
      const i = Math.min(n - 1, Math.floor((th + 1e-12) / ((2 * Math.PI) / n)));
      return i * side + Math.hypot(x - Math.cos((2 * Math.PI * i) / n), y - Math.sin((2 * Math.PI * i) / n));
    };
    const src = vertexAt(P, 1, 0, 0);
    let checked = 0;
    for (let v = 0; v < m.topology.nv; v++) {
      if (Math.abs(P[3 * v + 2]! - H) > 1e-12) continue;
      const u = unroll(P[3 * v]!, P[3 * v + 1]!);
      expectRel(flipChecked(m, P, src, v, H), Math.min(Math.hypot(u, H), Math.hypot(per - u, H)), H);
      checked++;
    }
    expect(checked).toBe(2 * n);
  });
});

describe('lateral surface of a pyramid: unrolls onto a convex fan (elementary)', () => {
  it('square pyramid, slant edge 3, base side 1: from a base vertex round the apex', () => {
    const l = 3, a = 1, ns = 4;
    const h = Math.sqrt(l * l - (a * a) / 2);
    const base: V3[] = [[a / 2, -a / 2, 0], [a / 2, a / 2, 0], [-a / 2, a / 2, 0], [-a / 2, -a / 2, 0]];
    const theta = 2 * Math.asin(a / (2 * l)), TH = ns * theta;
    const tris: V3[][] = [], unrolled: number[][][] = [];
    for (let i = 0; i < ns; i++) {
      tris.push([[0, 0, h], base[i]!, base[(i + 1) % ns]!]);
      unrolled.push([[0, 0], [l * Math.cos(i * theta), l * Math.sin(i * theta)], [l * Math.cos((i + 1) * theta), l * Math.sin((i + 1) * theta)]]);
    }
    const sub = subdivide(tris, 6, unrolled);
    const m = meshOf(sub.positions, sub.triangles);
    const P = sub.positions;
    const src = sub.payload.findIndex((q) => Math.abs(q[0]! - l) < 1e-12 && Math.abs(q[1]!) < 1e-12);
    const S = sub.payload[src]!, rhoS = Math.hypot(S[0]!, S[1]!), phiS = Math.atan2(S[1]!, S[0]!);
    const rand = rng(4);
    for (let i = 0; i < 20; i++) {
      const v = Math.floor(rand() * m.topology.nv);
      const [x, y] = sub.payload[v]!;
      const rho = Math.hypot(x!, y!), dl = Math.abs(Math.atan2(y!, x!) - phiS);
      const chord = (t: number) => Math.sqrt(Math.max(0, rho * rho + rhoS * rhoS - 2 * rho * rhoS * Math.cos(t)));
      expectRel(flipChecked(m, P, src, v, l), Math.min(chord(dl), chord(TH - dl)), l);
    }
  });
});

describe('boxes: corner to opposite corner by unfolding two faces (elementary)', () => {
  it('unit cube, 4 × 4 cells per face: √5; random pairs agree with window propagation', () => {
    const sub = subdivide(box(1, 1, 1), 4);
    const m = meshOf(sub.positions, sub.triangles);
    const P = sub.positions;
    expectRel(flipChecked(m, P, vertexAt(P, 0, 0, 0), vertexAt(P, 1, 1, 1), 1), Math.sqrt(5), 1);
    // random pairs: some edge-graph routes pass another corner than the shortest path, and the check corrects them
    const rand = rng(8), before = corrected;
    for (let i = 0; i < 60; i++) flipChecked(m, P, Math.floor(rand() * m.topology.nv), Math.floor(rand() * m.topology.nv), 1);
    expect(corrected).toBeGreaterThan(before);
    // face points on two faces of the cube: far corner of the unfolding (checked against windows)
    for (let i = 0; i < 8; i++) {
      const f = () => { const b0 = rand(), b1 = rand() * (1 - b0); return canonicalSurfacePoint({ kind: 'face', face: Math.floor(rand() * m.topology.nf), bary: [b0, b1, 1 - b0 - b1] }, m.topology); };
      flipChecked(m, P, f(), f(), 1);
    }
  });

  it('room 1 × 2 × 3: opposite corners √((1 + 2)² + 3²), the shortest of the three unfoldings', () => {
    // unfoldings across an edge of length a, b or c give √((b+c)² + a²), √((a+c)² + b²), √((a+b)² + c²)
    const sub = subdivide(box(1, 2, 3), 6);
    const m = meshOf(sub.positions, sub.triangles);
    const P = sub.positions;
    const want = Math.min(Math.hypot(2 + 3, 1), Math.hypot(1 + 3, 2), Math.hypot(1 + 2, 3));
    expectRel(flipChecked(m, P, vertexAt(P, 0, 0, 0), vertexAt(P, 1, 2, 3), 3), want, 3);
  });
});
