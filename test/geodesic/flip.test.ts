/**
 * The pieces of the flip method (src/geodesic/flip): the flippable
 * triangulation with its directions, the start path, and the `path` entry
 * and command with waypoints and closed loops.
 */
import { beforeAll, describe, it, expect } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildTopology } from '../../src/mesh/build.js';
import { next } from '../../src/mesh/topology.js';
import { intrinsicFromPositions, type IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { FlipTriangulation } from '../../src/geodesic/flip/triangulation.js';
import { shortestEdgePath } from '../../src/geodesic/flip/start-path.js';
import { tracePath } from '../../src/geodesic/flip/trace.js';
import { shortenPath, BEND_TOLERANCE } from '../../src/geodesic/flip/flipout.js';
import { graphDistance } from '../../src/geodesic/graph.js';
import { pointSources } from '../../src/geodesic/shared/sources.js';
import { shortestPathThrough, AUTO_FLIP_FACES } from '../../src/geodesic/waypoints.js';
import { pathLength, isSurfacePath, pathPolyline } from '../../src/geodesic/path.js';
import type { SurfacePoint } from '../../src/mesh/surface-point.js';
import { flatGrid, icosphere, rng, type Shape } from '../fixtures/shapes.js';
import { runCli } from '../cli/run-cli.js';

const meshOf = (s: Shape): IntrinsicMesh => intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);
const V = (vertex: number): SurfacePoint => ({ kind: 'vertex', vertex });

/**
 * Flips `count` random flippable edges, undoing a flip that makes a corner below 0.1 rad
 * (needles would make the test measure rounding, not the method); returns how many stayed.
 */
function randomFlips(tri: FlipTriangulation, count: number, seed: number): number {
  const r = rng(seed);
  let n = 0;
  for (let i = 0; i < count; i++) {
    const h = tri.edgeHalfedge[Math.floor(r() * tri.edgeHalfedge.length)]!;
    if (!tri.flip(h)) continue;
    const o = tri.twin[h]!, f = [h - (h % 3), o - (o % 3)];
    if (f.some((b) => [0, 1, 2].some((k) => tri.corner(b + k) < 0.1))) tri.flip(h);
    else n++;
  }
  return n;
}

/**
 * Every intrinsic edge traced on the input; each must end at its far vertex (a trace that
 * does not, within 1e-9 of its length, reports failure). Returns the traces.
 */
function traceAll(tri: FlipTriangulation): { e: number; u: number; w: number; points: SurfacePoint[] }[] {
  const out = [];
  let failed = 0;
  for (let e = 0; e < tri.edgeHalfedge.length; e++) {
    const h = tri.edgeHalfedge[e]!, u = tri.tri[h]!, w = tri.tri[next(h)]!;
    const points: SurfacePoint[] = [];
    if (tracePath(tri, [u, w], [e], points)) out.push({ e, u, w, points });
    else failed++;
  }
  expect(failed).toBe(0);
  return out;
}

