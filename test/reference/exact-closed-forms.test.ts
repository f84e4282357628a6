/**
 * Exact polyhedral distances against closed forms on surfaces that unfold
 * into the plane. "Exact" means agreement to 1e-9 relative.
 */
import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import type { IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { exactDistance } from '../../src/geodesic/exact/index.js';
import { pointSources } from '../../src/geodesic/shared/sources.js';
import { surfacePointPosition } from '../../src/mesh/surface-point.js';
import type { SurfacePoint } from '../../src/mesh/surface-point.js';
import { flatGrid, cylinder, rng } from '../fixtures/shapes.js';
import { subdivide, type V3 } from '../fixtures/subdivide.js';

const TOL = 1e-9;

function meshOf(positions: Float64Array, triangles: Uint32Array): IntrinsicMesh {
  return intrinsicFromPositions(buildTopology(triangles, positions.length / 3).topology, positions);
}

function expectRel(actual: number, expected: number, scale: number): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(TOL * Math.max(expected, scale));
}

describe('flat convex domains: Euclidean distance (elementary)', () => {
  const s = flatGrid(12, 9, 3, 2, 0.35, 11);
  const m = meshOf(s.positions, s.triangles);
  const t = m.topology;
  const P = s.positions;
  const at = (p: SurfacePoint) => surfacePointPosition(p, t, P) as Float64Array;

  for (const src of [
    { kind: 'vertex', vertex: 40 },
    { kind: 'edge', edge: 77, t: 0.3 },
    { kind: 'face', face: 101, bary: [0.2, 0.5, 0.3] },
  ] as SurfacePoint[]) {
    it(`from a ${src.kind} source: every vertex, random face points and their paths`, () => {
      const r = exactDistance(m, pointSources([src]));
      expect(r.complete).toBe(true);
      const o = at(src);
      for (let v = 0; v < t.nv; v++) {
        expectRel(r.field.distance[v]!, Math.hypot(P[3 * v]! - o[0]!, P[3 * v + 1]! - o[1]!), 3);
      }
      const rand = rng(5);
      for (let i = 0; i < 40; i++) {
        const b0 = rand(), b1 = rand() * (1 - b0);
        const q: SurfacePoint = { kind: 'face', face: Math.floor(rand() * t.nf), bary: [b0, b1, 1 - b0 - b1] };
        const x = at(q);
        const d = Math.hypot(x[0]! - o[0]!, x[1]! - o[1]!);
        expectRel(r.distanceAt(q), d, 3);
        const path = r.pathTo(q);
        expectRel(path.length, d, 3);
      }
    });
  }
});

