/**
 * Nearest-point queries and point specs. Closed forms: the nearest point of a
 * plane is the orthogonal projection; of a sphere, the radial projection
 * (elementary).
 */
import { describe, expect, it } from 'vitest';
import { SurfaceLocator, closestOnTriangle } from '../../src/query/snap.js';
import { PointResolver } from '../../src/query/resolve.js';
import { parsePointSpec, formatSurfacePoint, surfacePointPosition } from '../../src/mesh/surface-point.js';
import { buildTopology } from '../../src/mesh/build.js';
import { flatGrid, icosphere, rng } from '../fixtures/shapes.js';

describe('closest point on a triangle (Ericson 2005, §5.1.5)', () => {
  const a = [0, 0, 0], b = [1, 0, 0], c = [0, 1, 0];
  it('interior point projects orthogonally', () => {
    const w = closestOnTriangle([0.2, 0.3, 5], a, b, c);
    expect(w[1]).toBeCloseTo(0.2, 15);
    expect(w[2]).toBeCloseTo(0.3, 15);
  });
  it('outside points land on the nearest corner or edge', () => {
    expect(closestOnTriangle([-1, -1, 0], a, b, c)).toEqual([1, 0, 0]);
    const e = closestOnTriangle([0.5, -2, 0], a, b, c);
    expect(e[0]).toBeCloseTo(0.5, 15);
    expect(e[1]).toBeCloseTo(0.5, 15);
  });
});

describe('SurfaceLocator', () => {
  it('flat terrain at map coordinates: projection kept to float64 accuracy', () => {
    const s = flatGrid(40, 40, 100, 100, 0.2, 2);
    for (let i = 0; i < s.positions.length; i += 3) {
      s.positions[i]! += 431200.125;
      s.positions[i + 1]! += 6170400.375;
      s.positions[i + 2] = 212.5;
    }
    const { topology: t } = buildTopology(s.triangles, s.positions.length / 3);
    const loc = new SurfaceLocator(t, s.positions);
    const r = rng(5);
    for (let k = 0; k < 20; k++) {
      const x = 431200.125 + 1 + 98 * r(), y = 6170400.375 + 1 + 98 * r();
      const res = loc.closest([x, y, 250]);
      const p = surfacePointPosition(res.point, t, s.positions);
      expect(Math.abs(p[0]! - x)).toBeLessThan(1e-6);
      expect(Math.abs(p[1]! - y)).toBeLessThan(1e-6);
      expect(res.distance).toBeCloseTo(37.5, 6);
    }
  });
  it('sphere: agrees with a brute-force search over every face, and lies near the radial projection', () => {
    const s = icosphere(4, 10);
    const { topology: t } = buildTopology(s.triangles, s.positions.length / 3);
    const loc = new SurfaceLocator(t, s.positions);
    const r = rng(8);
    const P = s.positions;
    for (let k = 0; k < 10; k++) {
      const dir = [r() - 0.5, r() - 0.5, r() - 0.5];
      const n = Math.hypot(...dir);
      const q = dir.map((x) => (x / n) * (9.5 + r())) as [number, number, number];
      const res = loc.closest(q);
      let best = Infinity;
      for (let f = 0; f < t.nf; f++) {
        const c = [0, 1, 2].map((j) => P.subarray(3 * t.tri[3 * f + j]!, 3 * t.tri[3 * f + j]! + 3));
        const w = closestOnTriangle(q, c[0]!, c[1]!, c[2]!);
        const p = [0, 1, 2].map((d) => w[0] * c[0]![d]! + w[1] * c[1]![d]! + w[2] * c[2]![d]!);
        best = Math.min(best, Math.hypot(p[0]! - q[0], p[1]! - q[1], p[2]! - q[2]));
      }
      expect(Math.abs(res.distance - best)).toBeLessThan(1e-9);
      const p = surfacePointPosition(res.point, t, P);
      const radial = q.map((x) => (x / Math.hypot(...q)) * 10);
      expect(Math.hypot(p[0]! - radial[0]!, p[1]! - radial[1]!, p[2]! - radial[2]!)).toBeLessThan(0.1);
    }
  });
});

