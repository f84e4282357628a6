/**
 * Sharding of `score`: the partition by SHA-256 of the path, and the shard
 * read from a Kubernetes Indexed Job's or a Slurm job array's environment.
 */
import { describe, expect, it } from 'vitest';
import { parseShard, shardOf } from '../../cli/score/shard.js';

describe('score shards', () => {
  it('a path goes to uint32(first 4 bytes of SHA-256) mod N', () => {
    // FIPS 180-2, appendix B.1: SHA-256("abc") = ba7816bf 8f01cfea …; 0xba7816bf = 3128432319 = 5 (mod 7), 0 (mod 3)
    expect(shardOf('abc', 7)).toBe(5);
    expect(shardOf('abc', 3)).toBe(0);
    expect(shardOf('abc', 1)).toBe(0);
    // every path lands in exactly one of N shards, and the same one every time
    const paths = Array.from({ length: 200 }, (_, i) => `parts/m${i}.ply`);
    const counts = [0, 0, 0, 0];
    for (const p of paths) counts[shardOf(p, 4)]!++;
    expect(counts.reduce((a, b) => a + b)).toBe(200);
    expect(Math.min(...counts)).toBeGreaterThan(20); // a hash spreads them (a loose check, common practice)
    expect(paths.map((p) => shardOf(p, 4))).toEqual(paths.map((p) => shardOf(p, 4)));
  });

  it('I/N, env from Kubernetes (JOB_COMPLETION_INDEX + ORTHODROME_SHARDS or env/N) and Slurm (TASK_ID − TASK_MIN of TASK_COUNT)', () => {
    expect(parseShard('2/5', {})).toMatchObject({ index: 2, count: 5 });
    expect(parseShard('env', { JOB_COMPLETION_INDEX: '3', ORTHODROME_SHARDS: '8' })).toMatchObject({ index: 3, count: 8, source: 'JOB_COMPLETION_INDEX' });
    expect(parseShard('env/4', { JOB_COMPLETION_INDEX: '0' })).toMatchObject({ index: 0, count: 4 });
    expect(parseShard('env', { SLURM_ARRAY_TASK_ID: '7', SLURM_ARRAY_TASK_MIN: '1', SLURM_ARRAY_TASK_COUNT: '10' })).toMatchObject({ index: 6, count: 10, source: 'SLURM_ARRAY_TASK_ID' });
    expect(parseShard('env', { SLURM_ARRAY_TASK_ID: '0', SLURM_ARRAY_TASK_COUNT: '2' })).toMatchObject({ index: 0, count: 2 });
  });

  it('refuses what does not fit (USAGE, one line)', () => {
    expect(() => parseShard('5/5', {})).toThrow(/index 5 is not between 0 and 4/);
    expect(() => parseShard('1-4', {})).toThrow(/--shard must be I\/N/);
    expect(() => parseShard('env', {})).toThrow(/neither JOB_COMPLETION_INDEX .* nor SLURM_ARRAY_TASK_ID/);
    expect(() => parseShard('env', { JOB_COMPLETION_INDEX: '1' })).toThrow(/set ORTHODROME_SHARDS/);
    expect(() => parseShard('env', { SLURM_ARRAY_TASK_ID: '4', SLURM_ARRAY_TASK_COUNT: '4' })).toThrow(/index 4 is not between 0 and 3/);
    expect(() => parseShard('0/0', {})).toThrow(/at least 1/);
  });
});
