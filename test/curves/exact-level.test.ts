/**
 * Offsets of the exact distance where the level is not seen at the vertices
 * (exact-level.ts): circles round points inside faces and on edges, the
 * stadium round a segment across a plate, and one spelling per source.
 * Closed forms: a circle of radius D has length 2πD; the parallel curve at D
 * of a segment of length ℓ (a stadium) has length 2ℓ + 2πD (Steiner's
 * formula for parallel sets, e.g. Santaló, Integral Geometry and Geometric
 * Probability, 1976, §I.1). The polygon's error: inscribed chords with
 * sagitta ≤ 3e-3 of the chord lose under 1e-4 of the length (elementary).
 */
import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import type { SurfacePoint } from '../../src/mesh/surface-point.js';
import { surfaceOffset } from '../../src/curves/offset.js';
import { flatGrid, type Shape } from '../fixtures/shapes.js';

const surfaceOf = (s: Shape) => ({ topology: buildTopology(s.triangles, s.positions.length / 3).topology, positions: s.positions, report: { orientationSeams: new Int32Array(0) } });
const S = surfaceOf(flatGrid(4, 4, 4, 4)); // the plate [0, 4]² in unit cells, two triangles each
const P = S.positions, t = S.topology;
const total = (cs: { length: number }[]) => cs.reduce((s, c) => s + c.length, 0);
const pos = (f: number, b: number[]) => [0, 1, 2].map((d) => b.reduce((s, w, k) => s + w * P[3 * t.tri[3 * f + k]! + d]!, 0));

describe('exact offsets that cross no edge, or an edge twice', () => {
  it('a point inside a face, D below its distance to the face edges: one closed circle, length 2πD', () => {
    const f = 10, b: [number, number, number] = [1 / 3, 1 / 3, 1 / 3], D = 0.05; // inradius of a half unit cell: 0.29
    const r = surfaceOffset(S, { points: [{ kind: 'face', face: f, bary: b }], curves: [] }, D);
    expect(r.curves).toHaveLength(1);
    expect(r.curves[0]!.closed).toBe(true);
    expect(Math.abs(r.curves[0]!.length / (2 * Math.PI * D) - 1)).toBeLessThan(1e-4);
    const c = pos(f, b);
    for (const p of r.curves[0]!.points) expect(Math.abs(Math.hypot(p[0] - c[0]!, p[1] - c[1]!) - D)).toBeLessThan(1e-9);
  });
  it('a point inside a face, D past its edges (the circle crosses edges twice each): closed, 2πD', () => {
    const f = 10, b: [number, number, number] = [0.3, 0.3, 0.4], D = 0.6;
    const r = surfaceOffset(S, { points: [{ kind: 'face', face: f, bary: b }], curves: [] }, D);
    expect(r.curves).toHaveLength(1);
    expect(r.curves[0]!.closed).toBe(true);
    expect(Math.abs(r.curves[0]!.length / (2 * Math.PI * D) - 1)).toBeLessThan(1e-4);
  });
  it('a point on an interior edge: closed circle 2πD (the edge holds two crossings, both ends farther than D)', () => {
    const e = t.edgeOf[3 * 10]!;
    const r = surfaceOffset(S, { points: [{ kind: 'edge', edge: e, t: 0.4 }], curves: [] }, 0.1);
    expect(r.curves).toHaveLength(1);
    expect(r.curves[0]!.closed).toBe(true);
    expect(Math.abs(r.curves[0]!.length / (2 * Math.PI * 0.1) - 1)).toBeLessThan(1e-4);
  });
  it('a segment source through the middle of faces: the stadium, length 2ℓ + 2πD (Steiner)', () => {
    // from (1.3, 1.2) to (2.7, 2.9): split where it crosses edges so consecutive points share a face
    const a = [1.3, 1.2], z = [2.7, 2.9];
    const curve: SurfacePoint[] = [];
    const ts = new Set<number>([0, 1]); // parameters where the segment crosses grid lines x = k, y = k and the cells' diagonals
    for (let k = 1; k < 4; k++) for (const d of [0, 1]) { const u = (k - a[d]!) / (z[d]! - a[d]!); if (u > 0 && u < 1) ts.add(u); }
    const locate = (x: number, y: number): SurfacePoint => {
      for (let f = 0; f < t.nf; f++) {
        const A = [P[3 * t.tri[3 * f]!]!, P[3 * t.tri[3 * f]! + 1]!], B = [P[3 * t.tri[3 * f + 1]!]!, P[3 * t.tri[3 * f + 1]! + 1]!], C = [P[3 * t.tri[3 * f + 2]!]!, P[3 * t.tri[3 * f + 2]! + 1]!];
        const det = (B[0]! - A[0]!) * (C[1]! - A[1]!) - (B[1]! - A[1]!) * (C[0]! - A[0]!);
        const u = ((x - A[0]!) * (C[1]! - A[1]!) - (y - A[1]!) * (C[0]! - A[0]!)) / det, v = ((B[0]! - A[0]!) * (y - A[1]!) - (B[1]! - A[1]!) * (x - A[0]!)) / det;
        if (u >= -1e-12 && v >= -1e-12 && u + v <= 1 + 1e-12) return { kind: 'face', face: f, bary: [Math.max(0, 1 - u - v), Math.max(0, u), Math.max(0, v)] };
      }
      throw new Error('off the plate');
    };
    // diagonal crossings: the grid's diagonals are x − y = const or x + y = const; add both kinds
    for (let k = -4; k <= 8; k++) for (const sgn of [1, -1]) {
      const u = (k - (a[0]! + sgn * a[1]!)) / ((z[0]! - a[0]!) + sgn * (z[1]! - a[1]!));
      if (u > 0 && u < 1) ts.add(u);
    }
    for (const u of [...ts].sort((p, q) => p - q)) curve.push(locate(a[0]! + u * (z[0]! - a[0]!), a[1]! + u * (z[1]! - a[1]!)));
    const D = 0.15, l = Math.hypot(z[0]! - a[0]!, z[1]! - a[1]!);
    const r = surfaceOffset(S, { points: [], curves: [curve] }, D);
    expect(r.curves).toHaveLength(1);
    expect(r.curves[0]!.closed).toBe(true);
    expect(Math.abs(total(r.curves) / (2 * l + 2 * Math.PI * D) - 1)).toBeLessThan(1e-4);
  });
  it('every spelling of a vertex source gives the same curves (v:, a face corner, an edge end)', () => {
    const v = t.tri[3 * 10]!;
    const h = 3 * 10, e = t.edgeOf[h]!, atTail = t.edgeHalfedge[e] === h;
    const spell: SurfacePoint[] = [
      { kind: 'vertex', vertex: v },
      { kind: 'face', face: 10, bary: [1, 0, 0] },
      { kind: 'edge', edge: e, t: atTail ? 0 : 1 },
    ];
    const runs = spell.map((p) => surfaceOffset(S, { points: [p], curves: [] }, 0.3).curves);
    for (const r of runs) {
      expect(r).toHaveLength(1);
      expect(r[0]!.points).toEqual(runs[0]![0]!.points);
    }
    expect(Math.abs(runs[0]![0]!.length / (2 * Math.PI * 0.3) - 1)).toBeLessThan(1e-4); // an interior vertex of a flat plate: a circle
  });
});