describe('flippable triangulation with directions (Sharp, Soliman & Crane 2019)', () => {
  it('flat jittered grid: after random flips every edge is the straight segment between its ends, and traces along it', () => {
    const s = flatGrid(12, 10, 1.2, 1, 0.3, 5);
    const m = meshOf(s), P = s.positions;
    const tri = new FlipTriangulation(m);
    expect(randomFlips(tri, 3000, 1)).toBeGreaterThan(500);
    const xyz = new Float64Array(3);
    for (const { e, u, w, points } of traceAll(tri)) {
      // flat metric: the intrinsic length is the Euclidean distance (elementary)
      const d = Math.hypot(P[3 * u]! - P[3 * w]!, P[3 * u + 1]! - P[3 * w + 1]!);
      expect(Math.abs(tri.length[e]! - d)).toBeLessThanOrEqual(1e-12 * d);
      expect(Math.abs(pathLength(m, points) - d)).toBeLessThanOrEqual(1e-12 * d);
      // every crossing lies on the segment u–w (distance from the line, elementary)
      const line = pathPolyline({ points, length: d }, m.topology, P);
      for (let i = 0; i < line.length; i += 3) {
        xyz.set(line.subarray(i, i + 3));
        const cross = (P[3 * w]! - P[3 * u]!) * (xyz[1]! - P[3 * u + 1]!) - (P[3 * w + 1]! - P[3 * u + 1]!) * (xyz[0]! - P[3 * u]!);
        expect(Math.abs(cross / d)).toBeLessThanOrEqual(1e-12 * d);
      }
    }
  });

  it('icosphere: after random flips each traced edge is a surface path as long as the intrinsic edge', () => {
    // an intrinsic edge is a straight segment of the polyhedral metric (Sharp, Soliman & Crane 2019, §2)
    const m = meshOf(icosphere(2, 1));
    const tri = new FlipTriangulation(m);
    expect(randomFlips(tri, 2000, 2)).toBeGreaterThan(200);
    for (const { e, points } of traceAll(tri)) {
      expect(isSurfacePath(m.topology, points)).toBe(true);
      expect(Math.abs(pathLength(m, points) - tri.length[e]!)).toBeLessThanOrEqual(1e-12 * tri.length[e]!);
    }
  });

  it('refuses the flip of a boundary edge and of a non-convex quad, changing nothing', () => {
    const m = meshOf({ positions: Float64Array.of(0, 0, 0, 2, 0, 0, 3, 1, 0, 3, -1, 0), triangles: Uint32Array.of(0, 1, 2, 1, 0, 3) });
    const tri = new FlipTriangulation(m);
    const before = tri.tri.slice();
    const inner = [0, 1, 2].find((k) => tri.twin[k]! >= 0)!;
    // the quad 0-3-1-2 has a reflex corner at 1 (270°): the diagonal 2–3 would run outside it
    expect(tri.flip(inner)).toBe(false);
    expect(tri.flip([0, 1, 2].find((k) => tri.twin[k]! < 0)!)).toBe(false);
    expect(Array.from(tri.tri)).toEqual(Array.from(before));
    expect(tri.flips).toBe(0);
  });
});

describe('start path', () => {
  it('the edge path has the edge-graph distance of graph.ts and joins its ends edge by edge (common practice)', () => {
    const m = meshOf(icosphere(3, 1));
    const t = m.topology;
    const g = graphDistance(m, pointSources([V(0)]));
    const rand = rng(6);
    for (let i = 0; i < 10; i++) {
      const b = Math.floor(rand() * t.nv);
      const p = shortestEdgePath(m, 0, b)!;
      expect(Math.abs(p.length - g.distance[b]!)).toBeLessThanOrEqual(1e-12 * Math.max(1, p.length));
      expect(p.vertices[0]).toBe(0);
      expect(p.vertices[p.vertices.length - 1]).toBe(b);
      let sum = 0;
      p.edges.forEach((e, k) => {
        const h = t.edgeHalfedge[e]!, ends = [t.tri[h]!, t.tri[next(h)]!].sort();
        expect(ends).toEqual([p.vertices[k]!, p.vertices[k + 1]!].sort());
        sum += m.edgeLength[e]!;
      });
      expect(Math.abs(sum - p.length)).toBeLessThanOrEqual(1e-12 * Math.max(1, sum));
    }
  });
  it('FlipOut stops unconverged at its flip or sweep cap, and converged paths bend by at least π − tolerance', () => {
    const m = meshOf(flatGrid(20, 20, 1, 1, 0.2, 4));
    const start = shortestEdgePath(m, 0, 440)!;
    expect(shortenPath(new FlipTriangulation(m), start, 1_000_000, 0).converged).toBe(false);
    expect(shortenPath(new FlipTriangulation(m), start, 1).converged).toBe(false);
    const tri = new FlipTriangulation(m);
    const r = shortenPath(tri, start);
    expect(r.converged).toBe(true);
    for (let i = 1; i + 1 < r.vertices.length; i++) {
      const b = r.vertices[i]!, da = tri.direction(r.edges[i - 1]!, b), dc = tri.direction(r.edges[i]!, b);
      expect(Math.min(tri.sweep(b, da, dc), tri.sweep(b, dc, da))).toBeGreaterThanOrEqual(Math.PI - BEND_TOLERANCE);
    }
    expect(Math.abs(r.length - Math.SQRT2)).toBeLessThanOrEqual(1e-9); // the unit square's diagonal (elementary)
  });

  it('two components: no path', () => {
    const m = meshOf({ positions: Float64Array.of(0, 0, 0, 1, 0, 0, 0, 1, 0, 5, 0, 0, 6, 0, 0, 5, 1, 0), triangles: Uint32Array.of(0, 1, 2, 3, 4, 5) });
    expect(shortestEdgePath(m, 0, 4)).toBeNull();
    expect(shortestPathThrough(m, [V(0), V(4)], { method: 'flip' }).length).toBe(Infinity);
  });
});

