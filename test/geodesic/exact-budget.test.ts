/**
 * The exact solver's memory budget (budget.ts, windows.ts): a run within the
 * budget gives the distances of an unbudgeted run, the store grows on
 * demand, a run over the budget ends with a LIMIT error naming the budget
 * and the option, and the projection that refuses a run early computes what
 * its rule says.
 *
 * Sources: on a flat convex domain the geodesic distance is the Euclidean
 * distance (elementary); a run whose storage grows is the same algorithm as
 * one that reserved everything up front, so its distances must be identical
 * (common practice: an implementation detail must not change the answer);
 * the projection's integral of a linear rate is checked against its closed
 * form (elementary calculus).
 */
import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import type { IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { exactDistance } from '../../src/geodesic/exact/index.js';
import { createState } from '../../src/geodesic/exact/state.js';
import { markPseudoSources } from '../../src/geodesic/exact/pseudo-sources.js';
import { seedSources } from '../../src/geodesic/exact/seed.js';
import { runEvents } from '../../src/geodesic/exact/propagate.js';
import { RunBudget, BLOCK, SAMPLE, WINDOW_BYTES } from '../../src/geodesic/exact/budget.js';
import { pointSources } from '../../src/geodesic/shared/sources.js';
import { isOrthodromeError, type OrthodromeError } from '../../src/errors.js';
import { flatGrid, terrain } from '../fixtures/shapes.js';
import type { Shape } from '../fixtures/shapes.js';

const meshOf = (s: Shape): IntrinsicMesh => intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);
const V = (vertex: number) => ({ kind: 'vertex' as const, vertex });

function limitOf(fn: () => unknown): OrthodromeError {
  try {
    fn();
  } catch (e) {
    if (isOrthodromeError(e)) return e;
    throw e;
  }
  throw new Error('expected a LIMIT error');
}

/** Runs the solver with a store that starts at 64 windows and must grow (the path a large run takes past its reservation). */
function grownRun(m: IntrinsicMesh, source: number, budget: number) {
  const s = createState(m, Infinity, Infinity, 64, undefined, budget, true);
  markPseudoSources(s);
  seedSources(s, pointSources([V(source)]));
  const key = runEvents(s);
  return { s, key };
}

describe('exact solver memory budget', () => {
  const bumpy = meshOf(terrain(24, 24, 10, 10, (x, y) => 0.8 * Math.sin(1.3 * x) * Math.cos(0.9 * y) + 0.05 * Math.sin(17 * x + 11 * y)));

  it('a store that grows within the budget gives the distances of an unbudgeted run, bit for bit', () => {
    const ref = exactDistance(bumpy, pointSources([V(300)]), { memoryBudget: Infinity });
    const { s, key } = grownRun(bumpy, 300, 64 * 2 ** 20);
    expect(key).toBe(Infinity);
    expect(s.overflow).toBe(false);
    expect(s.win.he.length).toBeGreaterThanOrEqual(ref.windows); // it grew from 64
    expect(s.win.count).toBe(ref.windows);
    for (let v = 0; v < bumpy.topology.nv; v++) expect(s.dist[v]).toBe(ref.field.distance[v]);
    // the default budget changes nothing either
    const dflt = exactDistance(bumpy, pointSources([V(300)]));
    expect(Array.from(dflt.field.distance)).toEqual(Array.from(ref.field.distance));
    expect(dflt.peakBytes).toBeGreaterThan(ref.windows * WINDOW_BYTES);
  });

  it('flat grid under a tight budget that fits: Euclidean distances, and the accounted peak stays within the budget', () => {
    const g = flatGrid(30, 30, 3, 3, 0.2, 4);
    const m = meshOf(g);
    const need = exactDistance(m, pointSources([V(465)])).peakBytes;
    const budget = Math.ceil(need * 1.05);
    const r = exactDistance(m, pointSources([V(465)]), { memoryBudget: budget });
    expect(r.complete).toBe(true);
    expect(r.peakBytes).toBeLessThanOrEqual(budget);
    const p = g.positions, x0 = p[3 * 465]!, y0 = p[3 * 465 + 1]!;
    for (let v = 0; v < m.topology.nv; v++) {
      const d = Math.hypot(p[3 * v]! - x0, p[3 * v + 1]! - y0);
      expect(Math.abs(r.field.distance[v]! - d)).toBeLessThanOrEqual(1e-9 * 3);
    }
  });

  it('over the budget: a LIMIT error naming the budget, the option and the heat method; whole-mesh, early-stop and fixed-array cases', () => {
    for (const opts of [{}, { maxDistance: 1e9 }, { targets: [V(0)] }]) {
      const need = exactDistance(bumpy, pointSources([V(300)]), opts).peakBytes;
      const e = limitOf(() => exactDistance(bumpy, pointSources([V(300)]), { ...opts, memoryBudget: Math.floor(need * 0.7) }));
      expect(e.code).toBe('LIMIT');
      expect(e.message).toMatch(/memory budget of [\d.]+ KiB/);
      expect(e.message).toMatch(/--memory-budget/);
      expect(e.message).toMatch(/--method heat/);
      expect(e.message).not.toMatch(/\n/);
    }
    // a budget below the mesh's own arrays says so
    const e = limitOf(() => exactDistance(bumpy, pointSources([V(300)]), { memoryBudget: 1000 }));
    expect(e.code).toBe('LIMIT');
    expect(e.message).toMatch(/memory budget of 1000 bytes.*mesh alone needs/);
    // bad budgets are usage errors
    expect(limitOf(() => exactDistance(bumpy, pointSources([V(0)]), { memoryBudget: 0 })).code).toBe('USAGE');
    expect(limitOf(() => exactDistance(bumpy, pointSources([V(0)]), { memoryBudget: NaN })).code).toBe('USAGE');
  });

  it('an explicit window cap still trips as maxWindows', () => {
    const e = limitOf(() => exactDistance(bumpy, pointSources([V(300)]), { maxWindows: 100 }));
    expect(e.code).toBe('LIMIT');
    expect(e.message).toMatch(/window cap of 100 \(maxWindows\)/);
  });
});

