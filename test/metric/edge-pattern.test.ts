/**
 * edgePattern (metric/laplacian.ts) against its definition, computed the
 * slow way: column j holds the diagonal first, then every distinct row
 * i > j joined to j by an edge, ascending (the lower triangle in compressed
 * columns, common practice); each edge's slot is its pair's entry, the same
 * slot for two edges joining one pair (as after intrinsic flips), and -1
 * for a loop edge. Random half-edge arrays with repeated pairs and loops,
 * and a mesh after intrinsic Delaunay flips.
 */
import { describe, expect, it } from 'vitest';
import { edgePattern } from '../../src/metric/laplacian.js';
import type { Topology } from '../../src/mesh/topology.js';
import { next } from '../../src/mesh/topology.js';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { intrinsicDelaunay } from '../../src/metric/delaunay.js';
import { flatGrid } from '../fixtures/shapes.js';

/** The pattern by its definition: sorted distinct pairs per column. */
function slowPattern(t: Pick<Topology, 'nv' | 'ne' | 'tri' | 'edgeHalfedge'>) {
  const rows: Set<number>[] = Array.from({ length: t.nv }, () => new Set<number>());
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!, a = t.tri[h]!, b = t.tri[next(h)]!;
    if (a !== b) rows[Math.min(a, b)]!.add(Math.max(a, b));
  }
  const colPtr = [0], rowIdx: number[] = [];
  for (let j = 0; j < t.nv; j++) {
    rowIdx.push(j, ...[...rows[j]!].sort((x, y) => x - y));
    colPtr.push(rowIdx.length);
  }
  const edgeSlot: number[] = [];
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!, a = t.tri[h]!, b = t.tri[next(h)]!;
    if (a === b) { edgeSlot.push(-1); continue; }
    const j = Math.min(a, b), i = Math.max(a, b);
    edgeSlot.push(rowIdx.indexOf(i, colPtr[j]! + 1));
  }
  return { colPtr, rowIdx, edgeSlot, diagSlot: colPtr.slice(0, t.nv) };
}

function expectDefinition(t: Pick<Topology, 'nv' | 'ne' | 'tri' | 'edgeHalfedge'>): void {
  const p = edgePattern(t as Topology), q = slowPattern(t);
  expect([...p.colPtr]).toEqual(q.colPtr);
  expect([...p.rowIdx]).toEqual(q.rowIdx);
  expect([...p.diagSlot]).toEqual(q.diagSlot);
  expect([...p.edgeSlot]).toEqual(q.edgeSlot);
}

describe('edgePattern', () => {
  it('matches its definition with repeated pairs and loop edges', () => {
    let seed = 7;
    const rnd = (k: number) => { seed = (seed * 1103515245 + 12345) % 2 ** 31; return seed % k; };
    for (let trial = 0; trial < 20; trial++) {
      const nv = 3 + rnd(12), nf = 1 + rnd(30);
      // corners drawn from few vertices: many repeated pairs, and loops (a corner equal to the next)
      const tri = Uint32Array.from({ length: 3 * nf }, () => rnd(nv));
      const ne = 1 + rnd(3 * nf);
      const edgeHalfedge = Int32Array.from({ length: ne }, () => rnd(3 * nf));
      expectDefinition({ nv, ne, tri, edgeHalfedge });
    }
  });

  it('matches its definition after intrinsic Delaunay flips', () => {
    const g = flatGrid(12, 9, 1, 1, 0.3, 4);
    const { topology } = buildTopology(g.triangles, g.positions.length / 3);
    const flipped = intrinsicDelaunay(intrinsicFromPositions(topology, g.positions));
    expect(flipped.flips).toBeGreaterThan(0);
    expectDefinition(flipped.mesh.topology);
  });
});
