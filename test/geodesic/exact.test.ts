/**
 * Invariants of exact polyhedral distance, options, and numerical robustness.
 * Sources: metric-space axioms (symmetry, triangle inequality); the graph
 * distance is the length of a real path (so an upper bound) and the 3D chord
 * is a lower bound for any surface path (common practice); rigid motions and
 * scaling act on the metric by isometry/similarity (elementary); 1→4
 * refinement of a flat mesh does not change its metric (definition of the
 * piecewise-flat metric).
 */
import { describe, it, expect } from 'vitest';
import { test, fc } from '@fast-check/vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions, intrinsicFromLengths } from '../../src/metric/intrinsic.js';
import type { IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { exactDistance } from '../../src/geodesic/exact/index.js';
import { graphDistance } from '../../src/geodesic/graph.js';
import { pointSources } from '../../src/geodesic/shared/sources.js';
import { isSurfacePath, pathLength, pathPolyline } from '../../src/geodesic/path.js';
import { surfacePointPosition } from '../../src/mesh/surface-point.js';
import type { SurfacePoint } from '../../src/mesh/surface-point.js';
import { isOrthodromeError } from '../../src/errors.js';
import { flatGrid, icosphere, terrain, transform, rng, randomFlat } from '../fixtures/shapes.js';
import type { Shape } from '../fixtures/shapes.js';

const meshOf = (s: Shape): IntrinsicMesh => intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);
const V = (vertex: number): SurfacePoint => ({ kind: 'vertex', vertex });


/** Icosphere with every vertex moved radially by up to ±amp. */
function bumpySphere(level: number, amp: number, seed: number): Shape {
  const r = rng(seed);
  const s = icosphere(level);
  for (let v = 0; v < s.positions.length; v += 3) {
    const k = 1 + amp * (2 * r() - 1);
    for (let d = 0; d < 3; d++) s.positions[v + d]! *= k;
  }
  return s;
}

/** A random point inside a random face. */
function randomFacePoint(nf: number, r: () => number): SurfacePoint {
  const b0 = r(), b1 = r() * (1 - b0);
  return { kind: 'face', face: Math.floor(r() * nf), bary: [b0, b1, 1 - b0 - b1] };
}

/** Checks every invariant that one pair of runs can show. */
function checkInvariants(s: Shape, seed: number): void {
  const m = meshOf(s);
  const t = m.topology;
  const r = rng(seed);
  const a = randomFacePoint(t.nf, r), b = randomFacePoint(t.nf, r), c = V(Math.floor(r() * t.nv));
  const ra = exactDistance(m, pointSources([a]));
  const rb = exactDistance(m, pointSources([b]));
  const scale = Math.max(...Array.from(m.edgeLength)) * Math.sqrt(t.nf);
  const tol = 1e-9 * scale;
  // symmetry and triangle inequality
  expect(Math.abs(ra.distanceAt(b) - rb.distanceAt(a))).toBeLessThanOrEqual(tol);
  expect(ra.distanceAt(c)).toBeLessThanOrEqual(ra.distanceAt(b) + rb.distanceAt(c) + tol);
  // chord ≤ exact ≤ graph at every vertex; never NaN or negative
  const g = graphDistance(m, pointSources([a])).distance;
  const pa = surfacePointPosition(a, t, s.positions);
  for (let v = 0; v < t.nv; v++) {
    const d = ra.field.distance[v]!;
    expect(d).toBeGreaterThanOrEqual(0);
    expect(d).toBeLessThanOrEqual(g[v]! + tol);
    const chord = Math.hypot(s.positions[3 * v]! - pa[0]!, s.positions[3 * v + 1]! - pa[1]!, s.positions[3 * v + 2]! - pa[2]!);
    expect(d).toBeGreaterThanOrEqual(chord - tol);
  }
  // paths: on the surface, from source to target, as long as the distance
  for (const q of [b, c]) {
    const p = ra.pathTo(q);
    expect(isSurfacePath(t, p.points)).toBe(true);
    expect(p.points[p.points.length - 1]).toEqual(q);
    expect(Math.abs(p.length - ra.distanceAt(q))).toBeLessThanOrEqual(1e-9 * Math.max(p.length, scale * 1e-3));
    expect(Math.abs(pathLength(m, p.points) - p.length)).toBeLessThanOrEqual(tol);
  }
}