describe('path entry with edge flips', () => {
  const s = flatGrid(20, 20, 2, 2, 0.3, 9);
  const m = meshOf(s), P = s.positions;
  const dist = (a: number, b: number) => Math.hypot(P[3 * a]! - P[3 * b]!, P[3 * a + 1]! - P[3 * b + 1]!);

  it('waypoints and a closed loop on a flat square: each leg straight, the loop the triangle perimeter (elementary)', () => {
    const [a, b, c] = [22, 200, 378];
    const r = shortestPathThrough(m, [V(a), V(b), V(c), V(a)], { method: 'flip', positions: P });
    expect(r.legs.map((l) => l.method)).toEqual(['flip', 'flip', 'flip']);
    expect(r.legs.every((l) => l.proven)).toBe(true);
    const want = dist(a, b) + dist(b, c) + dist(c, a);
    expect(Math.abs(r.length - want)).toBeLessThanOrEqual(1e-9 * want);
    expect(isSurfacePath(m.topology, r.path.points)).toBe(true);
    expect(Math.abs(r.cumulative[r.cumulative.length - 1]! - want)).toBeLessThanOrEqual(1e-9 * want);
    expect(r.path.points.filter((p) => p.kind === 'vertex' && p.vertex === b)).toHaveLength(1); // the shared stop once
  });

  it('edge and face points are inserted; two on one face use windows; without positions not proven; same point: length 0', () => {
    const t = m.topology;
    const f: SurfacePoint = { kind: 'face', face: 100, bary: [0.2, 0.3, 0.5] }, e: SurfacePoint = { kind: 'edge', edge: 500, t: 0.25 };
    const at = (p: SurfacePoint) => pathPolyline({ points: [p], length: 0 }, t, P);
    const r = shortestPathThrough(m, [f, V(5), e], { method: 'flip', positions: P });
    expect(r.legs.map((l) => l.method)).toEqual(['flip', 'flip']);
    const [x, y, z] = [at(f), at(V(5)), at(e)];
    const want = Math.hypot(x[0]! - y[0]!, x[1]! - y[1]!) + Math.hypot(z[0]! - y[0]!, z[1]! - y[1]!); // flat: straight legs
    expect(Math.abs(r.length - want)).toBeLessThanOrEqual(1e-9 * want);
    expect(r.path.points[0]).toEqual(f);
    expect(r.path.points[r.path.points.length - 1]).toEqual(e);
    expect(isSurfacePath(t, r.path.points)).toBe(true);
    const same = shortestPathThrough(m, [f, { kind: 'face', face: 100, bary: [0.5, 0.3, 0.2] }], { method: 'flip' });
    expect(same.legs[0]!.method).toBe('windows');
    expect(same.legs[0]!.proven).toBe(true);
    const q = shortestPathThrough(m, [V(5), V(300)], { method: 'flip' });
    expect(q.legs[0]!.method).toBe('flip');
    expect(q.legs[0]!.proven).toBe(false);
    const zero = shortestPathThrough(m, [V(7), V(7)], { method: 'flip' });
    expect(zero.length).toBe(0);
    expect(zero.legs[0]!.proven).toBe(true);
    expect(() => shortestPathThrough(m, [V(7), V(8)], { method: 'fast' as never })).toThrow(/unknown path method/);
  });
});

