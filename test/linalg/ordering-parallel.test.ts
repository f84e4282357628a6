/**
 * Nested dissection with parts ordered on worker threads
 * (ordering-executor.ts, ordering-parallel-node.ts) against the serial
 * dissection: the parts left by a separator are independent subproblems
 * ordered into disjoint ranges of the permutation (George, SIAM J. Numer.
 * Anal. 10, 1973), and each part's order is a deterministic function of the
 * part alone (common practice), so the permutation must be the same, entry
 * for entry, whichever thread ordered which part, and also when a thread
 * fails and the caller orders what it left open. Meshes: a terrain, a sphere,
 * a plate with holes and a disconnected pair of grids.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nestedDissection } from '../../src/linalg/ordering-nd.js';
import { orderSubgraph, ndWorkspace } from '../../src/linalg/ordering-nd.js';
import { C_DONE, JOB_DONE, JOB_TAKEN, parallelNestedDissection } from '../../src/linalg/ordering-executor.js';
import type { NdBatch, OrderingExecutor } from '../../src/linalg/ordering-executor.js';
import { NodeOrderingExecutor } from '../../src/linalg/ordering-parallel-node.js';
import type { AdjacencyGraph } from '../../src/linalg/graph.js';
import { flatGrid, icosphere, terrain } from '../fixtures/shapes.js';
import { twoHolePlate } from '../fixtures/holed-plates.js';
import { isPermutation } from './helpers.js';

/** The vertex graph of a triangle list (each edge once per direction). */
function meshGraph(nv: number, tris: ArrayLike<number>): AdjacencyGraph {
  const nb: Set<number>[] = Array.from({ length: nv }, () => new Set<number>());
  for (let f = 0; f < tris.length; f += 3) {
    for (let k = 0; k < 3; k++) {
      const a = tris[f + k]!, b = tris[f + ((k + 1) % 3)]!;
      nb[a]!.add(b);
      nb[b]!.add(a);
    }
  }
  const xadj = new Int32Array(nv + 1);
  for (let v = 0; v < nv; v++) xadj[v + 1] = xadj[v]! + nb[v]!.size;
  const adj = new Int32Array(xadj[nv]!);
  for (let v = 0, q = 0; v < nv; v++) for (const w of nb[v]!) adj[q++] = w;
  return { n: nv, xadj, adj };
}

/** Two copies of a grid side by side (no edge between them), the second's vertices numbered first. */
function twoGrids(): AdjacencyGraph {
  const g = flatGrid(40, 30, 1, 1, 0.2, 5);
  const nv = g.positions.length / 3;
  const tris = new Uint32Array(2 * g.triangles.length);
  for (let i = 0; i < g.triangles.length; i++) {
    tris[i] = g.triangles[i]! + nv;
    tris[i + g.triangles.length] = g.triangles[i]!;
  }
  return meshGraph(2 * nv, tris);
}

const MESHES: Record<string, () => AdjacencyGraph> = {
  'terrain 120×120': () => {
    const s = terrain(119, 119, 1, 1, (x, y) => 0.1 * Math.sin(9 * x) * Math.cos(7 * y));
    return meshGraph(s.positions.length / 3, s.triangles);
  },
  'icosphere level 5': () => {
    const s = icosphere(5);
    return meshGraph(s.positions.length / 3, s.triangles);
  },
  'plate with two holes': () => {
    const s = twoHolePlate(1, 0.02);
    return meshGraph(s.positions.length / 3, s.triangles);
  },
  'two grids, disconnected': twoGrids,
};

const same = (a: Int32Array, b: Int32Array) => a.length === b.length && a.every((v, i) => v === b[i]);

// every part on the worker (the caller orders none), and the worker loaded before the first batch
const remoteOnly = new NodeOrderingExecutor({ minSize: 0, threads: 1, depth: 2, callerOrders: false });
beforeAll(async () => {
  remoteOnly.warm();
  await remoteOnly.ready();
});
afterAll(() => remoteOnly.close());

describe('nested dissection with parts on worker threads', () => {
  for (const [name, make] of Object.entries(MESHES)) {
    it(`gives the serial permutation on the ${name}`, () => {
      const g = make();
      expect(g.n).toBeGreaterThan(2000);
      for (const leafSize of [64, 512]) {
        const serial = nestedDissection(g, { leafSize });
        expect(isPermutation(serial, g.n)).toBe(true);
        const before = remoteOnly.counts.remoteJobs;
        const par = parallelNestedDissection(g, { leafSize }, remoteOnly);
        expect(same(par, serial)).toBe(true);
        expect(remoteOnly.counts.remoteJobs).toBeGreaterThan(before); // the worker did order parts
      }
    });
  }

  it('gives the serial permutation when the caller and a worker share the parts (depths 1 to 3)', async () => {
    const g = MESHES['terrain 120×120']!();
    const serial = nestedDissection(g, { leafSize: 64 });
    for (const depth of [1, 2, 3]) {
      const ex = new NodeOrderingExecutor({ minSize: 0, threads: 1, depth });
      try {
        ex.warm();
        await ex.ready();
        // who orders which part depends on timing; the permutation must not
        expect(same(parallelNestedDissection(g, { leafSize: 64 }, ex), serial)).toBe(true);
        expect(ex.counts.failed).toBe(0);
      } finally {
        await ex.close();
      }
    }
  });

  it('orders the parts a failed thread left open, with the same result', () => {
    const g = MESHES['plate with two holes']!();
    const serial = nestedDissection(g, { leafSize: 64 });
    // a thread that orders the first part, claims the second and dies without finishing it
    const dying: OrderingExecutor = {
      minSize: 0, depth: 2, callerOrders: true,
      shared: (len) => new Int32Array(new SharedArrayBuffer(4 * Math.max(1, len)), 0, len),
      start(b: NdBatch) {
        const ws = ndWorkspace(b.jobs[0]!.sub.n, b.jobs[0]!.sub.adj.length);
        const j0 = 0;
        Atomics.store(b.state, j0, JOB_TAKEN);
        orderSubgraph(ws, b.settings, b.jobs[j0]!.sub, b.out, b.jobs[j0]!.at, (len) => new Int32Array(len));
        Atomics.store(b.state, j0, JOB_DONE);
        Atomics.add(b.control, C_DONE, 1);
        const j1 = 1;
        Atomics.store(b.state, j1, JOB_TAKEN);
        b.out.fill(-7, b.jobs[j1]!.at, b.jobs[j1]!.at + 3); // half-written garbage
        return () => false;
      },
    };
    expect(same(parallelNestedDissection(g, { leafSize: 64 }, dying), serial)).toBe(true);
    // a thread that never takes anything, with the caller leaving every part to it
    const dead: OrderingExecutor = { ...dying, callerOrders: false, start: () => () => false };
    expect(same(parallelNestedDissection(g, { leafSize: 64 }, dead), serial)).toBe(true);
  });
});