describe('exact distance: invariants on random meshes (fast-check)', () => {
  test.prop([fc.integer({ min: 3, max: 9 }), fc.integer({ min: 1, max: 1e6 })], { numRuns: 12 })(
    'random flat triangulations',
    (n, seed) => checkInvariants(randomFlat(n, seed), seed),
  );
  test.prop([fc.integer({ min: 3, max: 20 }), fc.integer({ min: 1, max: 1e6 })], { numRuns: 12 })(
    'random flat triangulations: the distance is the straight-line distance (convex flat domain, elementary)',
    (n, seed) => {
      const s = randomFlat(n, seed);
      const m = meshOf(s);
      const r = rng(seed);
      const src = randomFacePoint(m.topology.nf, r);
      const o = surfacePointPosition(src, m.topology, s.positions);
      const d = exactDistance(m, pointSources([src])).field.distance;
      for (let v = 0; v < d.length; v++) {
        expect(Math.abs(d[v]! - Math.hypot(s.positions[3 * v]! - o[0]!, s.positions[3 * v + 1]! - o[1]!))).toBeLessThanOrEqual(1e-12);
      }
    },
  );
  test.prop([fc.integer({ min: 1, max: 2 }), fc.double({ min: 0, max: 0.25, noNaN: true }), fc.integer({ min: 1, max: 1e6 })], { numRuns: 10 })(
    'perturbed icospheres (cone and saddle vertices)',
    (level, amp, seed) => checkInvariants(bumpySphere(level, amp, seed), seed),
  );
});

describe('exact distance: invariance', () => {
  const base = terrain(10, 10, 1, 1, (x, y) => 0.3 * Math.sin(4 * x) * Math.cos(3 * y));
  const d0 = exactDistance(meshOf(base), pointSources([V(13)])).field.distance;

  it('rigid motion leaves distances unchanged; scaling by k multiplies them by k', () => {
    const moved = exactDistance(meshOf(transform(base, 1.1, [3, -2, 5])), pointSources([V(13)])).field.distance;
    const scaled = exactDistance(meshOf(transform(base, 0.4, [0, 0, 0], 7.5)), pointSources([V(13)])).field.distance;
    for (let v = 0; v < d0.length; v++) {
      expect(moved[v]).toBeCloseTo(d0[v]!, 10);
      expect(scaled[v]! / 7.5).toBeCloseTo(d0[v]!, 10);
    }
  });

  it('1→4 refinement of a flat mesh leaves distances at the old vertices unchanged', () => {
    const s = randomFlat(6, 3);
    const nv = s.positions.length / 3;
    const pos = Array.from(s.positions), tris: number[] = [];
    const mid = new Map<string, number>();
    const midpoint = (a: number, b: number) => {
      const key = a < b ? `${a},${b}` : `${b},${a}`;
      let m = mid.get(key);
      if (m === undefined) {
        m = pos.length / 3;
        for (let d = 0; d < 3; d++) pos.push(0.5 * (pos[3 * a + d]! + pos[3 * b + d]!));
        mid.set(key, m);
      }
      return m;
    };
    for (let f = 0; f < s.triangles.length; f += 3) {
      const [a, b, c] = [s.triangles[f]!, s.triangles[f + 1]!, s.triangles[f + 2]!];
      const ab = midpoint(a, b), bc = midpoint(b, c), ca = midpoint(c, a);
      tris.push(a, ab, ca, b, bc, ab, c, ca, bc, ab, bc, ca);
    }
    const coarse = exactDistance(meshOf(s), pointSources([V(9)])).field.distance;
    const fine = exactDistance(meshOf({ positions: Float64Array.from(pos), triangles: Uint32Array.from(tris) }), pointSources([V(9)])).field.distance;
    for (let v = 0; v < nv; v++) expect(Math.abs(fine[v]! - coarse[v]!)).toBeLessThanOrEqual(1e-12 * 10);
  });
});