describe('flat non-convex L-shaped domain: paths bend only at the reflex corner (Lee & Preparata, Networks 14, 1984)', () => {
  // [0,2]² minus (1,2]², cells of 0.25; reflex corner R = (1, 1)
  const g = flatGrid(8, 8, 2, 2);
  const keep: number[] = [];
  for (let f = 0; f < g.triangles.length; f += 3) {
    const cx = [0, 1, 2].reduce((a, k) => a + g.positions[3 * g.triangles[f + k]!]!, 0) / 3;
    const cy = [0, 1, 2].reduce((a, k) => a + g.positions[3 * g.triangles[f + k]! + 1]!, 0) / 3;
    if (!(cx > 1 && cy > 1)) keep.push(g.triangles[f]!, g.triangles[f + 1]!, g.triangles[f + 2]!);
  }
  const m = meshOf(g.positions, Uint32Array.from(keep));
  const P = g.positions;
  /** Reference: straight if the segment avoids the removed quadrant x > 1, y > 1, else via R. */
  const ref = (sx: number, sy: number, tx: number, ty: number) => {
    // parameters s ∈ [0,1] with x(s) > 1 and y(s) > 1 (each an interval)
    const iv = (a: number, b: number): [number, number] => {
      if (Math.abs(b - a) < 1e-15) return a > 1 ? [0, 1] : [1, 0];
      const s0 = (1 - a) / (b - a);
      return b > a ? [Math.max(0, s0), 1] : [0, Math.min(1, s0)];
    };
    const [x0, x1] = iv(sx, tx), [y0, y1] = iv(sy, ty);
    const blocked = Math.min(x1, y1) - Math.max(x0, y0) > 1e-12;
    return blocked ? Math.hypot(sx - 1, sy - 1) + Math.hypot(tx - 1, ty - 1) : Math.hypot(tx - sx, ty - sy);
  };

  it('vertex source at (2, 0.5): every reachable vertex', () => {
    const src = 2 * 9 + 8; // (2, 0.5)
    const r = exactDistance(m, pointSources([{ kind: 'vertex', vertex: src }]));
    let bent = 0;
    for (let v = 0; v < m.topology.nv; v++) {
      if (m.topology.vertexHalfedge[v]! < 0) continue; // vertices of the removed quadrant
      const d = ref(P[3 * src]!, P[3 * src + 1]!, P[3 * v]!, P[3 * v + 1]!);
      if (d > Math.hypot(P[3 * v]! - 2, P[3 * v + 1]! - 0.5) + 1e-9) bent++;
      expectRel(r.field.distance[v]!, d, 2);
    }
    expect(bent).toBeGreaterThan(5); // the test does exercise paths around the corner
    // the path to (0.5, 2) passes through the reflex corner R = vertex 40
    const path = r.pathTo({ kind: 'vertex', vertex: 8 * 9 + 2 });
    expect(path.points.some((p) => p.kind === 'vertex' && p.vertex === 40)).toBe(true);
    expectRel(path.length, ref(2, 0.5, 0.5, 2), 2);
  });

  it('face source in the lower arm: random points of the upper arm', () => {
    const t = m.topology;
    // a face whose corners all lie in the lower arm
    let f0 = -1;
    for (let f = 0; f < t.nf && f0 < 0; f++) {
      if ([0, 1, 2].every((k) => P[3 * t.tri[3 * f + k]!]! > 1.5 && P[3 * t.tri[3 * f + k]! + 1]! < 0.5)) f0 = f;
    }
    const src: SurfacePoint = { kind: 'face', face: f0, bary: [0.3, 0.3, 0.4] };
    const o = surfacePointPosition(src, t, P);
    const r = exactDistance(m, pointSources([src]));
    const rand = rng(9);
    for (let i = 0; i < 30; i++) {
      const f = Math.floor(rand() * t.nf);
      const b0 = rand(), b1 = rand() * (1 - b0);
      const q: SurfacePoint = { kind: 'face', face: f, bary: [b0, b1, 1 - b0 - b1] };
      const x = surfacePointPosition(q, t, P);
      expectRel(r.distanceAt(q), ref(o[0]!, o[1]!, x[0]!, x[1]!), 2);
    }
  });
});

describe('lateral surface of a prism: unrolls onto a strip (elementary)', () => {
  it('regular pentagonal prism, R = 1, H = 1.5: vertices and face points', () => {
    const n = 5, nz = 4, H = 1.5;
    const c = cylinder(n, nz, 1, H); // flat quads between straight vertical edges: a prism
    const sub = subdivide(
      Array.from({ length: c.triangles.length / 3 }, (_, f) => [0, 1, 2].map((k) => Array.from(c.positions.subarray(3 * c.triangles[3 * f + k]!, 3 * c.triangles[3 * f + k]! + 3)) as V3)),
      2,
    );
    const m = meshOf(sub.positions, sub.triangles);
    const side = 2 * Math.sin(Math.PI / n);
    const P = sub.positions;
    // unrolled coordinate of a point: arc position along the perimeter and height
    const unroll = (x: number, y: number): number => {
      let th = Math.atan2(y, x);
      if (th < -1e-12) th += 2 * Math.PI;
      const i = Math.min(n - 1, Math.floor((th + 1e-12) / ((2 * Math.PI) / n)));
      const a = [Math.cos((2 * Math.PI * i) / n), Math.sin((2 * Math.PI * i) / n)];
      return i * side + Math.hypot(x - a[0]!, y - a[1]!);
    };
    const src = 0; // (1, 0, 0)
    const r = exactDistance(m, pointSources([{ kind: 'vertex', vertex: src }]));
    const per = n * side;
    for (let v = 0; v < m.topology.nv; v++) {
      const u = unroll(P[3 * v]!, P[3 * v + 1]!), z = P[3 * v + 2]!;
      const d = Math.min(Math.hypot(u, z), Math.hypot(per - u, z));
      expectRel(r.field.distance[v]!, d, H);
    }
  });
});

