/**
 * The meshes a `score` run names: files, folders (searched recursively for
 * .obj, .ply and .stl, each optionally .gz), glob patterns (tinyglobby:
 * `*`, `**`, `?`, `[…]`, `{a,b}`), `-` for a list of paths on standard input
 * (one per line; blank lines and lines starting with `#` skipped), and
 * manifests (a `.csv` file: src/score/manifest.ts).
 *
 * Each mesh is named by its path relative to the working directory (as the
 * shell would spell it, with `/`), which is what the results' `file` column
 * holds and what sharding hashes. A path named twice is scored once; two
 * manifest records for one path with different landmarks are an error.
 * A path that does not exist is kept: it becomes an error row, like any mesh
 * that cannot be read.
 */
import { readFileSync, statSync } from 'node:fs';
import { dirname, isAbsolute, join, relative, resolve, sep } from 'node:path';
import { globSync } from 'tinyglobby';
import { parseManifest, type LandmarkSpec } from '../../src/score/index.js';
import { inputError, usageError } from '../../src/errors.js';

/** One mesh to score. */
export interface ScoreInput {
  /** The path as the results name it (relative to the working directory unless given absolute). */
  file: string;
  landmarks: LandmarkSpec[];
  units: string;
  tag: string;
}

/** Mesh file names a folder search picks up. */
export const MESH_PATTERN = '**/*.{obj,ply,stl,obj.gz,ply.gz,stl.gz}';

const GLOB_CHARS = /[*?[\]{}]/;

/** The path as results name it: relative to `cwd` with `/`, or absolute when it lies outside `cwd` or was given so. */
export function displayPath(p: string, cwd: string, givenAbsolute = isAbsolute(p)): string {
  const abs = resolve(cwd, p);
  const rel = relative(cwd, abs);
  const out = givenAbsolute || rel.startsWith('..') || isAbsolute(rel) ? abs : rel;
  return out.split(sep).join('/');
}

function kind(p: string): 'dir' | 'file' | 'none' {
  try {
    return statSync(p).isDirectory() ? 'dir' : 'file';
  } catch {
    return 'none';
  }
}

/**
 * Expands the inputs (see the module comment) in `cwd`; `stdin` is read
 * only when an input is `-`. A glob or folder that matches no mesh, and a
 * bad manifest, are `USAGE` / `INPUT` errors.
 */
export function expandInputs(args: string[], cwd: string, stdin: () => string): ScoreInput[] {
  const out = new Map<string, ScoreInput>();
  const add = (x: ScoreInput, where: string): void => {
    const had = out.get(x.file);
    if (!had) { out.set(x.file, x); return; }
    if (JSON.stringify(had) !== JSON.stringify(x) && (x.landmarks.length || x.tag || x.units)) {
      throw inputError(`'${x.file}' is listed again with other landmarks, units or tag`, where);
    }
  };
  const plain = (p: string, givenAbsolute: boolean): ScoreInput => ({ file: displayPath(p, cwd, givenAbsolute), landmarks: [], units: '', tag: '' });
  const one = (arg: string, where: string): void => {
    const abs = resolve(cwd, arg);
    const k = kind(abs);
    if (k === 'dir') {
      const found = globSync(MESH_PATTERN, { cwd: abs, caseSensitiveMatch: false, onlyFiles: true, dot: false });
      if (found.length === 0) throw usageError(`folder '${arg}' holds no .obj, .ply or .stl file (also .gz)`, where);
      // a folder given relative gives relative names; given absolute, absolute ones
      for (const f of found) add(plain(join(abs, f), isAbsolute(arg)), where);
      return;
    }
    if (k === 'file' && /\.csv$/i.test(arg)) {
      const base = dirname(abs);
      for (const e of parseManifest(readFileSync(abs, 'utf8'), arg)) {
        add({ file: displayPath(resolve(base, e.path), cwd, isAbsolute(e.path)), landmarks: e.landmarks, units: e.units, tag: e.tag }, e.where);
      }
      return;
    }
    if (k === 'none' && GLOB_CHARS.test(arg)) {
      const found = globSync(arg, { cwd, caseSensitiveMatch: false, onlyFiles: true, absolute: isAbsolute(arg) });
      if (found.length === 0) throw usageError(`pattern '${arg}' matches no file`, where);
      for (const f of found) add(plain(resolve(cwd, f), isAbsolute(arg)), where);
      return;
    }
    add(plain(abs, isAbsolute(arg)), where);
  };
  for (const arg of args) {
    if (arg === '-') {
      const lines = stdin().split(/\r?\n/);
      lines.forEach((l, i) => {
        const t = l.trim();
        if (t && !t.startsWith('#')) one(t, `standard input:${i + 1}`);
      });
    } else one(arg, 'score');
  }
  return [...out.values()];
}