describe('exact distance: options', () => {
  const s = flatGrid(40, 40, 4, 4, 0.3, 2);
  const m = meshOf(s);
  const full = exactDistance(m, pointSources([V(820)]));

  it('maxDistance: exact within, Infinity beyond, run marked incomplete', () => {
    const r = exactDistance(m, pointSources([V(820)]), { maxDistance: 0.9 });
    expect(r.complete).toBe(false);
    let inside = 0;
    for (let v = 0; v < m.topology.nv; v++) {
      const d = full.field.distance[v]!;
      if (d <= 0.9) { expect(r.field.distance[v]).toBeCloseTo(d, 12); inside++; }
      else expect(r.field.distance[v]).toBe(Infinity);
    }
    expect(inside).toBeGreaterThan(10);
    expect(r.windows).toBeLessThan(full.windows);
  });

  it('targets: a two-point query stops early, touches few faces and is exact', () => {
    // cells are 0.1 wide: face 2·(20·40 + 17) sits near (1.75, 2.05), the source edge four cells to the right
    const target: SurfacePoint = { kind: 'face', face: 2 * (20 * 40 + 17), bary: [0.2, 0.3, 0.5] };
    const src: SurfacePoint = { kind: 'edge', edge: m.topology.edgeOf[3 * 2 * (20 * 40 + 21)]!, t: 0.4 };
    const fullPair = exactDistance(m, pointSources([src]));
    const r = exactDistance(m, pointSources([src]), { targets: [target] });
    expect(r.complete).toBe(false);
    expect(r.facesTouched).toBeLessThan(0.1 * m.topology.nf);
    expect(r.distanceAt(target)).toBeCloseTo(fullPair.distanceAt(target), 12);
    const p = r.pathTo(target);
    expect(p.length).toBeCloseTo(fullPair.distanceAt(target), 12);
  });

  it('the window cap raises a LIMIT error; bad sources a USAGE error', () => {
    let err: unknown;
    try { exactDistance(m, pointSources([V(0)]), { maxWindows: 50 }); } catch (e) { err = e; }
    expect(isOrthodromeError(err) && err.code).toBe('LIMIT');
    err = undefined;
    try { exactDistance(m, pointSources([V(m.topology.nv + 5)])); } catch (e) { err = e; }
    expect(isOrthodromeError(err) && err.code).toBe('USAGE');
  });

  it('several sources: the distance is the minimum over single-source runs', () => {
    const srcs = [V(0), { kind: 'face', face: 2000, bary: [0.1, 0.1, 0.8] } as SurfacePoint];
    const both = exactDistance(m, pointSources(srcs)).field.distance;
    const one = srcs.map((q) => exactDistance(m, pointSources([q])).field.distance);
    for (let v = 0; v < both.length; v++) expect(both[v]).toBeCloseTo(Math.min(one[0]![v]!, one[1]![v]!), 12);
  });

  it('pathPolyline maps the path to 3D points on the straight segment (flat domain)', () => {
    const p = full.pathTo(V(0));
    const xyz = pathPolyline(p, m.topology, s.positions);
    expect(xyz.length).toBe(3 * p.points.length);
    // on a flat convex domain the shortest path is the straight segment: every point is collinear
    const [ax, ay] = [xyz[0]!, xyz[1]!], [bx, by] = [xyz[xyz.length - 3]!, xyz[xyz.length - 2]!];
    for (let i = 0; i < xyz.length; i += 3) {
      expect(Math.abs((bx - ax) * (xyz[i + 1]! - ay) - (by - ay) * (xyz[i]! - ax))).toBeLessThan(1e-9);
    }
  });
});

