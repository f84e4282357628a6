/**
 * Separator thinning against the definition of a vertex separator (common
 * practice: S separates A from B when no edge joins A and B): on random
 * graphs and random cuts, the thinned split is a rearrangement of the input,
 * still separates, never grows S, and leaves only vertices with neighbours on
 * both sides in S (any other could move, so the result is minimal for moves
 * of single vertices); the greedy refinement after it keeps a valid
 * separator that is never larger.
 */
import { describe, expect } from 'vitest';
import { test as fcTest, fc } from '@fast-check/vitest';
import { refineSeparator, separatorContext, thinSeparator } from '../../src/linalg/separator.js';

function graphFrom(n: number, edges: [number, number][]): { xadj: Int32Array; adj: Int32Array } {
  const deg = new Int32Array(n + 1);
  for (const [a, b] of edges) if (a !== b) (deg[a + 1]!++, deg[b + 1]!++);
  for (let v = 0; v < n; v++) deg[v + 1]! += deg[v]!;
  const adj = new Int32Array(deg[n]!), fill = deg.slice(0, n);
  for (const [a, b] of edges) if (a !== b) (adj[fill[a]!++] = b, adj[fill[b]!++] = a);
  return { xadj: deg, adj };
}

/**
 * The "up" separator of the cut inA | not inA (A-side vertices with a B-side
 * neighbour), as the vertex order A, B, S that the separator routines take.
 */
function upSeparator(n: number, xadj: Int32Array, adj: Int32Array, inA: boolean[]) {
  const side0 = new Uint8Array(n);
  for (let v = 0; v < n; v++) {
    let cross = false;
    for (let p = xadj[v]!; p < xadj[v + 1]!; p++) if (inA[v] && !inA[adj[p]!]) cross = true;
    side0[v] = cross ? 2 : inA[v] ? 0 : 1;
  }
  const order = [0, 1, 2].flatMap((s) => [...Array(n).keys()].filter((v) => side0[v] === s));
  const na0 = order.filter((v) => side0[v] === 0).length, nb0 = order.filter((v) => side0[v] === 1).length;
  return { order, na0, nb0 };
}

describe('thinSeparator', () => {
  fcTest.prop([
    fc.integer({ min: 3, max: 40 }).chain((n) => fc.tuple(
      fc.constant(n),
      fc.array(fc.tuple(fc.integer({ min: 0, max: n - 1 }), fc.integer({ min: 0, max: n - 1 })), { maxLength: 4 * n }),
      fc.array(fc.boolean(), { minLength: n, maxLength: n }),
    )),
  ], { numRuns: 200 })('keeps a valid separator, never larger, with both sides adjacent to every S vertex', ([n, edges, inA]) => {
    const { xadj, adj } = graphFrom(n, edges);
    const { order, na0, nb0 } = upSeparator(n, xadj, adj, inA);
    const ctx = separatorContext(xadj, adj, n, new Int32Array(n));
    const dest = new Int32Array(n);
    const [na, nb] = thinSeparator(ctx, Int32Array.from(order), n, na0, nb0, dest);
    expect([...dest].sort((a, b) => a - b)).toEqual([...Array(n).keys()]);
    expect(na).toBeGreaterThanOrEqual(na0);
    expect(nb).toBeGreaterThanOrEqual(nb0);
    const side = new Uint8Array(n);
    for (let q = 0; q < n; q++) side[dest[q]!] = q < na ? 0 : q < na + nb ? 1 : 2;
    for (let v = 0; v < n; v++) {
      let hasA = false, hasB = false;
      for (let p = xadj[v]!; p < xadj[v + 1]!; p++) {
        const s = side[adj[p]!]!;
        if (s === 0) hasA = true;
        if (s === 1) hasB = true;
      }
      if (side[v] === 0) expect(hasB).toBe(false);
      if (side[v] === 2) expect(hasA && hasB).toBe(true);
    }
  });

  fcTest.prop([
    fc.integer({ min: 4, max: 40 }).chain((n) => fc.tuple(
      fc.constant(n),
      fc.array(fc.tuple(fc.integer({ min: 0, max: n - 1 }), fc.integer({ min: 0, max: n - 1 })), { maxLength: 4 * n }),
      fc.array(fc.boolean(), { minLength: n, maxLength: n }),
    )),
  ], { numRuns: 200 })('refinement keeps a valid separator and never grows it', ([n, edges, inA]) => {
    const { xadj, adj } = graphFrom(n, edges);
    const { order, na0, nb0 } = upSeparator(n, xadj, adj, inA);
    const ctx = separatorContext(xadj, adj, n, new Int32Array(n));
    const dest = new Int32Array(n);
    const [na1, nb1] = thinSeparator(ctx, Int32Array.from(order), n, na0, nb0, dest);
    const [na, nb] = refineSeparator(ctx, dest, n, na1, nb1, 4, 0.2);
    expect([...dest].sort((a, b) => a - b)).toEqual([...Array(n).keys()]);
    expect(n - na - nb).toBeLessThanOrEqual(n - na1 - nb1);
    const part = new Uint8Array(n);
    for (let q = 0; q < n; q++) part[dest[q]!] = q < na ? 0 : q < na + nb ? 1 : 2;
    for (let v = 0; v < n; v++) {
      for (let p = xadj[v]!; p < xadj[v + 1]!; p++) {
        if (part[v] === 0) expect(part[adj[p]!]).not.toBe(1);
      }
    }
  });
});
