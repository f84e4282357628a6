/**
 * The window-usage diagnostic (src/geodesic/exact/usage.ts), which the
 * exact benchmark reports to show how much of the window set the final
 * field needs. Checks are by construction (common practice):
 * - on a flat convex grid every edge sees the source under one unfolding,
 *   so every live window is used;
 * - a window injected under an existing one (same interval, larger σ) is
 *   never the minimum, so it adds to `live` and not to `used`;
 * - a run with pruning off keeps windows the pruned run proves useless,
 *   so its used fraction is lower.
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
import { windowUsage } from '../../src/geodesic/exact/usage.js';
import { flatGrid, terrain } from '../fixtures/shapes.js';
import type { Shape } from '../fixtures/shapes.js';

const meshOf = (s: Shape): IntrinsicMesh => intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);

describe('exact windows: usage diagnostic', () => {
  it('flat convex grid: every live window is used', () => {
    const m = meshOf(flatGrid(8, 8, 1, 1));
    const r = exactDistance(m, { points: [{ kind: 'vertex', vertex: 20 }], curves: [] });
    const u = r.windowUsage(5);
    expect(u.created).toBe(r.windows);
    expect(u.live).toBeGreaterThan(0);
    expect(u.used).toBe(u.live);
  });

  it('a dominated window counts as live, not used; pruning off lowers the used fraction', () => {
    const m = meshOf(terrain(6, 6, 1, 1, (x, y) => 0.25 * Math.sin(5 * x + 1) * Math.cos(4 * y)));
    const src = { points: [{ kind: 'vertex' as const, vertex: 8 }], curves: [] };
    const s = createState(m, Infinity, 1_000_000, 1024);
    markPseudoSources(s);
    seedSources(s, src);
    runEvents(s);
    const before = windowUsage(s, 7);
    expect(before.used).toBeGreaterThan(0);
    expect(before.used).toBeLessThanOrEqual(before.live);
    // a copy of a live window lifted by 1% of its distance, linked on the same half-edge
    const W = s.win;
    const w = [...Array(W.count).keys()].find((i) => W.state[i] === 1 && W.flat[i] === 0 && W.sigma[i]! > 0)!;
    W.add(W.he[w]!, W.b0[w]!, W.b1[w]!, W.sx[w]!, W.sy[w]!, W.sigma[w]! * 1.01, w);
    W.state[W.count - 1] = 1;
    const after = windowUsage(s, 7);
    expect(after.live).toBe(before.live + 1);
    expect(after.used).toBe(before.used);

    const far = Math.max(...Array.from(s.dist).filter(Number.isFinite));
    const ref = createState(m, 1.2 * far, 5_000_000, 1024);
    ref.prune = false;
    markPseudoSources(ref);
    seedSources(ref, src);
    runEvents(ref);
    const plain = windowUsage(ref, 7);
    expect(plain.used / plain.live).toBeLessThan(before.used / before.live);
  });
});
