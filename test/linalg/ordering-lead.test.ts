/**
 * The lead split of the threaded nested dissection (ordering-executor.ts):
 * when the caller has other work (`AnalyzeOptions.meanwhile`, the heat
 * method's matrix assembly), the top levels are split by whichever thread
 * claims them first and the parts are read back from a shared table. The
 * parts left by a separator are independent subproblems ordered into
 * disjoint ranges (George, SIAM J. Numer. Anal. 10, 1973) and each part's
 * order depends on the part alone (common practice), so the permutation must
 * equal the serial one entry for entry whoever split and ordered what, also
 * when the splitting thread fails. `meanwhile` is called exactly once on
 * every path (its documented contract), and the heat method's distances are
 * the same bits with and without the thread.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nestedDissection, ndWorkspace, orderSubgraph } from '../../src/linalg/ordering-nd.js';
import {
  C_DONE, C_SPLIT, JOB_DONE, JOB_TAKEN, SPLIT_OPEN, SPLIT_TAKEN, leadSplit, parallelNestedDissection,
} from '../../src/linalg/ordering-executor.js';
import type { NdBatch, OrderingExecutor } from '../../src/linalg/ordering-executor.js';
import { NodeOrderingExecutor } from '../../src/linalg/ordering-parallel-node.js';
import { analyzeCholesky } from '../../src/linalg/index.js';
import { adjacencyFromLower } from '../../src/linalg/graph.js';
import { edgePattern, patternMatrix } from '../../src/metric/laplacian.js';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { HeatSolver } from '../../src/geodesic/heat.js';
import { terrain as terrainShape } from '../fixtures/shapes.js';
import { twoHolePlate } from '../fixtures/holed-plates.js';

/** A wavy terrain grid of (n + 1)² vertices. */
const terrain = (n: number) => terrainShape(n, n, 1, 1, (x, y) => 0.1 * Math.sin(9 * x) * Math.cos(7 * y));
const twoHolePlateShape = () => twoHolePlate(1, 0.02);

const same = (a: ArrayLike<number>, b: ArrayLike<number>) => a.length === b.length && Array.prototype.every.call(a, (v: number, i: number) => Object.is(v, b[i]));

/** Lower-triangle pattern of a mesh's vertex graph (the heat method's). */
function meshPattern(s: { positions: ArrayLike<number>; triangles: ArrayLike<number> }) {
  const { topology } = buildTopology(s.triangles as Uint32Array, s.positions.length / 3);
  const p = edgePattern(topology);
  return patternMatrix(p, new Float64Array(p.colPtr[p.n]!));
}

const shared = (len: number) => new Int32Array(new SharedArrayBuffer(4 * Math.max(1, len)), 0, len);

const worker = new NodeOrderingExecutor({ minSize: 0, threads: 1, depth: 2 });
beforeAll(async () => {
  worker.warm();
  await worker.ready();
});
afterAll(() => worker.close());