describe('lateral surface of a pyramid: unrolls onto a convex fan (elementary)', () => {
  it('square pyramid with slant edge 3 and base side 1: distances from a base vertex', () => {
    const l = 3, a = 1, ns = 4;
    const h = Math.sqrt(l * l - (a * a) / 2);
    const base: V3[] = [[a / 2, -a / 2, 0], [a / 2, a / 2, 0], [-a / 2, a / 2, 0], [-a / 2, -a / 2, 0]];
    const apex: V3 = [0, 0, h];
    const theta = 2 * Math.asin(a / (2 * l)), TH = ns * theta; // total apex angle < π
    const tris: V3[][] = [], unrolled: number[][][] = [];
    for (let i = 0; i < ns; i++) {
      tris.push([apex, base[i]!, base[(i + 1) % ns]!]);
      unrolled.push([[0, 0], [l * Math.cos(i * theta), l * Math.sin(i * theta)], [l * Math.cos((i + 1) * theta), l * Math.sin((i + 1) * theta)]]);
    }
    const sub = subdivide(tris, 6, unrolled);
    const m = meshOf(sub.positions, sub.triangles);
    const src = sub.payload.findIndex((q) => Math.abs(q[0]! - l) < 1e-12 && Math.abs(q[1]!) < 1e-12); // base vertex 0 at angle 0
    const r = exactDistance(m, pointSources([{ kind: 'vertex', vertex: src }]));
    const S = sub.payload[src]!;
    const rhoS = Math.hypot(S[0]!, S[1]!), phiS = Math.atan2(S[1]!, S[0]!);
    for (let v = 0; v < m.topology.nv; v++) {
      const [x, y] = sub.payload[v]!;
      const rho = Math.hypot(x!, y!), phi = Math.atan2(y!, x!);
      // two ways round the apex, separated by δ and Θ − δ; each chord lies in the convex fan
      const dl = Math.abs(phi - phiS);
      const chord = (a: number) => Math.sqrt(Math.max(0, rho * rho + rhoS * rhoS - 2 * rho * rhoS * Math.cos(a)));
      const d = Math.min(chord(dl), chord(TH - dl));
      expectRel(r.field.distance[v]!, d, l);
    }
  });
});

describe('cube surface: distances from a corner by unfolding the faces (elementary)', () => {
  it('unit cube, 4×4 cells per face: near faces Euclidean, far faces unfolded across one edge; far corner √5', () => {
    const c = (x: number, y: number, z: number): V3 => [x, y, z];
    const quad = (p: V3, q: V3, r: V3, s: V3) => [[p, q, r], [p, r, s]];
    const tris: V3[][] = [
      ...quad(c(0, 0, 0), c(0, 1, 0), c(1, 1, 0), c(1, 0, 0)), // z = 0
      ...quad(c(0, 0, 1), c(1, 0, 1), c(1, 1, 1), c(0, 1, 1)), // z = 1
      ...quad(c(0, 0, 0), c(1, 0, 0), c(1, 0, 1), c(0, 0, 1)), // y = 0
      ...quad(c(0, 1, 0), c(0, 1, 1), c(1, 1, 1), c(1, 1, 0)), // y = 1
      ...quad(c(0, 0, 0), c(0, 0, 1), c(0, 1, 1), c(0, 1, 0)), // x = 0
      ...quad(c(1, 0, 0), c(1, 1, 0), c(1, 1, 1), c(1, 0, 1)), // x = 1
    ];
    const sub = subdivide(tris, 4);
    const m = meshOf(sub.positions, sub.triangles);
    const P = sub.positions;
    const src = [...Array(P.length / 3).keys()].find((v) => P[3 * v] === 0 && P[3 * v + 1] === 0 && P[3 * v + 2] === 0)!;
    const r = exactDistance(m, pointSources([{ kind: 'vertex', vertex: src }]));
    const far = (u: number, w: number) => Math.min(Math.hypot(1 + u, w), Math.hypot(1 + w, u));
    let farCorner = -1;
    for (let v = 0; v < m.topology.nv; v++) {
      const x = P[3 * v]!, y = P[3 * v + 1]!, z = P[3 * v + 2]!;
      let d: number;
      if (x === 0 || y === 0 || z === 0) d = Math.hypot(x, y, z); // on a face through the corner: the chord lies in it
      else {
        d = Infinity;
        if (x === 1) d = Math.min(d, far(y, z));
        if (y === 1) d = Math.min(d, far(x, z));
        if (z === 1) d = Math.min(d, far(x, y));
      }
      if (x === 1 && y === 1 && z === 1) farCorner = v;
      expectRel(r.field.distance[v]!, d, 1);
    }
    expectRel(r.field.distance[farCorner]!, Math.sqrt(5), 1); // the classic corner-to-corner answer
  });
});
