import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { graphDistance } from '../../src/geodesic/graph.js';
import { IndexedMinHeap } from '../../src/geodesic/shared/edge-dijkstra.js';
import { pointSources, boundaryCurves } from '../../src/geodesic/shared/sources.js';
import { flatGrid, icosphere, rng } from '../fixtures/shapes.js';

function meshOf(s: { positions: Float64Array; triangles: Uint32Array }) {
  const { topology } = buildTopology(s.triangles, s.positions.length / 3);
  return intrinsicFromPositions(topology, s.positions);
}

/** Dense Floyd–Warshall oracle over the same edge graph (textbook all-pairs shortest paths). */
function floyd(m: ReturnType<typeof meshOf>): Float64Array[] {
  const t = m.topology, n = t.nv;
  const D = Array.from({ length: n }, (_, i) => new Float64Array(n).fill(Infinity).fill(0, i, i + 1));
  for (let h = 0; h < t.tri.length; h++) {
    const a = t.tri[h]!, b = t.tri[h % 3 === 2 ? h - 2 : h + 1]!, l = m.edgeLength[t.edgeOf[h]!]!;
    D[a]![b] = Math.min(D[a]![b]!, l);
    D[b]![a] = Math.min(D[b]![a]!, l);
  }
  for (let k = 0; k < n; k++) for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) {
    const d = D[i]![k]! + D[k]![j]!;
    if (d < D[i]![j]!) D[i]![j] = d;
  }
  return D;
}

describe('graphDistance', () => {
  it('matches a dense Floyd–Warshall oracle on a jittered grid and a sphere (common practice)', () => {
    for (const s of [flatGrid(6, 5, 1, 1, 0.3, 7), icosphere(1)]) {
      const m = meshOf(s);
      const D = floyd(m);
      for (const src of [0, 5, m.topology.nv - 1]) {
        const d = graphDistance(m, pointSources([{ kind: 'vertex', vertex: src }])).distance;
        for (let v = 0; v < m.topology.nv; v++) expect(d[v]).toBeCloseTo(D[src]![v]!, 12);
      }
    }
  });

  it('boundary row of a flat grid: distance along the straight boundary equals x (elementary)', () => {
    const m = meshOf(flatGrid(8, 4, 2, 1));
    const d = graphDistance(m, pointSources([{ kind: 'vertex', vertex: 0 }])).distance;
    for (let i = 0; i <= 8; i++) expect(d[i]).toBeCloseTo((2 * i) / 8, 12);
  });

  it('a face source seeds its corners with the straight in-face distance (elementary)', () => {
    const m = meshOf(flatGrid(1, 1, 1, 1)); // face 0 = (0,0),(1,0),(1,1)
    const d = graphDistance(m, pointSources([{ kind: 'face', face: 0, bary: [1 / 3, 1 / 3, 1 / 3] }])).distance;
    // centroid (2/3, 1/3): distance to (0,0) = √5/3, to (1,0) = √2/3, to (1,1) = √5/3
    expect(d[0]).toBeCloseTo(Math.sqrt(5) / 3, 12);
    expect(d[1]).toBeCloseTo(Math.sqrt(2) / 3, 12);
    expect(d[3]).toBeCloseTo(Math.sqrt(5) / 3, 12);
    // (0,1): via the edge to a corner or directly? graph: min(√5/3 + 1, √2/3 + ...) ≥ its Euclidean distance √(4/9+4/9)
    expect(d[2]).toBeGreaterThanOrEqual(Math.hypot(2 / 3, 2 / 3) - 1e-12);
  });

  it('maxDistance leaves far vertices at Infinity and disconnected pieces are unreachable', () => {
    const m = meshOf(flatGrid(10, 1, 10, 1));
    const d = graphDistance(m, pointSources([{ kind: 'vertex', vertex: 0 }]), { maxDistance: 3.5 }).distance;
    expect(d[3]).toBeCloseTo(3, 12);
    expect(d[4]).toBe(Infinity);
    const two = buildTopology(Uint32Array.from([0, 1, 2, 3, 4, 5]), 6).topology;
    const pos = Float64Array.from([0, 0, 0, 1, 0, 0, 0, 1, 0, 5, 0, 0, 6, 0, 0, 5, 1, 0]);
    const d2 = graphDistance(intrinsicFromPositions(two, pos), pointSources([{ kind: 'vertex', vertex: 0 }])).distance;
    expect([...d2.slice(3)]).toEqual([Infinity, Infinity, Infinity]);
  });

  it('IndexedMinHeap pops in key order with decrease-key (sorted-array oracle)', () => {
    const r = rng(3);
    const key = new Float64Array(200).map(() => r());
    const h = new IndexedMinHeap(200, key);
    for (let i = 0; i < 200; i++) h.push(i);
    for (let i = 0; i < 200; i += 7) { key[i] = key[i]! * 0.1; h.push(i); }
    const out: number[] = [];
    while (h.size) out.push(key[h.pop()]!);
    expect(out).toEqual([...key].sort((a, b) => a - b));
  });
});

describe('graphDistance: curve sources', () => {
  it('a segment inside a face seeds its corners with the point-to-segment distance; the boundary loop seeds 0 (elementary)', () => {
    const m = meshOf(flatGrid(4, 4, 1, 1));
    // face 0 = (0,0),(0.25,0),(0.25,0.25): a segment from its centroid to the midpoint of edge (0,0)-(0.25,0.25)
    const seg = [
      { kind: 'face' as const, face: 0, bary: [1 / 3, 1 / 3, 1 / 3] as [number, number, number] },
      { kind: 'face' as const, face: 0, bary: [0.5, 0, 0.5] as [number, number, number] },
    ];
    const d = graphDistance(m, { points: [], curves: [seg] }).distance;
    // segment from (1/6, 1/12) to (1/8, 1/8); distance from (0.25, 0): nearest point is the first end
    expect(d[1]).toBeCloseTo(Math.hypot(0.25 - 1 / 6, 1 / 12), 12);
    const loop = graphDistance(m, { points: [], curves: boundaryCurves(m.topology) }).distance;
    expect(loop[0]).toBe(0);
    expect(loop[6]).toBeCloseTo(0.25, 12); // vertex 6 = (0.25, 0.25) is one cell from the boundary
    expect(loop[12]).toBeCloseTo(0.5, 12); // the centre (0.5, 0.5)
  });
});
