/**
 * Isolines: chaining, the degenerate cases (a vertex exactly on the level,
 * saddles, boundaries, missing values), exact crossings, and the isolines of
 * the heat method's field. Sources beside each check.
 */
import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import type { Topology } from '../../src/mesh/topology.js';
import { prepareDistance } from '../../src/geodesic/solver.js';
import { isolines, chooseLevels, polylineLength } from '../../src/curves/isolines.js';
import { distanceScalarField } from '../../src/curves/offset.js';
import { planArea } from '../../src/curves/bands.js';
import { isOrthodromeError } from '../../src/errors.js';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { surfaceFromMeshData, isManifold } from '../../src/mesh/surface.js';
import { flatGrid, icosphere, type Shape } from '../fixtures/shapes.js';
import { holedPlate } from '../fixtures/holed-plates.js';

const topo = (s: Shape): Topology => buildTopology(s.triangles, s.positions.length / 3).topology;
const fieldOf = (s: Shape, f: (x: number, y: number, z: number) => number) => {
  const n = s.positions.length / 3, out = new Float64Array(n);
  for (let v = 0; v < n; v++) out[v] = f(s.positions[3 * v]!, s.positions[3 * v + 1]!, s.positions[3 * v + 2]!);
  return out;
};
const codeOf = (f: () => unknown) => { try { f(); } catch (e) { return isOrthodromeError(e) ? e.code : 'other'; } return 'none'; };

describe('isolines: chaining and degenerate cases', () => {
  it('a linear field gives one straight open line, also when the level passes through a column of vertices', () => {
    // closed form: the level set of f = x on the square [0, 1]² is the segment x = L, length 1
    // (elementary); at L = 0.5 every vertex of the column x = 0.5 lies on the level and counts as
    // above it (the perturbation rule), so the line runs through those vertices, once each
    const s = flatGrid(10, 10);
    const t = topo(s);
    for (const L of [0.5, 0.37]) {
      const c = isolines(t, s.positions, { values: fieldOf(s, (x) => x) }, [L]);
      expect(c.length).toBe(1);
      expect(c[0]!.closed).toBe(false);
      expect(c[0]!.length).toBeCloseTo(1, 12);
      for (const p of c[0]!.points) expect(Math.abs(p[0] - L)).toBeLessThan(1e-12);
      if (L === 0.5) expect(c[0]!.points.length).toBe(11); // the 11 vertices of the column, no repeats
      // lower values on the left: the line runs towards +y, so x < L lies to its left (seen from +z)
      expect(c[0]!.points[0]![1]).toBeLessThan(c[0]!.points[c[0]!.points.length - 1]![1]);
    }
  });

  it('a saddle: the level x·y = ±c gives two open branches each, ending on the boundary', () => {
    // closed form: x·y = c (c ≠ 0) is a hyperbola with two branches; on [−1, 1]² each branch runs
    // from side to side (elementary). Linear interpolation along a face is exact on the axis-parallel
    // edges (xy is linear there) and off by at most h²/4 on the diagonals (interpolation error of
    // a quadratic, common practice)
    const n = 40, h = 2 / n;
    const s = flatGrid(n, n, 2, 2);
    for (let i = 0; i < s.positions.length; i += 3) { s.positions[i]! -= 1; s.positions[i + 1]! -= 1; }
    const t = topo(s);
    const f = fieldOf(s, (x, y) => x * y);
    for (const L of [0.1, -0.1]) {
      const c = isolines(t, s.positions, { values: f }, [L]);
      expect(c.length).toBe(2);
      for (const k of c) {
        expect(k.closed).toBe(false);
        for (const p of k.points) expect(Math.abs(p[0] * p[1] - L)).toBeLessThan(h * h);
        // both ends on the boundary of the square
        for (const p of [k.points[0]!, k.points[k.points.length - 1]!]) expect(Math.max(Math.abs(p[0]), Math.abs(p[1]))).toBeCloseTo(1, 12);
      }
    }
    // through the saddle itself (level 0, the saddle vertex on it, counted above): one curve per
    // pair of quadrants below, still no segment soup: every face segment is in exactly one curve
    const c0 = isolines(t, s.positions, { values: f }, [0]);
    expect(c0.length).toBe(2);
    for (const k of c0) expect(k.closed).toBe(false);
  });

  it('closed loops run counter-clockwise round a minimum (lower values on the left)', () => {
    // convention stated in isolines.ts; checked with the shoelace formula (plan-view signed area > 0)
    const s = holedPlate(1, [], 0.1);
    const t = topo(s);
    const c = isolines(t, s.positions, { values: fieldOf(s, (x, y) => Math.hypot(x, y)) }, [0.3, 0.6]);
    expect(c.length).toBe(2);
    for (const k of c) {
      expect(k.closed).toBe(true);
      expect(k.points[0]).toEqual(k.points[k.points.length - 1]);
      expect(planArea(k.points)).toBeGreaterThan(0);
      expect(k.length).toBeCloseTo(polylineLength(k.points), 12);
    }
  });

  it('a vertex alone exactly on the level with its neighbours below gives no curve; missing values cut curves open', () => {
    // perturbation rule: the level set of f + ε round an isolated maximum at the level is empty in
    // the limit (a loop of zero length), so nothing is returned
    const s = flatGrid(4, 4);
    const t = topo(s);
    const peak = fieldOf(s, (x, y) => (Math.abs(x - 0.5) < 1e-9 && Math.abs(y - 0.5) < 1e-9 ? 1 : 0));
    expect(isolines(t, s.positions, { values: peak }, [1])).toEqual([]);
    // f = x, unknown (Infinity) on the faces with y > 0.5: the line x = 0.3 stops at y = 0.5
    const cut = fieldOf(s, (x, y) => (y > 0.6 ? Infinity : x));
    const c = isolines(t, s.positions, { values: cut }, [0.3]);
    expect(c.length).toBe(1);
    expect(c[0]!.closed).toBe(false);
    expect(c[0]!.length).toBeCloseTo(0.5, 12);
  });

  it('non-manifold input (three fins on one edge, split by the build): the curves end at the cut, open', () => {
    // three flat 1 × 1 fins share the edge x = y = 0, 0 ≤ z ≤ 1; the level z = 0.55 of the field z
    // crosses each fin in a segment of length 1 (elementary), whatever way the build splits the edge
    const pos: number[] = [], tri: number[] = [];
    const id = new Map<string, number>();
    const vert = (x: number, y: number, z: number): number => {
      const k = [x, y, z].map((c) => c.toFixed(9)).join(',');
      let v = id.get(k);
      if (v === undefined) { v = pos.length / 3; id.set(k, v); pos.push(x, y, z); }
      return v;
    };
    const m = 4;
    for (const th of [0, (2 * Math.PI) / 3, (4 * Math.PI) / 3]) {
      const at = (i: number, j: number) => vert((i / m) * Math.cos(th), (i / m) * Math.sin(th), j / m);
      for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) tri.push(at(i, j), at(i + 1, j), at(i + 1, j + 1), at(i, j), at(i + 1, j + 1), at(i, j + 1));
    }
    const surf = surfaceFromMeshData(meshFromTriangles(Float64Array.from(pos), tri));
    expect(isManifold(surf)).toBe(false);
    const z = new Float64Array(surf.topology.nv);
    for (let v = 0; v < z.length; v++) z[v] = surf.positions[3 * v + 2]!;
    const c = isolines(surf.topology, surf.positions, { values: z }, [0.55]);
    expect(c.every((k) => !k.closed)).toBe(true);
    expect(c.reduce((a, k) => a + k.length, 0)).toBeCloseTo(3, 12);
  });

  it('chooseLevels: multiples inside the range, listed levels sorted, limits', () => {
    // with every D the levels are k·D with min < k·D ≤ max (definition in isolines.ts)
    const v = Float64Array.from([0.05, 0.4, Infinity, 1.0]);
    expect(chooseLevels(v, { every: 0.25 })).toEqual([0.25, 0.5, 0.75, 1]);
    expect(chooseLevels(v, { levels: [3, 1, 1, 2] })).toEqual([1, 2, 3]);
    expect(codeOf(() => chooseLevels(v, { every: 0 }))).toBe('USAGE');
    expect(codeOf(() => chooseLevels(v, { levels: [NaN] }))).toBe('USAGE');
    expect(codeOf(() => chooseLevels(v, {}))).toBe('USAGE');
    expect(codeOf(() => chooseLevels(v, { every: 1e-6 }))).toBe('LIMIT');
    expect(codeOf(() => chooseLevels(v, { every: 0.1, maxLevels: 5 }))).toBe('LIMIT');
  });
});