describe('point specs', () => {
  it('parse and format round-trip', () => {
    for (const s of ['v:12', 'e:3:0.25', 'f:7:0.2,0.3,0.5']) expect(formatSurfacePoint(parsePointSpec(s) as never)).toBe(s);
  });
  it('bad specs give one-line usage errors naming the option', () => {
    expect(() => parsePointSpec('x:1', '--from')).toThrow(/--from: cannot read point 'x:1'/);
    expect(() => parsePointSpec('e:1:1.5', '--to')).toThrow(/must lie in \[0, 1\]/);
    expect(() => parsePointSpec('f:1:-1,1,1')).toThrow(/non-negative/);
    const s = icosphere(0);
    const { topology: t } = buildTopology(s.triangles, 12);
    const r = new PointResolver(t, s.positions);
    expect(() => r.resolve('v:99', '--from')).toThrow(/--from: vertex 99 does not exist \(mesh has 12\)/);
    // (0,0,5) lies above the edge joining (0, ±1, φ)/|·| of the icosahedron: it lands on that edge's midpoint
    // (elementary), spelt as an edge point (canonical spelling)
    const q = r.resolve('p:0,0,5');
    const phi = (1 + Math.sqrt(5)) / 2;
    expect(q.kind).toBe('edge');
    expect(surfacePointPosition(q, t, s.positions)[2]).toBeCloseTo(phi / Math.sqrt(1 + phi * phi), 12);
  });
});

describe('vertical drop p:X,Y (map positions) and landing reports', () => {
  it('on a tilted plane z = 0.3x − 0.2y + 7 at map coordinates, lands at the plane height (closed form)', () => {
    const s = flatGrid(30, 30, 3000, 3000, 0.2, 4);
    for (let i = 0; i < s.positions.length; i += 3) {
      s.positions[i] += 500_000; s.positions[i + 1] += 6_000_000; // map-sized coordinates
      s.positions[i + 2] = 0.3 * (s.positions[i]! - 500_000) - 0.2 * (s.positions[i + 1]! - 6_000_000) + 7;
    }
    const { topology: t } = buildTopology(s.triangles, s.positions.length / 3);
    const r = new PointResolver(t, s.positions);
    const g = rng(9);
    for (let k = 0; k < 50; k++) {
      const x = 500_000 + 3000 * g(), y = 6_000_000 + 3000 * g();
      const p = r.resolve(`p:${x},${y}`, '--from');
      const at = surfacePointPosition(p, t, s.positions);
      expect(at[0]).toBeCloseTo(x, 6);
      expect(at[1]).toBeCloseTo(y, 6);
      expect(at[2]).toBeCloseTo(0.3 * (x - 500_000) - 0.2 * (y - 6_000_000) + 7, 6);
    }
    expect(r.landings).toHaveLength(50);
    expect(r.landings[0]!.distance).toBeLessThan(1e-6); // straight below: no horizontal move
    // a grid vertex spelt as p:X,Y is that vertex (canonical spelling)
    const v = 31 * 5 + 5;
    expect(r.resolve(`p:${s.positions[3 * v]},${s.positions[3 * v + 1]}`)).toEqual({ kind: 'vertex', vertex: v });
  });

  it('several crossings: the highest wins (documented rule); no crossing: a usage error naming the point', () => {
    const a = flatGrid(2, 2, 1, 1), n = a.positions.length / 3;
    const pos = new Float64Array(2 * a.positions.length);
    pos.set(a.positions);
    for (let i = 0; i < a.positions.length; i += 3) {
      pos[a.positions.length + i] = a.positions[i]!; pos[a.positions.length + i + 1] = a.positions[i + 1]!; pos[a.positions.length + i + 2] = 2;
    }
    const tris = new Uint32Array(2 * a.triangles.length);
    tris.set(a.triangles);
    for (let i = 0; i < a.triangles.length; i++) tris[a.triangles.length + i] = a.triangles[i]! + n;
    const { topology: t } = buildTopology(tris, 2 * n);
    const r = new PointResolver(t, pos);
    const p = r.resolve('p:0.3,0.6');
    expect(surfacePointPosition(p, t, pos)[2]).toBe(2);
    expect(() => r.resolve('p:1.5,0.5', '--to')).toThrow(/^--to: .*misses the surface in point 'p:1.5,0.5'/);
  });

  it('p:X,Y,Z reports where it landed and how far it moved (orthogonal projection: the height above the plane)', () => {
    const s = flatGrid(4, 4, 4, 4);
    const { topology: t } = buildTopology(s.triangles, s.positions.length / 3);
    const r = new PointResolver(t, s.positions);
    r.resolve('p:1.3,2.6,5', '--from');
    expect(r.landings[0]!.spec).toBe('p:1.3,2.6,5');
    expect(r.landings[0]!.distance).toBeCloseTo(5, 12);
    expect(r.landings[0]!.position[0]).toBeCloseTo(1.3, 12);
    expect(r.landings[0]!.position[2]).toBe(0);
  });
});
