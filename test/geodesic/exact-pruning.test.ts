/**
 * Pruning never changes the answer: the default solver (vertex filter,
 * trimming, merging, saddle shadow wedges) against plain window propagation with all pruning off
 * on small curved meshes (common practice: an unoptimised run of the same
 * method as the oracle), at every vertex and at random face points.
 */
import { describe, it, expect } from 'vitest';
import { test, fc } from '@fast-check/vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import type { IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { exactDistance } from '../../src/geodesic/exact/index.js';
import { createState } from '../../src/geodesic/exact/state.js';
import { markPseudoSources } from '../../src/geodesic/exact/pseudo-sources.js';
import { seedSources } from '../../src/geodesic/exact/seed.js';
import { runEvents } from '../../src/geodesic/exact/propagate.js';
import type { ExactState } from '../../src/geodesic/exact/state.js';
import { evaluateInFace, type Evaluation } from '../../src/geodesic/exact/evaluate.js';
import { EVAL_NONE } from '../../src/geodesic/exact/codes.js';
import type { SourceSet } from '../../src/geodesic/shared/sources.js';
import { icosphere, terrain, rng } from '../fixtures/shapes.js';
import type { Shape } from '../fixtures/shapes.js';

const meshOf = (s: Shape): IntrinsicMesh => intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);

function compare(m: IntrinsicMesh, sources: SourceSet, seed: number): number {
  const r = exactDistance(m, sources);
  // unpruned windows would circle a closed surface for ever: stop them a little past the farthest point
  const far = Math.max(...r.field.distance.filter(Number.isFinite));
  const ref = createState(m, 1.2 * far, 5_000_000, 1024);
  ref.prune = false;
  markPseudoSources(ref);
  seedSources(ref, sources);
  runEvents(ref);
  expect(ref.overflow).toBe(false);
  const scale = Math.max(...ref.dist.filter(Number.isFinite));
  for (let v = 0; v < m.topology.nv; v++) expect(Math.abs(r.field.distance[v]! - ref.dist[v]!)).toBeLessThanOrEqual(1e-9 * scale);
  const rand = rng(seed);
  const ev: Evaluation = { value: 0, kind: EVAL_NONE, id: 0, x: 0 };
  for (let i = 0; i < 30; i++) {
    const f = Math.floor(rand() * m.topology.nf);
    const b0 = rand(), b1 = rand() * (1 - b0);
    const bary: [number, number, number] = [b0, b1, 1 - b0 - b1];
    const want = evaluateInFace(ref, f, bary, ev).value;
    expect(Math.abs(r.distanceAt({ kind: 'face', face: f, bary }) - want)).toBeLessThanOrEqual(1e-9 * scale);
  }
  return ref.win.count / Math.max(1, r.windows);
}

describe('exact distance: pruning keeps the answer of unpruned window propagation', () => {
  it('bumpy terrain (saddles and cones), vertex and face sources', () => {
    const m = meshOf(terrain(6, 6, 1, 1, (x, y) => 0.25 * Math.sin(5 * x + 1) * Math.cos(4 * y)));
    const ratio = compare(m, { points: [{ kind: 'vertex', vertex: 8 }], curves: [] }, 1);
    expect(ratio).toBeGreaterThan(1); // pruning did remove windows
    compare(m, { points: [{ kind: 'face', face: 40, bary: [0.2, 0.5, 0.3] }, { kind: 'vertex', vertex: 30 }], curves: [] }, 2);
  });

  it('perturbed icosphere and a boundary-loop curve source on terrain', () => {
    const s = icosphere(1);
    const r = rng(5);
    for (let i = 0; i < s.positions.length; i++) s.positions[i]! *= 1 + 0.15 * (r() - 0.5);
    compare(meshOf(s), { points: [{ kind: 'edge', edge: 11, t: 0.35 }], curves: [] }, 3);
    const t = meshOf(terrain(5, 5, 1, 1, (x, y) => 0.2 * Math.sin(6 * x) * Math.sin(5 * y)));
    compare(t, { points: [], curves: [[{ kind: 'vertex', vertex: 0 }, { kind: 'vertex', vertex: 1 }, { kind: 'face', face: 2, bary: [0.3, 0.3, 0.4] }]] }, 4);
  });

  test.prop([fc.integer({ min: 3, max: 6 }), fc.double({ min: 0.01, max: 0.4, noNaN: true }), fc.integer({ min: 1, max: 1e6 })], { numRuns: 15 })(
    'random bumpy terrains and perturbed icospheres (fast-check)',
    (n, amp, seed) => {
      const r = rng(seed);
      const ph = [r() * 6, r() * 6, 3 + r() * 4, 3 + r() * 4];
      const m = meshOf(terrain(n, n, 1, 1, (x, y) => amp * Math.sin(ph[2]! * x + ph[0]!) * Math.cos(ph[3]! * y + ph[1]!)));
      compare(m, { points: [{ kind: 'vertex', vertex: Math.floor(r() * m.topology.nv) }], curves: [] }, seed);
      const s = icosphere(1);
      for (let i = 0; i < s.positions.length; i++) s.positions[i]! *= 1 + amp * (r() - 0.5);
      const sm = meshOf(s);
      compare(sm, { points: [{ kind: 'face', face: Math.floor(r() * sm.topology.nf), bary: [0.2, 0.3, 0.5] }], curves: [] }, seed + 1);
    },
  );
});

