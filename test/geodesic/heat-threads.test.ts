/**
 * The heat method with its factorizations on worker threads
 * (HeatOptions.factorExecutor, linalg/parallel-node.ts) against the same
 * solver on one thread: the factors are bit-identical, so every distance
 * must be too (same operations in the same order give the same IEEE 754
 * results: common practice). Covers both boundary paths: a terrain patch
 * with boundary ('average': the natural and Dirichlet factors as a pair on
 * this thread, the Poisson factor on a worker) and a closed sphere (two
 * factors, one on a worker).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions, type IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { HeatSolver } from '../../src/geodesic/heat.js';
import { NodeFactorExecutor } from '../../src/linalg/parallel-node.js';
import { icosphere, terrain, type Shape } from '../fixtures/shapes.js';

// no taking back (steal: false): the worker factors its job whatever the machine's load
const executor = new NodeFactorExecutor({ minSize: 0, threads: 1, steal: false });
beforeAll(async () => {
  executor.warm();
  await executor.ready();
});
afterAll(() => executor.close());

function meshOf(s: Shape): IntrinsicMesh {
  const { topology } = buildTopology(s.triangles, s.positions.length / 3);
  return intrinsicFromPositions(topology, s.positions);
}

describe('heat method with factorizations on a worker thread', () => {
  const cases: [string, IntrinsicMesh][] = [
    ['terrain patch with boundary', meshOf(terrain(40, 30, 4, 3, (x, y) => 0.3 * Math.sin(2 * x) * Math.cos(3 * y)))],
    ['closed sphere', meshOf(icosphere(3))],
  ];
  for (const [name, mesh] of cases) {
    it(`gives the same distances to the bit: ${name}`, () => {
      const before = executor.counts.remote;
      const threaded = HeatSolver.prepare(mesh, { factorExecutor: executor });
      expect(executor.counts.remote - before).toBe(1); // the Poisson factor ran on the worker
      const serial = HeatSolver.prepare(mesh);
      expect(threaded.stats.factorizations).toBe(serial.stats.factorizations);
      expect(threaded.stats.factorValues).toBe(serial.stats.factorValues);
      const nv = mesh.topology.nv;
      for (const v of [0, nv >> 1, nv - 1]) {
        const a = threaded.distance({ points: [{ kind: 'vertex', vertex: v }], curves: [] }).distance;
        const b = serial.distance({ points: [{ kind: 'vertex', vertex: v }], curves: [] }).distance;
        let same = a.length === b.length;
        for (let i = 0; i < a.length && same; i++) same = Object.is(a[i], b[i]);
        expect(same).toBe(true);
      }
    });
  }
});
