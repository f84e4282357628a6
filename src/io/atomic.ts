/**
 * Node adapter: write a file so that readers see either the old content or
 * the complete new one, never a half-written file.
 *
 *   write <dir>/.<name>.<pid>.<random>.tmp  →  fsync  →  rename over <name>
 *
 * The temporary file lives in the target's folder so the rename stays on one
 * file system (rename is atomic there, POSIX rename(2)). On any failure the
 * temporary file is removed and an `INPUT` error names the target path.
 */
import { open, rename, unlink } from 'node:fs/promises';
import { closeSync, fsyncSync, openSync, renameSync, unlinkSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { inputError } from '../errors.js';

function tempPath(path: string): string {
  const tag = `${process.pid}.${Math.random().toString(36).slice(2, 10)}`;
  return join(dirname(path), `.${basename(path)}.${tag}.tmp`);
}

function failure(e: unknown, path: string) {
  return inputError(`cannot write file (${e instanceof Error ? e.message : String(e)})`, path);
}

/** Writes `data` to `path` atomically (temp file, fsync, rename). */
export async function writeFileAtomic(path: string, data: Uint8Array | string): Promise<void> {
  const tmp = tempPath(path);
  let created = false;
  try {
    const fh = await open(tmp, 'wx', 0o644);
    created = true;
    try {
      await fh.writeFile(data);
      await fh.sync();
    } finally {
      await fh.close();
    }
    await rename(tmp, path);
    created = false;
  } catch (e) {
    if (created) await unlink(tmp).catch(() => undefined);
    throw failure(e, path);
  }
}

/** Synchronous {@link writeFileAtomic}. */
export function writeFileAtomicSync(path: string, data: Uint8Array | string): void {
  const tmp = tempPath(path);
  let created = false;
  try {
    const fd = openSync(tmp, 'wx', 0o644);
    created = true;
    try {
      const buf = typeof data === 'string' ? Buffer.from(data, 'utf8') : data;
      for (let o = 0; o < buf.length; ) o += writeSync(fd, buf, o, buf.length - o);
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
    renameSync(tmp, path);
    created = false;
  } catch (e) {
    if (created) {
      try { unlinkSync(tmp); } catch { /* already gone */ }
    }
    throw failure(e, path);
  }
}