/** A pruned run from a vertex source with the saddle wedges on or off. */
function runPruned(m: IntrinsicMesh, src: number, wedge: boolean): ExactState {
  const s = createState(m, Infinity, 5_000_000, 1024);
  s.wedge = wedge;
  markPseudoSources(s);
  seedSources(s, { points: [{ kind: 'vertex', vertex: src }], curves: [] });
  runEvents(s);
  return s;
}

/** Windows emitted straight from roots (sources and pseudo-sources). */
const rootWindows = (s: ExactState): number => {
  let n = 0;
  for (let w = 0; w < s.win.count; w++) if (s.win.parent[w]! < 0) n++;
  return n;
};

describe('exact distance: saddles emit only into their shadow wedge', () => {
  // A geodesic bends at a vertex only with an angle >= pi on both sides (Mitchell, Mount,
  // Papadimitriou, SIAM J. Comput. 16(4), 1987), so a saddle's windows outside the wedge
  // [arrival + pi, arrival + total angle - pi] are never needed: with the wedge the root windows
  // drop and every distance stays that of the full-fan run and of the unpruned run.
  const check = (m: IntrinsicMesh, src: number, seed: number) => {
    const on = runPruned(m, src, true), off = runPruned(m, src, false);
    const scale = Math.max(...off.dist.filter(Number.isFinite));
    for (let v = 0; v < m.topology.nv; v++) expect(Math.abs(on.dist[v]! - off.dist[v]!)).toBeLessThanOrEqual(1e-12 * scale);
    const rand = rng(seed), a: Evaluation = { value: 0, kind: EVAL_NONE, id: 0, x: 0 }, b: Evaluation = { value: 0, kind: EVAL_NONE, id: 0, x: 0 };
    for (let i = 0; i < 30; i++) {
      const f = Math.floor(rand() * m.topology.nf);
      const b0 = rand(), b1 = rand() * (1 - b0);
      const bary: [number, number, number] = [b0, b1, 1 - b0 - b1];
      expect(Math.abs(evaluateInFace(on, f, bary, a).value - evaluateInFace(off, f, bary, b).value)).toBeLessThanOrEqual(1e-12 * scale);
    }
    compare(m, { points: [{ kind: 'vertex', vertex: src }], curves: [] }, seed);
    return { on: rootWindows(on), off: rootWindows(off) };
  };

  it('egg-crate terrain (many saddles): fewer root windows, same distances', () => {
    const m = meshOf(terrain(8, 8, 1, 1, (x, y) => 0.15 * Math.sin(9 * x) * Math.sin(8 * y)));
    const n = check(m, 40, 7);
    expect(n.on).toBeLessThan(n.off);
  });

  test.prop([fc.integer({ min: 4, max: 7 }), fc.double({ min: 0.02, max: 0.3, noNaN: true }), fc.integer({ min: 1, max: 1e6 })], { numRuns: 10 })(
    'random bumpy terrains, including sources on the boundary (fast-check)',
    (n, amp, seed) => {
      const r = rng(seed);
      const ph = [r() * 6, r() * 6, 4 + r() * 6, 4 + r() * 6];
      const m = meshOf(terrain(n, n, 1, 1, (x, y) => amp * Math.sin(ph[2]! * x + ph[0]!) * Math.cos(ph[3]! * y + ph[1]!)));
      check(m, Math.floor(r() * m.topology.nv), seed);
    },
  );
});
