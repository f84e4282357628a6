/**
 * Node adapter: read a mesh file from disk, unpack gzip (by magic bytes, so
 * `.obj.gz`, `.ply.gz`, `.stl.gz` and mis-named files all work), sniff and parse.
 *
 * Input size is bounded: the file on disk and the unpacked gzip data may not
 * exceed {@link ReadMeshOptions.maxInputBytes} (default
 * {@link DEFAULT_MAX_INPUT_BYTES}), so a small compressed file cannot expand
 * without bound in memory. Going over is a `LIMIT` error, not bad input.
 */
import { readFile, stat } from 'node:fs/promises';
import { readFileSync, statSync } from 'node:fs';
import { constants as bufferConstants } from 'node:buffer';
import { gunzipSync } from 'node:zlib';
import { inputError, isOrthodromeError, limitError, usageError } from '../errors.js';
import type { MeshData } from './mesh-data.js';
import { isGzip, parseMesh } from './sniff.js';

/** Default bound on input bytes (on disk and after gzip unpacking): 1 GiB. */
export const DEFAULT_MAX_INPUT_BYTES = 1024 ** 3;

/** Options of {@link readMeshFile}. */
export interface ReadMeshOptions {
  /**
   * Largest input accepted, in bytes, both for the file as stored and for its
   * unpacked gzip content (default {@link DEFAULT_MAX_INPUT_BYTES}).
   */
  maxInputBytes?: number;
  /** STL: corners closer than this (mesh units) are welded into one vertex (default 1e-9 × the bounding-box diagonal). */
  weldTolerance?: number;
}

/** A byte count for messages: `1 GiB`, `512 MiB`, `1.5 KiB`, `900 bytes`. */
export function formatBytes(n: number): string {
  const units = ['bytes', 'KiB', 'MiB', 'GiB', 'TiB'];
  let u = 0, x = n;
  while (x >= 1024 && u < units.length - 1) { x /= 1024; u++; }
  return u === 0 ? `${n} bytes` : `${Number(x.toPrecision(4))} ${units[u]}`;
}

/** The limit error for input over `max` bytes. */
function overLimit(what: string, max: number, path: string) {
  return limitError(`${what} exceeds the input size limit of ${formatBytes(max)} (raise it with --max-input-size; library option maxInputBytes)`, path);
}

/** The bound in force: the option, or the default; a positive number of bytes. */
function limitOf(opts: ReadMeshOptions): number {
  const m = opts.maxInputBytes ?? DEFAULT_MAX_INPUT_BYTES;
  if (!(m >= 1)) throw usageError(`maxInputBytes must be a positive number of bytes, got ${m}`);
  return Math.floor(m);
}

/** `ENOENT` and friends as a one-line error. */
function readError(e: unknown, path: string) {
  const code = (e as { code?: string }).code;
  if (code === 'ERR_FS_FILE_TOO_LARGE') return limitError('file is larger than Node.js can read in one piece (2 GiB)', path);
  if (code === 'ENOENT') return inputError('file not found', path);
  if (code === 'EACCES' || code === 'EPERM') return inputError('permission denied', path);
  if (code === 'EISDIR') return inputError('is a directory, not a file', path);
  return inputError(`cannot read file (${e instanceof Error ? e.message : String(e)})`, path);
}

/**
 * Unpacks gzip data if the magic bytes say so (RFC 1952); `INPUT` on a
 * corrupt stream, `LIMIT` when the unpacked data would exceed
 * `maxInputBytes` (the unpacking stops there, so memory stays bounded).
 */
export function gunzipIfNeeded(bytes: Uint8Array, path: string, opts: ReadMeshOptions = {}): Uint8Array {
  if (!isGzip(bytes)) return bytes;
  const max = limitOf(opts);
  try {
    const out = gunzipSync(bytes, { maxOutputLength: Math.min(max, bufferConstants.MAX_LENGTH) });
    return new Uint8Array(out.buffer, out.byteOffset, out.byteLength);
  } catch (e) {
    if ((e as { code?: string }).code === 'ERR_BUFFER_TOO_LARGE') throw overLimit('unpacked gzip data', max, path);
    throw inputError(`corrupt gzip data (${e instanceof Error ? e.message : String(e)})`, path);
  }
}

/** Parses bytes read from `path` (gzip allowed); names the path in errors. */
function parseFile(bytes: Uint8Array, path: string, opts: ReadMeshOptions): MeshData {
  // Messages name the real file (`hill.obj.gz:12`); the format hint ignores `.gz`.
  return parseMesh(gunzipIfNeeded(bytes, path, opts), path, opts.weldTolerance !== undefined ? { weldTolerance: opts.weldTolerance } : {});
}

/**
 * Reads and parses an OBJ, PLY or STL file (optionally gzip-compressed). Throws
 * `INPUT` for unreadable or malformed files and `LIMIT` for input over
 * `opts.maxInputBytes`, both naming `path`.
 */
export async function readMeshFile(path: string, opts: ReadMeshOptions = {}): Promise<MeshData> {
  const max = limitOf(opts);
  let bytes: Uint8Array;
  try {
    const st = await stat(path);
    if (st.isFile() && st.size > max) throw overLimit(`file size ${formatBytes(st.size)}`, max, path);
    bytes = await readFile(path);
  } catch (e) {
    if (isOrthodromeError(e)) throw e;
    throw readError(e, path);
  }
  if (bytes.length > max) throw overLimit(`file size ${formatBytes(bytes.length)}`, max, path);
  return parseFile(bytes, path, opts);
}

/** Synchronous {@link readMeshFile}. */
export function readMeshFileSync(path: string, opts: ReadMeshOptions = {}): MeshData {
  const max = limitOf(opts);
  let bytes: Uint8Array;
  try {
    const st = statSync(path);
    if (st.isFile() && st.size > max) throw overLimit(`file size ${formatBytes(st.size)}`, max, path);
    bytes = readFileSync(path);
  } catch (e) {
    if (isOrthodromeError(e)) throw e;
    throw readError(e, path);
  }
  if (bytes.length > max) throw overLimit(`file size ${formatBytes(bytes.length)}`, max, path);
  return parseFile(bytes, path, opts);
}