describe('early refusal: projection of the run from its first part', () => {
  // only the topology matters here (its face count is the reach); counts are fed as a run would report them
  const t = buildTopology(flatGrid(200, 200).triangles, 201 * 201).topology;
  const reach = t.nf;
  const seen = new Uint8Array(t.nf);
  seen[0] = 1;

  /** Feeds (count, faces) every BLOCK windows, windows(φ) = reach·(aφ + bφ²/2) (rate a + bφ per face); returns the budget after it trips or the run ends. */
  function feed(limit: number, a: number, b: number) {
    const budget = new RunBudget(limit, Infinity, true);
    const total = reach * (a + b / 2);
    const share = (w: number) => (b === 0 ? w / (reach * a) : (-a + Math.sqrt(a * a + (2 * b * w) / reach)) / b);
    for (let count = 0; count < total; count += BLOCK) {
      const faces = Math.round(share(count) * reach);
      if (budget.nextRoom(t, count, faces, seen) <= count) return { budget, count, total };
    }
    return { budget, count: total, total };
  }

  it('constant rate: projects the exact total; refuses a run 20% over the budget within its first blocks, lets one that fits run', () => {
    const a = 60, total = reach * a; // 4.8M windows
    const over = feed((total * WINDOW_BYTES) / 1.2, a, 0);
    expect(over.budget.tripped).toBe('estimate');
    expect(over.count).toBeLessThanOrEqual(5 * BLOCK); // at the first check allowed (4 blocks: 22% of this run)
    expect(Math.abs(over.budget.projectedWindows - total) / total).toBeLessThan(0.01);
    const fits = feed(total * WINDOW_BYTES * 1.01, a, 0);
    expect(fits.budget.tripped).toBe('');
    // projected 5% over: within the 10% margin, so the run goes on and stops at the budget itself
    const near = feed((total * WINDOW_BYTES) / 1.05, a, 0);
    expect(near.budget.tripped).toBe('budget');
  });

  it('early projections (before 4 blocks, sampled every SAMPLE windows) refuse only a run projected over twice the budget', () => {
    // constant rate a per face: the projection is the closed form reach·a at every sample
    const a = 60, total = reach * a;
    const fine = (limit: number) => {
      const budget = new RunBudget(limit, Infinity, true);
      for (let count = 0; count < total; count += SAMPLE) {
        if (budget.nextRoom(t, count, Math.round(count / a), seen) <= count) return { budget, count };
      }
      return { budget, count: total };
    };
    // the store asks every SAMPLE windows while projecting (not every BLOCK)
    expect(new RunBudget(2 ** 40, Infinity, true).nextRoom(t, 0, 0, seen)).toBe(SAMPLE);
    const far = fine((total * WINDOW_BYTES) / 2.5);
    expect(far.budget.tripped).toBe('estimate');
    expect(far.count).toBe(BLOCK); // the first projection (BLOCK windows, 5.5% of the faces)
    expect(Math.abs(far.budget.projectedWindows - total) / total).toBeLessThan(0.01);
    const over = fine((total * WINDOW_BYTES) / 1.5); // 1.5× over: not before 4 blocks, then with the 10% margin
    expect(over.budget.tripped).toBe('estimate');
    expect(over.count).toBe(4 * BLOCK);
  });

  it('rate growing linearly with the touched share: half the fitted trend, integrated in closed form', () => {
    const a = 20, b = 80; // final total reach·(a + b/2) = 60 per face
    const r = feed(6 * BLOCK * WINDOW_BYTES, a, b); // room for the first blocks, far below the projection: read the first one
    expect(r.budget.tripped).toBe('estimate');
    // the rates over the two quarters are exact means of a linear rate, so the fitted slope is b;
    // projection = count + reach·∫_φ^1 (a + b·p2 + (b/2)(x − p2)) dx with p2 the mean share of the latest quarter
    const phi = r.budget.touchedShare, count = r.count;
    const k = count / BLOCK, j = k >> 1, mid = (j + k) >> 1;
    const share = (w: number) => (-a + Math.sqrt(a * a + (2 * b * w) / reach)) / b;
    const fq = (w: number) => Math.round(share(w) * reach) / reach;
    const p2 = (fq(mid * BLOCK) + fq(count)) / 2;
    const r2 = a + b * p2;
    const rest = reach * ((r2 - (b / 2) * p2) * (1 - phi) + (b / 4) * (1 - phi * phi));
    const want = count + rest;
    expect(Math.abs(r.budget.projectedWindows - want) / want).toBeLessThan(0.01);
    // and it lies between the plain-rate projection and the true total (an underestimate for a growing rate)
    expect(r.budget.projectedWindows).toBeLessThan(r.total);
    expect(r.budget.projectedWindows).toBeGreaterThan(count + r2 * reach * (1 - phi));
  });
});