describe('isolines: exact crossings and the heat field', () => {
  it('with the exact method each crossing lies at the exact distance, not at a linear guess', () => {
    // closed form: on a flat disc the exact polyhedral distance from a vertex is the straight-line
    // distance (the plane is its own development), so every crossing of level L is at distance L
    const s = holedPlate(1, [], 0.15);
    const t = topo(s);
    const m = intrinsicFromPositions(t, s.positions);
    const src = 0;
    const r = prepareDistance(m, 'exact').solve({ points: [{ kind: 'vertex', vertex: src }], curves: [] });
    const P = s.positions, sx = P[3 * src]!, sy = P[3 * src + 1]!;
    const far = (c: ReturnType<typeof isolines>) => Math.max(...c.flatMap((k) => k.points.map((p) => Math.abs(Math.hypot(p[0] - sx, p[1] - sy) - 0.5))));
    const exact = far(isolines(t, P, distanceScalarField(r), [0.5]));
    const linear = far(isolines(t, P, { values: r.field.distance }, [0.5]));
    expect(exact).toBeLessThan(1e-9);
    expect(linear).toBeGreaterThan(1e-4); // the distance is not linear along an edge
  });

  it('heat-method isolines on a sphere: small circles of length 2πR·sin(L/R), closer on the finer mesh', () => {
    // closed form: geodesic circles on a sphere (do Carmo, Differential Geometry of Curves and
    // Surfaces, §4-6); the heat method converges under refinement (Crane, Weischedel & Wardetzky,
    // ACM TOG 32(5), 2013)
    const R = 1;
    const errs = [3, 4].map((level) => {
      const s = icosphere(level, R);
      const t = topo(s);
      const r = prepareDistance(intrinsicFromPositions(t, s.positions), 'heat').solve({ points: [{ kind: 'vertex', vertex: 0 }], curves: [] });
      const c = isolines(t, s.positions, distanceScalarField(r), chooseLevels(r.field.distance, { every: 0.5 }));
      let worst = 0;
      for (const L of [0.5, 1, 1.5, 2, 2.5]) {
        const at = c.filter((k) => k.level === L);
        expect(at.length).toBe(1);
        expect(at[0]!.closed).toBe(true);
        const want = 2 * Math.PI * R * Math.sin(L / R);
        worst = Math.max(worst, Math.abs(at[0]!.length - want) / want);
      }
      return worst;
    });
    expect(errs[0]!).toBeLessThan(0.05);
    expect(errs[1]!).toBeLessThan(errs[0]!);
  });
});
