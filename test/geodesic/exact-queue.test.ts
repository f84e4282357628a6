/**
 * The window queue of the exact solver (FIFO buckets of width Δ on the
 * key, as in Dial's bucket queue for shortest paths, CACM 12(11), 1969,
 * Algorithm 360 — from memory) against a plain list model: every id comes
 * out exactly once, the lower bound never exceeds a queued key (also when
 * a key lands below the front), each pop comes from the lowest bucket, and
 * inside one bucket the order is first in, first out.
 */
import { describe, it, expect } from 'vitest';
import { test, fc } from '@fast-check/vitest';
import { BucketQueue } from '../../src/geodesic/exact/bucket-queue.js';

describe('BucketQueue', () => {
  it('pops by bucket, first in first out inside a bucket', () => {
    const q = new BucketQueue(1, 4);
    [[2.5, 0], [0.7, 1], [2.1, 2], [0.2, 3], [5, 4]].forEach(([k, id]) => q.push(k!, id!));
    const out: number[] = [];
    while (q.lowerBound() < Infinity) out.push(q.pop());
    expect(out).toEqual([1, 3, 0, 2, 4]); // bucket 0: 1 then 3; bucket 2: 0 then 2; bucket 5: 4
    expect(q.size).toBe(0);
  });

  it('a key below the front moves the front back: the lower bound stays a lower bound', () => {
    // the solver settles a vertex at key <= lowerBound() and its windows may start just below
    // the front; a bound above a queued key would let a later vertex settle too early
    const q = new BucketQueue(0.5);
    q.push(3.2, 7);
    expect(q.lowerBound()).toBe(3);
    q.push(1.2, 8);
    expect(q.lowerBound()).toBe(1);
    expect(q.pop()).toBe(8);
    expect(q.lowerBound()).toBe(3);
    expect(q.pop()).toBe(7);
    q.push(Number.NaN, 9); // never NaN in a run; must not corrupt the queue
    expect(q.pop()).toBe(9);
    expect(q.lowerBound()).toBe(Infinity);
  });

  test.prop([fc.array(fc.tuple(fc.double({ min: 0, max: 50, noNaN: true }), fc.boolean()), { minLength: 1, maxLength: 300 }), fc.double({ min: 0.05, max: 5, noNaN: true })], { numRuns: 300 })(
    'random interleaved pushes and pops against a list model (fast-check)',
    (ops, width) => {
      const q = new BucketQueue(width, 8);
      const live = new Map<number, number>();
      let id = 0;
      const popOne = () => {
        const lb = q.lowerBound();
        for (const k of live.values()) expect(k).toBeGreaterThanOrEqual(lb); // a true lower bound, always
        const got = q.pop();
        expect(live.has(got)).toBe(true);
        // it came from the lowest bucket, [lb, lb + width) up to rounding (a key one ulp below an
        // integer multiple of the width sits in the bucket below it: the seed -2000958353 found one)
        expect(live.get(got)!).toBeLessThan(lb + width * (1 + 1e-12));
        live.delete(got);
      };
      for (const [k, doPop] of ops) {
        q.push(k, id);
        live.set(id++, k);
        if (doPop) popOne();
      }
      while (live.size) popOne();
      expect(q.size).toBe(0);
      expect(q.lowerBound()).toBe(Infinity);
    },
  );

  it('a key one ulp below a multiple of the width: the lower bound stays below it (found by fast-check, seed -2000958353)', () => {
    const width = 4.999999999999998, key = 49.99999999999998; // key / width rounds to exactly 10
    const q = new BucketQueue(width);
    q.push(key, 1);
    expect(q.lowerBound()).toBeLessThanOrEqual(key);
    expect(q.pop()).toBe(1);
  });
});
