/**
 * The walking-time search (src/travel/search.ts walks the Steiner graph's
 * arcs in place, with lower bounds that skip steps, and a 4-ary queue)
 * against the textbook: Dijkstra's algorithm (Dijkstra, Numer. Math. 1,
 * 1959) written out plainly here, over the arcs as `SteinerGraph.arcs`
 * lists them, each timed by the pace model on the nodes' coordinates.
 */
import { describe, expect, it } from 'vitest';
import { openSurface } from '../../src/api/surface.js';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { paceModel, parsePaceTable, type PaceModel } from '../../src/travel/pace.js';
import { SteinerGraph, type SteinerSpacing } from '../../src/travel/steiner-graph.js';
import { runTravelSearch, travelState } from '../../src/travel/travel-time.js';
import { PairHeap } from '../../src/travel/queue.js';
import { terrain, rng } from '../fixtures/shapes.js';

/** Plain Dijkstra (Dijkstra 1959): repeatedly settle the unsettled node of least time; arcs from `arcs()`. */
function referenceTimes(g: SteinerGraph, pace: PaceModel, source: number): Float64Array {
  const n = g.nodeCount, dist = new Float64Array(n).fill(Infinity), done = new Uint8Array(n);
  const to = new Int32Array(g.maxDegree), mult = new Float64Array(g.maxDegree);
  dist[source] = 0;
  for (;;) {
    let u = -1;
    for (let i = 0; i < n; i++) if (!done[i] && dist[i]! < Infinity && (u < 0 || dist[i]! < dist[u]!)) u = i;
    if (u < 0) break;
    done[u] = 1;
    const a = g.nodeFrame(u), c = g.arcs(u, to, mult);
    for (let i = 0; i < c; i++) {
      const w = to[i]!, b = g.nodeFrame(w);
      const s = pace.seconds(Math.hypot(b[0]! - a[0]!, b[1]! - a[1]!), b[2]! - a[2]!);
      const nd = dist[u]! + (s === 0 ? 0 : s * mult[i]!);
      if (nd < dist[w]!) dist[w] = nd;
    }
  }
  return dist;
}

/** A bumpy 7 × 6 grid (a boundary all round), with faces of multiplier 0 (a hole to walk round) and others slower. */
function bumpy() {
  const s = terrain(7, 6, 70, 60, (x, y) => 6 * Math.sin(x / 11) * Math.cos(y / 9) + 0.08 * x);
  const surface = openSurface(meshFromTriangles(s.positions, s.triangles, 'bumpy'), 'bumpy');
  const r = rng(5);
  const mult = Float64Array.from({ length: surface.topology.nf }, (_, f) => (f === 30 || f === 31 || f === 44 ? 0 : 1 + Math.floor(4 * r()) / 4));
  return { surface, mult };
}

describe('the walking-time search gives the times of plain Dijkstra over the listed arcs', () => {
  const { surface, mult } = bumpy();
  const table = parsePaceTable('slope_deg,speed_kmh\n-40,1\n-10,5.5\n0,5\n20,2.5\n40,0.8\n', 'table.csv');
  const cases: [string, PaceModel, number, SteinerSpacing, Float64Array | null][] = [
    ['tobler, k = 3', paceModel('tobler'), 3, 'uniform', null],
    ['tobler, 25° limit, multipliers, k = 2', paceModel('tobler', { maxSlopeDeg: 25 }), 2, 'uniform', mult],
    ['naismith, multipliers, k = 4 geometric', paceModel('naismith'), 4, 'geometric', mult],
    ['a speed table, k = 1', paceModel('table', { table }), 1, 'uniform', mult],
    ['tobler, k = 0 (the edge graph)', paceModel('tobler'), 0, 'uniform', null],
  ];
  for (const [name, pace, k, spacing, fm] of cases) {
    it(name, () => {
      const g = new SteinerGraph(surface.topology, surface.positions, { k, spacing, faceMultipliers: fm });
      const st = travelState(g);
      for (const source of [0, 17, g.nodeCount - 1]) {
        runTravelSearch(g, pace, st, [{ node: source, seconds: 0 }]);
        const ref = referenceTimes(g, pace, source);
        let reached = 0;
        for (let u = 0; u < g.nodeCount; u++) {
          // the same sums of the same step times: equal to rounding (common practice: relative 1e-12)
          if (ref[u] === Infinity) expect(st.dist[u]).toBe(Infinity);
          else {
            reached++;
            expect(Math.abs(st.dist[u]! - ref[u]!)).toBeLessThanOrEqual(1e-12 * ref[u]!);
          }
        }
        expect(reached).toBeGreaterThan(g.nodeCount / 2); // the check covers most of the graph
      }
    });
  }
});

describe('the 4-ary queue', () => {
  it('pops in key order with inserts and decrease-keys, across growth and clear (a sorted-array oracle)', () => {
    const r = rng(11), h = new PairHeap(5000), key = new Map<number, number>();
    const popAll = () => {
      const out: number[] = [];
      while (h.size > 0) { const k = h.minKey; out.push(k); expect(key.get(h.pop())).toBe(k); }
      return out;
    };
    for (let i = 0; i < 4000; i++) {
      const id = Math.floor(r() * 5000), k = r();
      const old = key.get(id);
      h.push(id, k); // a larger key for a queued id is ignored
      if (old === undefined || k < old) key.set(id, k);
    }
    const popped = popAll();
    expect(popped).toEqual([...key.values()].sort((a, b) => a - b)); // the oracle: every id once, by its least key
    for (let i = 0; i < 100; i++) h.push(i, r());
    h.clear();
    expect(h.size).toBe(0);
    key.clear();
    h.push(7, 0.5); key.set(7, 0.5);
    h.push(7, 0.25); key.set(7, 0.25); // a cleared id enters afresh
    expect(popAll()).toEqual([0.25]);
  });
});
