/**
 * `lengths:FILE`: edge lengths given directly, as CSV text with one edge a
 * row: `A,B,LENGTH` — the file's vertex indices (from 0, as `v:INDEX`) of
 * the edge's ends, in either order, and its length in mesh units. A first
 * row that is not numeric is a header; empty rows and rows starting with
 * `#` are skipped. Every edge of the mesh must be given once (a repeat with
 * the same length is accepted); a pair that is not an edge of the mesh, a
 * length that is not a finite number > 0, or an edge left out is an `INPUT`
 * error naming the file and the line.
 */
import { inputError } from '../../errors.js';
import type { Topology } from '../../mesh/topology.js';
import { next } from '../../mesh/topology.js';

/** One length per topology edge from the CSV `text` of `file` (see the module comment). */
export function lengthsFromCsv(t: Topology, text: string, file: string): Float64Array {
  // edges by their file-vertex pair; a split file vertex has several topology copies, whose edges all get the length
  const key = (a: number, b: number) => (a < b ? `${a},${b}` : `${b},${a}`);
  const edgesOf = new Map<string, number[]>();
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!;
    const k = key(t.vertexOrigin[t.tri[h]!]!, t.vertexOrigin[t.tri[next(h)]!]!);
    const list = edgesOf.get(k);
    if (list) list.push(e); else edgesOf.set(k, [e]);
  }
  const len = new Float64Array(t.ne).fill(NaN);
  const lines = text.split(/\r?\n/);
  let sawData = false;
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i]!.trim();
    if (line === '' || line.startsWith('#')) continue;
    const at = `${file}:${i + 1}`;
    const cells = line.split(/\s*[,;\t]\s*|\s+/);
    const nums = cells.map((c) => (c.trim() === '' ? NaN : Number(c)));
    if (!sawData && nums.some((x) => Number.isNaN(x))) {
      sawData = true; // a header row
      continue;
    }
    sawData = true;
    if (cells.length !== 3) throw inputError(`expected A,B,LENGTH (3 fields), got ${cells.length}`, at);
    const [a, b, l] = nums as [number, number, number];
    if (!Number.isInteger(a) || !Number.isInteger(b) || a < 0 || b < 0) throw inputError(`vertex indices must be whole numbers ≥ 0, got '${cells[0]}', '${cells[1]}'`, at);
    if (!(l > 0) || !Number.isFinite(l)) throw inputError(`length must be a finite number > 0, got '${cells[2]}'`, at);
    const edges = edgesOf.get(key(a, b));
    if (!edges) throw inputError(`vertices ${a} and ${b} are not joined by an edge of the mesh`, at);
    for (const e of edges) {
      if (!Number.isNaN(len[e]!) && len[e] !== l) throw inputError(`edge ${a}–${b} given twice with different lengths (${len[e]} and ${l})`, at);
      len[e] = l;
    }
  }
  for (let e = 0; e < t.ne; e++) {
    if (Number.isNaN(len[e]!)) {
      const h = t.edgeHalfedge[e]!;
      let missing = 0;
      for (let f = 0; f < t.ne; f++) if (Number.isNaN(len[f]!)) missing++;
      throw inputError(`no length for the edge between vertices ${t.vertexOrigin[t.tri[h]!]} and ${t.vertexOrigin[t.tri[next(h)]!]} (${missing} of ${t.ne} edges missing)`, file);
    }
  }
  return len;
}
