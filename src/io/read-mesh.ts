/**
 * Node adapter: read a mesh file from disk, unpack gzip (by magic bytes, so
 * `.obj.gz`, `.ply.gz` and mis-named files all work), sniff and parse.
 */
import { readFile } from 'node:fs/promises';
import { readFileSync } from 'node:fs';
import { gunzipSync } from 'node:zlib';
import { inputError } from '../errors.js';
import type { MeshData } from './mesh-data.js';
import { isGzip, parseMesh } from './sniff.js';

/** `ENOENT` and friends as a one-line reason. */
function reason(e: unknown): string {
  const code = (e as { code?: string }).code;
  if (code === 'ENOENT') return 'file not found';
  if (code === 'EACCES' || code === 'EPERM') return 'permission denied';
  if (code === 'EISDIR') return 'is a directory, not a file';
  return `cannot read file (${e instanceof Error ? e.message : String(e)})`;
}

/** Unpacks gzip data if the magic bytes say so; `INPUT` on a corrupt stream. */
export function gunzipIfNeeded(bytes: Uint8Array, path: string): Uint8Array {
  if (!isGzip(bytes)) return bytes;
  try {
    const out = gunzipSync(bytes);
    return new Uint8Array(out.buffer, out.byteOffset, out.byteLength);
  } catch (e) {
    throw inputError(`corrupt gzip data (${e instanceof Error ? e.message : String(e)})`, path);
  }
}

/** Parses bytes read from `path` (gzip allowed); names the path in errors. */
function parseFile(bytes: Uint8Array, path: string): MeshData {
  // Messages name the real file (`hill.obj.gz:12`); the format hint ignores `.gz`.
  return parseMesh(gunzipIfNeeded(bytes, path), path);
}

/** Reads and parses an OBJ or PLY file (optionally gzip-compressed). */
export async function readMeshFile(path: string): Promise<MeshData> {
  let bytes: Uint8Array;
  try {
    bytes = await readFile(path);
  } catch (e) {
    throw inputError(reason(e), path);
  }
  return parseFile(bytes, path);
}

/** Synchronous {@link readMeshFile}. */
export function readMeshFileSync(path: string): MeshData {
  let bytes: Uint8Array;
  try {
    bytes = readFileSync(path);
  } catch (e) {
    throw inputError(reason(e), path);
  }
  return parseFile(bytes, path);
}
