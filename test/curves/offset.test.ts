/**
 * On-surface offsets against closed forms, at two resolutions each: the
 * error against the smooth closed form must fall under refinement.
 * Sources of the closed forms are named beside each check.
 */
import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { boundaryLoops } from '../../src/mesh/boundary.js';
import type { Topology } from '../../src/mesh/topology.js';
import type { SurfacePoint } from '../../src/mesh/surface-point.js';
import { surfaceOffset } from '../../src/curves/offset.js';
import { parsePolylines } from '../../src/curves/polyline-source.js';

type SourceSet = Parameters<typeof surfaceOffset>[1];
import { isOrthodromeError } from '../../src/errors.js';
import { cylinder, icosphere, gridTriangles, type Shape } from '../fixtures/shapes.js';
import { holedPlate } from '../fixtures/holed-plates.js';

/** A solvable surface from a generated shape (orientable: no seams). */
const surfaceOf = (s: Shape) => ({ topology: buildTopology(s.triangles, s.positions.length / 3).topology, positions: s.positions, report: { orientationSeams: new Int32Array(0) } });

/** The boundary loop whose vertices all pass `keep`, as a closed curve source. */
function loopWhere(t: Topology, P: Float64Array, keep: (x: number, y: number, z: number) => boolean): SourceSet {
  for (const loop of boundaryLoops(t)) {
    const vs = [...loop].map((h) => t.tri[h]!);
    if (vs.every((v) => keep(P[3 * v]!, P[3 * v + 1]!, P[3 * v + 2]!))) {
      const pts: SurfacePoint[] = vs.map((vertex) => ({ kind: 'vertex', vertex }));
      pts.push(pts[0]!);
      return { points: [], curves: [pts] };
    }
  }
  throw new Error('no such loop');
}

/** Flat square plate [−W, W]² on an n × n grid with the cells of the centred square of side a removed. */
function plateWithSquareHole(n: number, W: number, a: number): Shape {
  const positions = new Float64Array(3 * (n + 1) * (n + 1));
  for (let j = 0; j <= n; j++) for (let i = 0; i <= n; i++) {
    const v = j * (n + 1) + i;
    positions[3 * v] = -W + (2 * W * i) / n;
    positions[3 * v + 1] = -W + (2 * W * j) / n;
  }
  const all = gridTriangles(n, n), kept: number[] = [];
  for (let k = 0; k < all.length; k += 3) {
    const c = [0, 1].map((d) => (positions[3 * all[k]! + d]! + positions[3 * all[k + 1]! + d]! + positions[3 * all[k + 2]! + d]!) / 3);
    if (Math.abs(c[0]!) < a / 2 && Math.abs(c[1]!) < a / 2) continue;
    kept.push(all[k]!, all[k + 1]!, all[k + 2]!);
  }
  return { positions, triangles: Uint32Array.from(kept) };
}

