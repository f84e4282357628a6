/**
 * Sharding for array jobs: each mesh belongs to shard
 * `uint32(first 4 bytes of SHA-256(file)) mod N`, with `file` the path as the
 * results name it, so every task of an array job, on any machine, agrees on
 * the partition without talking to the others (the same working directory
 * and inputs on each task).
 *
 * `--shard I/N` (I from 0 to N−1), or `--shard env` to read the task's
 * index from the scheduler:
 * - Kubernetes Indexed Job: `JOB_COMPLETION_INDEX` (0-based); the count
 *   from `ORTHODROME_SHARDS` (set it to the Job's `completions`) or
 *   `--shard env/N`;
 * - Slurm job array: `SLURM_ARRAY_TASK_ID` minus `SLURM_ARRAY_TASK_MIN`
 *   (default 0), the count from `SLURM_ARRAY_TASK_COUNT`.
 */
import { createHash } from 'node:crypto';
import { usageError } from '../../src/errors.js';

/** One shard of N. */
export interface Shard {
  index: number;
  count: number;
  /** Where the index came from (for messages): `--shard`, `JOB_COMPLETION_INDEX`, `SLURM_ARRAY_TASK_ID`. */
  source: string;
}

/** The shard of `file` among `count`. */
export function shardOf(file: string, count: number): number {
  return createHash('sha256').update(file, 'utf8').digest().readUInt32BE(0) % count;
}

const INT = /^\d+$/;

function int(text: string | undefined, what: string): number {
  if (text === undefined || !INT.test(text.trim())) throw usageError(`--shard: ${what} is '${text ?? ''}', not a whole number`);
  return Number(text.trim());
}

/** Parses `--shard` (see the module comment), reading `env` for `env` and `env/N`. */
export function parseShard(text: string, env: NodeJS.ProcessEnv): Shard {
  const m = /^env(?:\/(.+))?$/.exec(text.trim());
  let s: Shard;
  if (m) {
    if (env.JOB_COMPLETION_INDEX !== undefined) {
      const count = m[1] !== undefined ? int(m[1], 'the count after env/') : env.ORTHODROME_SHARDS !== undefined ? int(env.ORTHODROME_SHARDS, 'ORTHODROME_SHARDS') : NaN;
      if (Number.isNaN(count)) throw usageError('--shard env: JOB_COMPLETION_INDEX is set but not the count: set ORTHODROME_SHARDS to the Job\'s completions, or pass --shard env/N');
      s = { index: int(env.JOB_COMPLETION_INDEX, 'JOB_COMPLETION_INDEX'), count, source: 'JOB_COMPLETION_INDEX' };
    } else if (env.SLURM_ARRAY_TASK_ID !== undefined) {
      const min = env.SLURM_ARRAY_TASK_MIN !== undefined ? int(env.SLURM_ARRAY_TASK_MIN, 'SLURM_ARRAY_TASK_MIN') : 0;
      const count = m[1] !== undefined ? int(m[1], 'the count after env/') : int(env.SLURM_ARRAY_TASK_COUNT, 'SLURM_ARRAY_TASK_COUNT');
      s = { index: int(env.SLURM_ARRAY_TASK_ID, 'SLURM_ARRAY_TASK_ID') - min, count, source: 'SLURM_ARRAY_TASK_ID' };
    } else {
      throw usageError('--shard env: neither JOB_COMPLETION_INDEX (Kubernetes Indexed Job) nor SLURM_ARRAY_TASK_ID (Slurm job array) is set');
    }
  } else {
    const p = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(text);
    if (!p) throw usageError(`--shard must be I/N (I from 0 to N-1), env or env/N, got '${text}'`);
    s = { index: Number(p[1]), count: Number(p[2]), source: '--shard' };
  }
  if (!(s.count >= 1)) throw usageError(`--shard: the shard count must be at least 1 (${s.source})`);
  if (!(s.index >= 0 && s.index < s.count)) throw usageError(`--shard: index ${s.index} is not between 0 and ${s.count - 1} (${s.source})`);
  return s;
}