describe('auto method', () => {
  it(`from ${AUTO_FLIP_FACES} faces: flips, each leg proven (here by the chord: a flat plate); below: windows`, () => {
    const big = flatGrid(160, 160, 16, 16, 0.2, 2); // 51,200 faces
    const m = meshOf(big), P = big.positions;
    expect(m.topology.nf).toBeGreaterThanOrEqual(AUTO_FLIP_FACES);
    const a = 0, b = m.topology.nv - 1;
    const r = shortestPathThrough(m, [V(a), V(b)], { positions: P, verifyFaces: undefined });
    expect(r.legs[0]!.method).toBe('flip');
    expect(r.legs[0]!.proven).toBe(true);
    expect(Math.abs(r.length - Math.hypot(16, 16))).toBeLessThanOrEqual(1e-9 * 16); // flat: the diagonal (elementary)
    expect(shortestPathThrough(m, [V(a), V(b)], {}).legs[0]!.method).toBe('windows'); // no positions: no proof, so no flips
    const small = meshOf(flatGrid(10, 10, 1, 1, 0.2, 2));
    expect(shortestPathThrough(small, [V(0), V(120)], {}).legs[0]!.method).toBe('windows');
  });
});

describe('orthodrome path --path-method', () => {
  let file = '';
  beforeAll(() => {
    const dir = mkdtempSync(join(tmpdir(), 'orthodrome-flip-'));
    const s = icosphere(2, 3);
    const L: string[] = [];
    for (let i = 0; i < s.positions.length; i += 3) L.push(`v ${s.positions[i]} ${s.positions[i + 1]} ${s.positions[i + 2]}`);
    for (let f = 0; f < s.triangles.length; f += 3) L.push(`f ${s.triangles[f]! + 1} ${s.triangles[f + 1]! + 1} ${s.triangles[f + 2]! + 1}`);
    file = join(dir, 'ball.obj');
    writeFileSync(file, L.join('\n') + '\n');
  });

  it('flip and windows agree to 1e-9 and say which method produced the path', () => {
    const args = ['path', file, '--from', 'v:0', '--via', 'v:70', '--to', 'v:150', '--json'];
    const f = runCli([...args, '--path-method', 'flip']), w = runCli([...args, '--path-method', 'windows']);
    expect(f.code).toBe(0);
    expect(w.code).toBe(0);
    const jf = JSON.parse(f.stdout), jw = JSON.parse(w.stdout);
    expect(jw.method).toBe('windows');
    expect(jf.proven).toBe(true);
    expect(jf.legs.map((l: { method: string }) => l.method).every((x: string) => x === 'flip' || x === 'windows')).toBe(true);
    expect(Math.abs(jf.length - jw.length)).toBeLessThanOrEqual(1e-9 * jw.length);
    const text = runCli(['path', file, '--from', 'v:0', '--to', 'v:150', '--path-method', 'flip', '--prove-limit', '0']);
    expect(text.code).toBe(0);
    expect(text.stdout).toMatch(/geodesic path \(locally shortest, not proven shortest; at most [\d.e+-]+% longer than the shortest \(certified/);
    const tj = JSON.parse(runCli(['path', file, '--from', 'v:0', '--to', 'v:150', '--path-method', 'flip', '--prove-limit', '0', '--json']).stdout);
    expect(tj.proven).toBe(false);
    expect(tj.excessBound).toBeGreaterThan(0); // sphere: the chord is shorter than the arc
    expect(tj.legs[0].excessBound).toBe(tj.excessBound);
    expect(jf.excessBound).toBe(0);
    expect(text.stdout).toMatch(/method flip/);
    const bad = runCli(['path', file, '--from', 'v:0', '--to', 'v:150', '--prove-limit', '-3']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/--prove-limit/);
  });
});
