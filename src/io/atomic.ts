/**
 * Node adapter: write a file so that readers see either the old content or
 * the complete new one, never a half-written file.
 *
 *   write <dir>/.<name>.<pid>.<random>.tmp  →  fsync  →  rename over <name>
 *
 * The temporary file lives in the target's folder so the rename stays on one
 * file system (rename is atomic there, POSIX rename(2)); a symbolic link as
 * target is followed, so the link stays and the file it points to is
 * replaced. The mode of a file being replaced is kept (new files get 0666
 * less the umask, as usual). A target whose name ends in `.gz` is written
 * gzip-compressed (RFC 1952) unless the data already is.
 *
 * On any failure the temporary file is removed and an `INPUT` error names
 * the target path. While a temporary file exists, SIGINT, SIGTERM and SIGHUP
 * remove it before the process ends by the signal as it would have, and so
 * does a `process.exit` mid-write: the target keeps its old content.
 */
import { open, realpath, rename, stat, unlink } from 'node:fs/promises';
import { closeSync, fchmodSync, fsyncSync, openSync, realpathSync, renameSync, statSync, unlinkSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { inputError } from '../errors.js';

/** What {@link writeFileAtomic} accepts: bytes, text, or chunks of either (streamed). */
export type AtomicData = Uint8Array | string | Iterable<Uint8Array | string> | AsyncIterable<Uint8Array | string>;

/** Options of {@link writeFileAtomic}. */
export interface AtomicOptions {
  /** Compress with gzip; default: when the target name ends in `.gz` (any case) and the data is not gzip already. */
  gzip?: boolean;
}

// ---- temporary files alive in this process, removed on signals and exit ----

const live = new Set<string>();
const SIGNALS = ['SIGINT', 'SIGTERM', 'SIGHUP'] as const;

function removeLive(): void {
  for (const t of live) {
    try { unlinkSync(t); } catch { /* already gone */ }
  }
  live.clear();
}

function onSignal(sig: NodeJS.Signals): void {
  removeLive();
  disarm();
  // With our listeners gone the signal's default action ends the process,
  // so the exit status says "killed by SIGxxx" as it would have.
  process.kill(process.pid, sig);
}

function arm(tmp: string): void {
  if (live.size === 0) {
    for (const s of SIGNALS) process.on(s, onSignal);
    process.on('exit', removeLive);
  }
  live.add(tmp);
}

function disarm(): void {
  for (const s of SIGNALS) process.removeListener(s, onSignal);
  process.removeListener('exit', removeLive);
}

function release(tmp: string): void {
  live.delete(tmp);
  if (live.size === 0) disarm();
}

/** The number of temporary files this process is writing right now (for tests). */
export function pendingTempFiles(): number {
  return live.size;
}

// ---- helpers ----

/** A fresh hidden name beside `path`; the `.tmp` ending marks it as ours. */
function tempPath(path: string): string {
  const tag = `${process.pid}.${Math.random().toString(36).slice(2, 10)}`;
  return join(dirname(path), `.${basename(path)}.${tag}.tmp`);
}

function failure(e: unknown, path: string) {
  return inputError(`cannot write file (${e instanceof Error ? e.message : String(e)})`, path);
}

function isGzipBytes(d: unknown): boolean {
  return d instanceof Uint8Array && d.length >= 2 && d[0] === 0x1f && d[1] === 0x8b;
}

function wantsGzip(path: string, data: AtomicData, opts: AtomicOptions): boolean {
  return opts.gzip ?? (/\.gz$/i.test(path) && !isGzipBytes(data));
}

function toBytes(d: Uint8Array | string): Uint8Array {
  return typeof d === 'string' ? Buffer.from(d, 'utf8') : d;
}

/** All chunks of `data` as one byte array (only used when compressing). */
async function collect(data: AtomicData): Promise<Uint8Array> {
  if (typeof data === 'string' || data instanceof Uint8Array) return toBytes(data);
  const parts: Uint8Array[] = [];
  for await (const c of data as AsyncIterable<Uint8Array | string>) parts.push(toBytes(c));
  return Buffer.concat(parts);
}

function collectSync(data: Iterable<Uint8Array | string> | Uint8Array | string): Uint8Array {
  if (typeof data === 'string' || data instanceof Uint8Array) return toBytes(data);
  return Buffer.concat(Array.from(data, toBytes));
}

/** The existing file's real path and permission bits, or the path itself and null. */
async function target(path: string): Promise<{ real: string; mode: number | null }> {
  try {
    const real = await realpath(path);
    return { real, mode: (await stat(real)).mode & 0o7777 };
  } catch {
    return { real: path, mode: null };
  }
}

function targetSync(path: string): { real: string; mode: number | null } {
  try {
    const real = realpathSync(path);
    return { real, mode: statSync(real).mode & 0o7777 };
  } catch {
    return { real: path, mode: null };
  }
}

// ---- writers ----

/**
 * Writes `data` to `path` atomically (temporary file, fsync, rename); chunks
 * given as an (async) iterable are written as they come. See the file header
 * for symbolic links, modes, `.gz` targets and signals.
 */
export async function writeFileAtomic(path: string, data: AtomicData, opts: AtomicOptions = {}): Promise<void> {
  const { real, mode } = await target(path);
  const tmp = tempPath(real);
  let created = false;
  try {
    const body: AtomicData = wantsGzip(path, data, opts) ? gzipSync(await collect(data)) : data;
    const fh = await open(tmp, 'wx', 0o666);
    created = true;
    arm(tmp);
    try {
      if (mode !== null) await fh.chmod(mode);
      if (typeof body === 'string' || body instanceof Uint8Array) await fh.writeFile(body);
      else {
        for await (const c of body as AsyncIterable<Uint8Array | string>) {
          const buf = toBytes(c);
          for (let o = 0; o < buf.length; ) o += (await fh.write(buf, o, buf.length - o)).bytesWritten;
        }
      }
      await fh.sync();
    } finally {
      await fh.close();
    }
    await rename(tmp, real);
    created = false;
    release(tmp);
  } catch (e) {
    if (created) {
      await unlink(tmp).catch(() => undefined);
      release(tmp);
    }
    throw failure(e, path);
  }
}

/** Synchronous {@link writeFileAtomic} (no async chunks). */
export function writeFileAtomicSync(path: string, data: Uint8Array | string | Iterable<Uint8Array | string>, opts: AtomicOptions = {}): void {
  const { real, mode } = targetSync(path);
  const tmp = tempPath(real);
  let created = false;
  try {
    const gz = wantsGzip(path, data, opts);
    const fd = openSync(tmp, 'wx', 0o666);
    created = true;
    arm(tmp);
    try {
      if (mode !== null) fchmodSync(fd, mode);
      const chunks = gz ? [gzipSync(collectSync(data))] : typeof data === 'string' || data instanceof Uint8Array ? [data] : data;
      for (const c of chunks) {
        const buf = toBytes(c);
        for (let o = 0; o < buf.length; ) o += writeSync(fd, buf, o, buf.length - o);
      }
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
    renameSync(tmp, real);
    created = false;
    release(tmp);
  } catch (e) {
    if (created) {
      try { unlinkSync(tmp); } catch { /* already gone */ }
      release(tmp);
    }
    throw failure(e, path);
  }
}