describe('offsets: closed forms', () => {
  it('flat disc: the rim offset by D is the circle of radius R − D', () => {
    // closed form: in the plane the points at distance D inside a circle of radius R form the
    // concentric circle of radius R − D, length 2π(R − D) (elementary plane geometry)
    const R = 1, D = 0.3;
    const errs = [0.1, 0.05].map((h) => {
      const s = holedPlate(R, [], h);
      const m = surfaceOf(s);
      const src = loopWhere(m.topology, s.positions, () => true);
      const { curves } = surfaceOffset(m, src, D);
      expect(curves.length).toBe(1);
      expect(curves[0]!.closed).toBe(true);
      for (const p of curves[0]!.points) expect(Math.abs(Math.hypot(p[0], p[1]) - (R - D))).toBeLessThan(h * h);
      return Math.abs(curves[0]!.length - 2 * Math.PI * (R - D));
    });
    expect(errs[0]!).toBeLessThan(0.01 * 2 * Math.PI * (R - D));
    expect(errs[1]!).toBeLessThan(errs[0]!);
  });

  it('open cylinder: the bottom rim offset by D is the ring at height D', () => {
    // closed form: the cylinder unrolls isometrically to a strip (developable surface, Gauss's
    // theorema egregium), where distance from the bottom edge is the height; the meshed prism
    // unrolls exactly too, so the ring is at height D exactly and is the n-gon of perimeter
    // 2nR·sin(π/n), which tends to 2πR
    const R = 1, H = 2, D = 0.73;
    const errs = [24, 48].map((n) => {
      const s = cylinder(n, 10, R, H);
      const m = surfaceOf(s);
      const src = loopWhere(m.topology, s.positions, (_x, _y, z) => z === 0);
      const { curves } = surfaceOffset(m, src, D);
      expect(curves.length).toBe(1);
      expect(curves[0]!.closed).toBe(true);
      for (const p of curves[0]!.points) expect(Math.abs(p[2] - D)).toBeLessThan(1e-9 * H);
      expect(curves[0]!.length).toBeCloseTo(2 * n * R * Math.sin(Math.PI / n), 9);
      return Math.abs(curves[0]!.length - 2 * Math.PI * R);
    });
    expect(errs[1]!).toBeLessThan(errs[0]!);
  });

  it('sphere: the offset of a point by D is the small circle of length 2πR·sin(D/R)', () => {
    // closed form: the geodesic circle of radius D on a sphere of radius R has Euclidean
    // radius R·sin(D/R) (spherical geometry, e.g. do Carmo, Differential Geometry of Curves
    // and Surfaces, §4-6)
    const R = 2, D = 1.3;
    const want = 2 * Math.PI * R * Math.sin(D / R);
    const errs = [3, 4].map((level) => {
      const s = icosphere(level, R);
      const m = surfaceOf(s);
      const { curves } = surfaceOffset(m, { points: [{ kind: 'vertex', vertex: 0 }], curves: [] }, D);
      expect(curves.length).toBe(1);
      expect(curves[0]!.closed).toBe(true);
      return Math.abs(curves[0]!.length - want);
    });
    expect(errs[0]!).toBeLessThan(0.02 * want);
    expect(errs[1]!).toBeLessThan(errs[0]!);
  });

  it('flat plate with a square hole: the offset of the rim has rounded corners, length 4a + 2πD', () => {
    // closed form: the outer parallel curve at D of a convex polygon has length perimeter + 2πD
    // (Steiner's formula for parallel sets, e.g. Santaló, Integral Geometry and Geometric
    // Probability, 1976, §I.1); for a square of side a, 4a + 2πD
    const W = 1, a = 0.5, D = 0.3;
    const want = 4 * a + 2 * Math.PI * D;
    const errs = [24, 48].map((n) => { // the hole's sides on grid lines
      const s = plateWithSquareHole(n, W, a);
      const m = surfaceOf(s);
      const src = loopWhere(m.topology, s.positions, (x, y) => Math.max(Math.abs(x), Math.abs(y)) <= a / 2 + 1e-9);
      const { curves } = surfaceOffset(m, src, D);
      expect(curves.length).toBe(1);
      expect(curves[0]!.closed).toBe(true);
      // every point at distance D from the square (plane geometry: distance to a convex set)
      for (const p of curves[0]!.points) {
        const dx = Math.max(0, Math.abs(p[0]) - a / 2), dy = Math.max(0, Math.abs(p[1]) - a / 2);
        expect(Math.abs(Math.hypot(dx, dy) - D)).toBeLessThan(1e-9);
      }
      return Math.abs(curves[0]!.length - want);
    });
    // the exact method bends the curve to the level inside faces (exact-level.ts): what is left at
    // any resolution is the chord error, sagitta ≤ 3e-3 of each chord, under 1e-4 of the length (elementary)
    for (const e of errs) expect(e).toBeLessThan(1e-4 * want);
  });

  it('refuses a distance that is not a positive number (USAGE)', () => {
    const s = cylinder(8, 2);
    const m = surfaceOf(s);
    for (const D of [0, -1, NaN, Infinity]) {
      let err: unknown;
      try { surfaceOffset(m, { points: [{ kind: 'vertex', vertex: 0 }], curves: [] }, D); } catch (e) { err = e; }
      expect(isOrthodromeError(err) && err.code === 'USAGE').toBe(true);
    }
  });
  it('polyline files: CSV grouped by a curve column, OBJ l statements; bad lines are INPUT errors naming file:line', () => {
    // the formats are those written by write-curves.ts (CSV curve,…,x,y,z) and OBJ v/l (common practice)
    const csv = 'curve,level,closed,length,point,x,y,z\n0,5,0,2,0,0,0,0\n0,5,0,2,1,1,0,0\n1,6,0,1,0,0,1,0\n1,6,0,1,1,0,2,0\n';
    expect(parsePolylines(csv, 'a.csv', 'csv')).toEqual([[[0, 0, 0], [1, 0, 0]], [[0, 1, 0], [0, 2, 0]]]);
    expect(parsePolylines('v 0 0 0\nv 1 0 0\nv 1 1 0\nl 1 -1\n', 'a.obj', 'obj')).toEqual([[[0, 0, 0], [1, 1, 0]]]);
    const err = (f: () => unknown) => { try { f(); } catch (e) { return isOrthodromeError(e) ? `${e.code} ${e.message}` : 'other'; } return 'none'; };
    expect(err(() => parsePolylines('x,y,z\n0,0,0\n1,zz,0\n', 'b.csv', 'csv'))).toMatch(/^INPUT .*b\.csv:3/);
    expect(err(() => parsePolylines('a,b\n1,2\n', 'c.csv', 'csv'))).toMatch(/^INPUT .*c\.csv:1/);
    expect(err(() => parsePolylines('v 0 0 0\nl 1 5\n', 'd.obj', 'obj'))).toMatch(/^INPUT .*d\.obj:2/);
    expect(err(() => parsePolylines('x,y,z\n0,0,0\n', 'e.csv', 'csv'))).toMatch(/^INPUT .*two points/);
  });
});