describe('analyzeCholesky meanwhile', () => {
  const A = meshPattern(terrain(90));
  const serial = analyzeCholesky(A).perm;

  it('is called exactly once on every path, and the permutation is unchanged', () => {
    const paths: [string, Parameters<typeof analyzeCholesky>[1]][] = [
      ['nd, no executor', {}],
      ['amd', { ordering: 'amd' }],
      ['natural', { ordering: 'natural' }],
      ['nd, graph below the executor threshold', { orderingExecutor: new NodeOrderingExecutor({ minSize: 1e9, threads: 1 }) }],
      ['nd, a worker thread', { orderingExecutor: worker }],
    ];
    for (const [name, opts] of paths) {
      let calls = 0;
      const sym = analyzeCholesky(A, { ...opts, meanwhile: () => { calls++; } });
      expect(calls, name).toBe(1);
      if (opts?.ordering === undefined) expect(same(sym.perm, serial), name).toBe(true);
      else expect(same(sym.perm, analyzeCholesky(A, opts).perm), name).toBe(true);
    }
  });

  it('lets the worker split while the caller is busy, with the serial permutation', () => {
    const before = worker.counts.remoteJobs;
    let calls = 0;
    // busy for a while, so the worker (loaded) claims the split and parts (no timing is asserted)
    const sym = analyzeCholesky(A, { orderingExecutor: worker, meanwhile: () => { calls++; const t = performance.now(); while (performance.now() - t < 150); } });
    expect(calls).toBe(1);
    expect(same(sym.perm, serial)).toBe(true);
    expect(worker.counts.remoteJobs).toBeGreaterThan(before);
    expect(worker.counts.failed).toBe(0);
  });

  it('passes an error of meanwhile on, and the executor still orders the next graph', () => {
    expect(() => analyzeCholesky(A, { orderingExecutor: worker, meanwhile: () => { throw new Error('assembly failed'); } })).toThrow('assembly failed');
    expect(same(analyzeCholesky(A, { orderingExecutor: worker, meanwhile: () => {} }).perm, serial)).toBe(true);
  });
});

describe('lead split', () => {
  const g = adjacencyFromLower(meshPattern(twoHolePlateShape()));
  const serial = nestedDissection(g);

  /** An in-thread executor whose "thread" acts inside start(): `act` runs on the batch. */
  const fake = (act: (b: NdBatch) => boolean, depth = 2): OrderingExecutor => ({
    minSize: 0, depth, shared, start: (b) => { const ok = act(b); return () => ok; },
  });

  it('reads the parts another thread split from the shared table (depths 1 to 3)', () => {
    for (const depth of [1, 2, 3]) {
      // the other thread splits and orders the smallest part before the caller comes back
      const ex = fake((b) => {
        Atomics.store(b.control, C_SPLIT, SPLIT_TAKEN);
        const ws = ndWorkspace(g.n, g.adj.length);
        const jobs = leadSplit(b, ws);
        const last = jobs.length - 1;
        Atomics.store(b.state, last, JOB_TAKEN);
        orderSubgraph(ws, b.settings, jobs[last]!.sub, b.out, jobs[last]!.at, (len) => new Int32Array(len));
        Atomics.store(b.state, last, JOB_DONE);
        Atomics.add(b.control, C_DONE, 1);
        return true;
      }, depth);
      let calls = 0;
      expect(same(parallelNestedDissection(g, {}, ex, () => { calls++; }), serial), `depth ${depth}`).toBe(true);
      expect(calls).toBe(1);
    }
  });

  it('splits on the caller when no thread took the split', () => {
    const ex = fake((b) => Atomics.load(b.control, C_SPLIT) === SPLIT_OPEN);
    expect(same(parallelNestedDissection(g, {}, ex, () => {}), serial)).toBe(true);
  });

  it('orders the whole graph itself when the splitting thread fails', () => {
    const ex = fake((b) => {
      Atomics.store(b.control, C_SPLIT, SPLIT_TAKEN); // claimed, then dies mid-split
      b.out.fill(-7, 0, 10);
      return false;
    });
    expect(same(parallelNestedDissection(g, {}, ex, () => {}), serial)).toBe(true);
  });
});

describe('heat method with the assembly during the ordering', () => {
  it('gives the same distances to the bit with and without the worker', () => {
    const s = terrain(80);
    const { topology } = buildTopology(s.triangles, s.positions.length / 3);
    const mesh = intrinsicFromPositions(topology, s.positions);
    const src = { points: [{ kind: 'vertex' as const, vertex: 17 }], curves: [] };
    const plain = HeatSolver.prepare(mesh).distance(src).distance;
    const before = worker.counts.batches;
    const threaded = HeatSolver.prepare(mesh, { orderingExecutor: worker }).distance(src).distance;
    expect(worker.counts.batches).toBeGreaterThan(before);
    expect(same(threaded, plain)).toBe(true);
  });
});
