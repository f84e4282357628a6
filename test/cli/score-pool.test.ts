/**
 * The worker pool of `score` when a worker thread runs out of JavaScript
 * heap, for real: each thread's heap is capped (tinypool's resourceLimits,
 * maxOldGenerationSizeMb) at 32 MiB here, and a triangle soup of 100 000
 * separate triangles (100 000 boundary loops and components, each listed on
 * the heap by the health report) does not fit in it. That mesh becomes an
 * error reply naming the limit and the option that raises it; the meshes
 * before and after it score normally (the thread that died is replaced).
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ScorePool } from '../../cli/score/pool.js';
import type { ScoreTask } from '../../cli/score/worker.js';

/** OBJ text of `n` unit-ish right triangles that share no vertex (a triangle soup). */
function soup(n: number): string {
  const L: string[] = [];
  for (let i = 0; i < n; i++) {
    const x = i % 1000, y = Math.floor(i / 1000);
    L.push(`v ${x} ${y} 0`, `v ${x + 0.5} ${y} 0`, `v ${x} ${y + 0.5} 0`);
  }
  for (let i = 0; i < n; i++) L.push(`f ${3 * i + 1} ${3 * i + 2} ${3 * i + 3}`);
  return L.join('\n') + '\n';
}

describe('score pool', () => {
  it('a worker thread out of heap is an error reply naming the limit; the pool goes on with a fresh thread', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'orthodrome-score-pool-'));
    writeFileSync(join(dir, 'small.obj'), soup(100));
    writeFileSync(join(dir, 'big.obj'), soup(100_000));
    const task = (f: string): ScoreTask => ({
      path: join(dir, f), file: f, groups: ['health', 'quality', 'curvature'], landmarks: [], heatSamples: 3, memoryLimit: 2 ** 32, maxInputBytes: 2 ** 30,
    });
    const pool = new ScorePool(1, 0, 2 ** 32, 32);
    try {
      const before = await pool.run(task('small.obj'));
      // each separate triangle is its own component with one boundary loop (Euler: V − E + F = 3 − 3 + 1 = 1 per triangle)
      expect(before).toMatchObject({ ok: true, metrics: { boundaryLoops: 100, components: 100 } });
      const big = await pool.run(task('big.obj'));
      expect(big.ok).toBe(false);
      expect(big).toMatchObject({ limit: true });
      expect(!big.ok && big.error).toBe(
        'big.obj: the worker thread ran out of JavaScript heap (capped at 32 MiB per thread by --mesh-memory); raise --mesh-memory if the machine has the memory (and lower --jobs to make room)',
      );
      const after = await pool.run(task('small.obj'));
      expect(after).toMatchObject({ ok: true, metrics: { boundaryLoops: 100, components: 100 } });
    } finally {
      await pool.close();
    }
  }, 120_000);
});
