/**
 * Curve sources (polylines on the surface, boundary loops): exact distance
 * to a set of segments against closed forms on flat and developable
 * surfaces (elementary: distance to a segment in the plane; a prism's
 * lateral surface unrolls onto a strip, where the distance to the bottom
 * boundary is the height). Exact = 1e-9 relative.
 */
import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import type { IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { exactDistance } from '../../src/geodesic/exact/index.js';
import { boundaryCurves } from '../../src/geodesic/shared/sources.js';
import { isSurfacePath } from '../../src/geodesic/path.js';
import { surfacePointPosition } from '../../src/mesh/surface-point.js';
import type { SurfacePoint } from '../../src/mesh/surface-point.js';
import { flatGrid, cylinder, rng } from '../fixtures/shapes.js';
import type { Shape } from '../fixtures/shapes.js';

const meshOf = (s: Shape): IntrinsicMesh => intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);

function segDist(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax, dy = by - ay, ll = dx * dx + dy * dy;
  const u = Math.max(0, Math.min(1, ll > 0 ? ((px - ax) * dx + (py - ay) * dy) / ll : 0));
  return Math.hypot(px - ax - u * dx, py - ay - u * dy);
}

describe('curve sources on flat domains: distance to the polyline', () => {
  it('the boundary loop of a rectangle: min(x, W − x, y, H − y)', () => {
    const s = flatGrid(15, 10, 3, 2, 0.3, 8);
    const m = meshOf(s);
    const r = exactDistance(m, { points: [], curves: boundaryCurves(m.topology) });
    const P = s.positions;
    for (let v = 0; v < m.topology.nv; v++) {
      const x = P[3 * v]!, y = P[3 * v + 1]!;
      expect(Math.abs(r.field.distance[v]! - Math.min(x, 3 - x, y, 2 - y))).toBeLessThanOrEqual(1e-9 * 3);
    }
    // a random interior point: its path ends on the boundary, and is as long as the distance
    const q: SurfacePoint = { kind: 'face', face: 141, bary: [0.2, 0.3, 0.5] };
    const x = surfacePointPosition(q, m.topology, P);
    const d = Math.min(x[0]!, 3 - x[0]!, x[1]!, 2 - x[1]!);
    expect(Math.abs(r.distanceAt(q) - d)).toBeLessThanOrEqual(3e-9);
    const path = r.pathTo(q);
    expect(isSurfacePath(m.topology, path.points)).toBe(true);
    expect(Math.abs(path.length - d)).toBeLessThanOrEqual(3e-9);
    const foot = surfacePointPosition(path.points[0]!, m.topology, P);
    expect(Math.min(foot[0]!, 3 - foot[0]!, foot[1]!, 2 - foot[1]!)).toBeLessThan(1e-9);
  });

  it('a polyline of grid vertices, a segment inside one face and one along an edge: Euclidean distance to the union', () => {
    const nx = 12, ny = 12;
    const s = flatGrid(nx, ny, 1.2, 1.2); // cells 0.1, no jitter: rows of vertices are straight
    const m = meshOf(s);
    const t = m.topology;
    const P = s.positions;
    const row: SurfacePoint[] = [];
    for (let i = 2; i <= 8; i++) row.push({ kind: 'vertex', vertex: 4 * (nx + 1) + i }); // y = 0.4, x ∈ [0.2, 0.8]
    const f = 2 * (9 * nx + 5); // a face of cell (5, 9)
    const inFace: SurfacePoint[] = [
      { kind: 'face', face: f, bary: [0.6, 0.2, 0.2] },
      { kind: 'face', face: f, bary: [0.1, 0.3, 0.6] },
    ];
    const e = t.edgeOf[3 * 2 * (6 * nx + 9)]!; // an edge of cell (9, 6)
    const onEdge: SurfacePoint[] = [{ kind: 'edge', edge: e, t: 0.2 }, { kind: 'edge', edge: e, t: 0.9 }];
    const curves = [row, inFace, onEdge];
    const r = exactDistance(m, { points: [], curves });
    const segs: number[][] = [];
    for (const c of curves) {
      for (let i = 1; i < c.length; i++) {
        const a = surfacePointPosition(c[i - 1]!, t, P), b = surfacePointPosition(c[i]!, t, P);
        segs.push([a[0]!, a[1]!, b[0]!, b[1]!]);
      }
    }
    const ref = (x: number, y: number) => Math.min(...segs.map(([ax, ay, bx, by]) => segDist(x, y, ax!, ay!, bx!, by!)));
    for (let v = 0; v < t.nv; v++) expect(Math.abs(r.field.distance[v]! - ref(P[3 * v]!, P[3 * v + 1]!))).toBeLessThanOrEqual(1.2e-9);
    const rand = rng(4);
    for (let i = 0; i < 40; i++) {
      const b0 = rand(), b1 = rand() * (1 - b0);
      const q: SurfacePoint = { kind: 'face', face: Math.floor(rand() * t.nf), bary: [b0, b1, 1 - b0 - b1] };
      const x = surfacePointPosition(q, t, P);
      const d = ref(x[0]!, x[1]!);
      expect(Math.abs(r.distanceAt(q) - d)).toBeLessThanOrEqual(1.2e-9);
      const path = r.pathTo(q);
      expect(isSurfacePath(t, path.points)).toBe(true);
      expect(Math.abs(path.length - d)).toBeLessThanOrEqual(1.2e-9);
    }
  });
});

describe('curve sources on a developable surface', () => {
  it('prism lateral surface: distance to the bottom boundary loop is the height', () => {
    const s = cylinder(7, 6, 1, 2);
    const m = meshOf(s);
    const bottom = boundaryCurves(m.topology).filter((c) => c.every((p) => p.kind === 'vertex' && s.positions[3 * p.vertex + 2] === 0));
    expect(bottom.length).toBe(1);
    const r = exactDistance(m, { points: [], curves: bottom });
    for (let v = 0; v < m.topology.nv; v++) expect(Math.abs(r.field.distance[v]! - s.positions[3 * v + 2]!)).toBeLessThanOrEqual(2e-9);
    // points inside faces are reached by the straight front, not from the vertices
    const rand = rng(12);
    for (let i = 0; i < 30; i++) {
      const b0 = rand(), b1 = rand() * (1 - b0);
      const q: SurfacePoint = { kind: 'face', face: Math.floor(rand() * m.topology.nf), bary: [b0, b1, 1 - b0 - b1] };
      const z = surfacePointPosition(q, m.topology, s.positions)[2]!;
      expect(Math.abs(r.distanceAt(q) - z)).toBeLessThanOrEqual(2e-9);
      expect(Math.abs(r.pathTo(q).length - z)).toBeLessThanOrEqual(2e-9);
    }
  });
});
