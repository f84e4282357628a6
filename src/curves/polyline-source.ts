/**
 * A polyline given in 3D (a trim line drawn in CAD, a surveyed margin) as a
 * curve source on the surface: each point is snapped to the nearest surface
 * point, and consecutive points are joined by the shortest path on the
 * surface between them (`shortestPath`, so consecutive points of the result
 * share a face, as a source curve requires). For a polyline sampled on the
 * surface, each such path is the segment as drawn wherever the segment lies
 * on the surface (on a flat region, or along a straight crease); elsewhere
 * it is the geodesic between the samples, so sample curved lines densely.
 *
 * Text forms read (browser-safe: text in, points out):
 * - CSV with a header naming `x`, `y` and `z` columns, one row per point;
 *   with a `curve` column (as the curve files of this project have), one
 *   polyline per value of it, in order of appearance;
 * - OBJ: `v x y z` lines, and `l` statements giving each polyline's vertex
 *   indices (1-based, negative = relative); without any `l`, all vertices
 *   in order form one polyline.
 */
import { inputError, usageError, OrthodromeError } from '../errors.js';
import type { SurfacePoint } from '../mesh/surface-point.js';
import { pointLocator } from '../api/locate.js';
import { shortestPath, type PathOptions } from '../api/path.js';
import type { SolvableSurface } from '../api/parts.js';

/** Polylines of 3D points read from CSV or OBJ text; `file` names the file in errors (`INPUT` with the line). */
export function parsePolylines(text: string, file: string, format: 'csv' | 'obj'): [number, number, number][][] {
  return readPolylines(text, file, format).polylines;
}

/** Polylines read from a file's text, with the 1-based line each point came from (for errors naming it). */
export interface PolylineFile {
  /** The polylines, as {@link parsePolylines} returns them. */
  polylines: [number, number, number][][];
  /** lines[k][i]: the line of the file that gave point i of polyline k. */
  lines: number[][];
  /** The file's name, as given. */
  file: string;
}

/** {@link parsePolylines} with the line of every point kept, for {@link polylineSources} to name in its errors. */
export function readPolylines(text: string, file: string, format: 'csv' | 'obj'): PolylineFile {
  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  const num = (s: string | undefined, line: number): number => {
    const x = Number((s ?? '').trim());
    if ((s ?? '').trim() === '' || !Number.isFinite(x)) throw inputError(`'${(s ?? '').trim()}' is not a finite number`, `${file}:${line}`);
    return x;
  };
  const out: [number, number, number][][] = [];
  const at: number[][] = [];
  if (format === 'csv') {
    const header = (lines[0] ?? '').split(',').map((h) => h.trim().replace(/^"(.*)"$/, '$1'));
    const [xi, yi, zi, ci] = ['x', 'y', 'z', 'curve'].map((k) => header.indexOf(k)) as [number, number, number, number];
    if (xi < 0 || yi < 0 || zi < 0) throw inputError(`the header '${lines[0] ?? ''}' must name x, y and z columns`, `${file}:1`);
    const byCurve = new Map<string, { pts: [number, number, number][]; at: number[] }>();
    for (let r = 1; r < lines.length; r++) {
      if (lines[r]!.trim() === '') continue;
      const c = lines[r]!.split(',');
      const key = ci >= 0 ? (c[ci] ?? '').trim() : '';
      let list = byCurve.get(key);
      if (!list) byCurve.set(key, (list = { pts: [], at: [] }));
      list.pts.push([num(c[xi], r + 1), num(c[yi], r + 1), num(c[zi], r + 1)]);
      list.at.push(r + 1);
    }
    for (const l of byCurve.values()) { out.push(l.pts); at.push(l.at); }
  } else {
    const v: [number, number, number][] = [];
    const vAt: number[] = [];
    let any = false;
    lines.forEach((raw, i) => {
      const t = raw.trim().split(/\s+/);
      if (t[0] === 'v') { v.push([num(t[1], i + 1), num(t[2], i + 1), num(t[3], i + 1)]); vAt.push(i + 1); }
      else if (t[0] === 'l') {
        any = true;
        at.push(t.slice(1).map(() => i + 1));
        out.push(t.slice(1).map((s) => {
          const k = Number(s.split('/')[0]);
          const idx = k < 0 ? v.length + k : k - 1;
          if (!Number.isInteger(k) || k === 0 || !(idx >= 0 && idx < v.length)) throw inputError(`vertex index '${s}' does not exist`, `${file}:${i + 1}`);
          return v[idx]!;
        }));
      }
    });
    if (!any) { out.push(v); at.push(vAt); }
  }
  for (const p of out) if (p.length < 2) throw inputError('a polyline needs at least two points', file);
  if (out.length === 0) throw inputError('no polyline in the file', file);
  return { polylines: out, lines: at, file };
}

/**
 * Each polyline as a source curve on surface `s` (see the module comment):
 * points snapped to the surface, consecutive points joined by shortest
 * paths. `USAGE` when two consecutive points lie on parts of the surface
 * that do not connect.
 */
export async function polylineSources(s: SolvableSurface, polylines: [number, number, number][][] | PolylineFile, opts: PathOptions = {}): Promise<SurfacePoint[][]> {
  const locate = await pointLocator(s);
  const f = Array.isArray(polylines) ? null : polylines;
  const list = f ? f.polylines : (polylines as [number, number, number][][]);
  // where a point came from: the file and its line when known (errors name them, as every bad-input error does)
  const where = (k: number, i: number) => (f ? `${f.file}:${f.lines[k]?.[i] ?? '?'}` : `polyline ${k}`);
  return list.map((pl, k) => {
    const stops = pl.map((p, i) => {
      try {
        return locate.resolve(`p:${p[0]},${p[1]},${p[2]}`, where(k, i));
      } catch (e) {
        if (e instanceof OrthodromeError && f) throw inputError(`polyline ${k} point ${i + 1}: ${e.detail ?? e.message}`, where(k, i));
        throw e;
      }
    });
    const route = shortestPath(s, stops, opts);
    if (!Number.isFinite(route.length)) throw usageError(`polyline ${k} joins points on parts of the surface that do not connect`, f ? f.file : undefined);
    return route.path.points;
  });
}