describe('pairing in faces that hold two arcs of the sublevel set', () => {
  const v = (x: number, y: number): SurfacePoint => ({ kind: 'vertex', vertex: y * 5 + x }); // flatGrid(4, 4, 4, 4): vertex (x, y)
  it('two vertex sources 1 apart, D = 0.3: two separate circles of length 2πD (the faces between hold two arcs, not joined)', () => {
    const r = surfaceOffset(S, { points: [v(1, 1), v(2, 1)], curves: [] }, 0.3);
    expect(r.curves).toHaveLength(2);
    for (const c of r.curves) {
      expect(c.closed).toBe(true);
      expect(Math.abs(c.length / (2 * Math.PI * 0.3) - 1)).toBeLessThan(1e-4);
    }
  });
  it('D = 0.7: one closed curve round the union of the two discs, length 2·D·(2π − 2α), cos α = 0.5/D (elementary)', () => {
    const D = 0.7, alpha = Math.acos(0.5 / D);
    const r = surfaceOffset(S, { points: [v(1, 1), v(2, 1)], curves: [] }, D);
    expect(r.curves).toHaveLength(1);
    expect(r.curves[0]!.closed).toBe(true);
    expect(Math.abs(r.curves[0]!.length / (2 * D * (2 * Math.PI - 2 * alpha)) - 1)).toBeLessThan(1e-4);
  });
});

describe('loops inside one face that are not traced are reported, never taken for nothing', () => {
  it('two point sources in one face, D crossing no edge: the face is reported (untracedFaces)', () => {
    const pts: SurfacePoint[] = [{ kind: 'face', face: 10, bary: [0.4, 0.3, 0.3] }, { kind: 'face', face: 10, bary: [0.3, 0.4, 0.3] }];
    const r = surfaceOffset(S, { points: pts, curves: [] }, 0.02);
    expect(r.curves).toHaveLength(0);
    expect(r.untracedFaces).toEqual([10]);
  });
  it('one point source: traced (the circle), nothing reported', () => {
    const r = surfaceOffset(S, { points: [{ kind: 'face', face: 10, bary: [0.4, 0.3, 0.3] }], curves: [] }, 0.02);
    expect(r.curves).toHaveLength(1);
    expect(r.untracedFaces).toEqual([]);
  });
});

describe('heat and graph: a level below the field\'s resolution is said so', () => {
  it('graph, D smaller than the distance to the nearest vertex: no curve, belowResolution set; exact finds the circle', () => {
    const src = { points: [{ kind: 'face', face: 10, bary: [1 / 3, 1 / 3, 1 / 3] } as SurfacePoint], curves: [] };
    const g = surfaceOffset(S, src, 0.05, { method: 'graph' });
    expect(g.curves).toHaveLength(0);
    expect(g.belowResolution).toBeGreaterThan(0.05);
    expect(surfaceOffset(S, src, 0.05).belowResolution).toBeNull();
  });
});