describe('exact distance: numerical robustness', () => {
  const euclid = (s: Shape, src: number, tolRel: number) => {
    const m = meshOf(s);
    const d = exactDistance(m, pointSources([V(src)])).field.distance;
    const P = s.positions;
    let span = 0;
    for (let v = 0; v < d.length; v++) span = Math.max(span, Math.hypot(P[3 * v]! - P[3 * src]!, P[3 * v + 1]! - P[3 * src + 1]!));
    for (let v = 0; v < d.length; v++) {
      const e = Math.hypot(P[3 * v]! - P[3 * src]!, P[3 * v + 1]! - P[3 * src + 1]!);
      expect(Math.abs(d[v]! - e)).toBeLessThanOrEqual(tolRel * span);
    }
  };

  it('very large coordinates (offset 1e6) and very small scale (1e-6): still Euclidean on a flat grid', () => {
    const big = flatGrid(10, 10, 1, 1, 0.3, 4);
    for (let i = 0; i < big.positions.length; i += 3) { big.positions[i]! += 1e6; big.positions[i + 1]! -= 2e6; }
    euclid(big, 17, 1e-8); // lengths from differences of 1e6-sized numbers carry ~1e-10 absolute
    euclid(transform(flatGrid(10, 10, 1, 1, 0.3, 4), 0, [0, 0, 0], 1e-6), 17, 1e-9);
  });

  it('needle and sliver triangles: columns of width 1e-9 in a flat grid', () => {
    const nx = 8, ny = 6;
    const xs = [0, 0.2, 0.2 + 1e-9, 0.5, 0.5 + 1e-9, 0.5 + 2e-9, 0.8, 0.9, 1];
    const pos = new Float64Array(3 * (nx + 1) * (ny + 1));
    for (let j = 0; j <= ny; j++) for (let i = 0; i <= nx; i++) {
      const v = j * (nx + 1) + i;
      pos[3 * v] = xs[i]!; pos[3 * v + 1] = j / ny;
    }
    const s = { positions: pos, triangles: flatGrid(nx, ny).triangles };
    euclid(s, 0, 1e-9);
    euclid(s, 3 * (nx + 1) + 4, 1e-9);
  });

  it('a vertex of huge angle sum (wavy crown, ~3.5π): bounds hold, no NaN, paths exact', () => {
    const k = 24, pos: number[] = [0, 0, 0], tris: number[] = [];
    for (let ring = 1; ring <= 3; ring++) {
      for (let i = 0; i < k; i++) {
        const th = (2 * Math.PI * i) / k;
        pos.push(ring * Math.cos(th), ring * Math.sin(th), 0.8 * ring * (i % 2 ? 1 : -1));
      }
    }
    const id = (ring: number, i: number) => (ring === 0 ? 0 : 1 + (ring - 1) * k + (i % k));
    for (let i = 0; i < k; i++) tris.push(0, id(1, i), id(1, i + 1));
    for (let ring = 1; ring < 3; ring++) {
      for (let i = 0; i < k; i++) tris.push(id(ring, i), id(ring + 1, i), id(ring + 1, i + 1), id(ring, i), id(ring + 1, i + 1), id(ring, i + 1));
    }
    const s = { positions: Float64Array.from(pos), triangles: Uint32Array.from(tris) };
    const m = meshOf(s);
    let sum = 0;
    for (let f = 0; f < k; f++) {
      const a = Math.hypot(pos[3 * id(1, f)]!, pos[3 * id(1, f) + 1]!, pos[3 * id(1, f) + 2]!);
      const b = Math.hypot(pos[3 * id(1, f + 1)]!, pos[3 * id(1, f + 1) + 1]!, pos[3 * id(1, f + 1) + 2]!);
      const c = Math.hypot(pos[3 * id(1, f)]! - pos[3 * id(1, f + 1)]!, pos[3 * id(1, f) + 1]! - pos[3 * id(1, f + 1) + 1]!, pos[3 * id(1, f) + 2]! - pos[3 * id(1, f + 1) + 2]!);
      sum += Math.acos((a * a + b * b - c * c) / (2 * a * b));
    }
    expect(sum).toBeGreaterThan(3 * Math.PI);
    checkInvariants(s, 7);
    // paths from one side of the crown to the other pass through the centre (a saddle pseudo-source)
    const r = exactDistance(m, pointSources([V(id(2, 0))]));
    const p = r.pathTo(V(id(2, k / 2)));
    expect(p.points.some((q) => q.kind === 'vertex' && q.vertex === 0)).toBe(true);
    expect(p.length).toBeCloseTo(r.field.distance[id(2, k / 2)]!, 10);
    expect(r.field.distance[id(2, k / 2)]).toBeCloseTo(2 * Math.hypot(2, 1.6), 10); // straight in and out: 2·|(2, 0, ±1.6)|
  });

  it('degenerate faces (collinear corners, lengths breaking the triangle inequality): finite, non-negative, never NaN', () => {
    const g = flatGrid(6, 6, 1, 1);
    // move vertex 24 = (0.5, 0.5) onto its neighbour 17 = (0.5, 1/3): a zero-length edge, zero-area faces
    g.positions[3 * 24 + 1] = 1 / 3;
    const m = meshOf(g);
    const bad = intrinsicFromLengths(m.topology, m.edgeLength.map((l, e) => (e === 40 ? 3 * l : l)));
    for (const mesh of [m, bad]) {
      const r = exactDistance(mesh, pointSources([V(0)]));
      for (const d of r.field.distance) {
        expect(Number.isNaN(d)).toBe(false);
        expect(d).toBeGreaterThanOrEqual(0);
        expect(d).toBeLessThan(Infinity);
      }
      const p = r.pathTo(V(48));
      expect(Number.isFinite(p.length)).toBe(true);
      expect(isSurfacePath(mesh.topology, p.points)).toBe(true);
    }
  });
});

describe('regression: path to an unreachable point', () => {
  it('has no points and infinite length (it used to return the point itself with length 0)', () => {
    const pos = Float64Array.from([0, 0, 0, 1, 0, 0, 0, 1, 0, 5, 0, 0, 6, 0, 0, 5, 1, 0]);
    const { topology: t } = buildTopology([0, 1, 2, 3, 4, 5], 6);
    const r = exactDistance(intrinsicFromPositions(t, pos), { points: [{ kind: 'vertex', vertex: 0 }], curves: [] });
    const p = r.pathTo({ kind: 'vertex', vertex: 4 });
    expect(p.points).toEqual([]);
    expect(p.length).toBe(Infinity);
  });
});
