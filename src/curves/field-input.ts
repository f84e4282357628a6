/**
 * Per-vertex fields from outside for isolines: a vertex property of the
 * mesh file (a PLY column such as curvature or a travel time) or a column of
 * a CSV file, mapped to the topology's vertices (a split vertex takes its
 * file vertex's value). Browser-safe: text in, values out.
 *
 * CSV layout: a header row; one row per file vertex in order, or, when a
 * column is named `vertex`, rows in any order giving each vertex's index
 * (vertices without a row are missing). The values are the named column,
 * or else the last column that is not `vertex`, `x`, `y` or `z`. An empty
 * field, `nan` or `null` marks a missing value: faces with a missing corner
 * hold no isoline (curves end there).
 */
import type { Topology } from '../mesh/topology.js';
import type { MeshData } from '../io/mesh-data.js';
import { inputError, usageError } from '../errors.js';

/** Values per file vertex → values per topology vertex. */
export function toTopologyVertices(t: Topology, perFileVertex: Float64Array): Float64Array {
  const out = new Float64Array(t.nv);
  for (let v = 0; v < t.nv; v++) out[v] = perFileVertex[t.vertexOrigin[v]!]!;
  return out;
}

/** The vertex property `name` of the mesh file, per file vertex; `USAGE` listing the properties there are when absent. */
export function vertexProperty(data: MeshData, name: string): Float64Array {
  const col = data.vertexProps.find((c) => c.name === name);
  if (!col) {
    const have = data.vertexProps.map((c) => c.name);
    throw usageError(`the mesh has no vertex property '${name}' (${have.length ? `it has ${have.join(', ')}` : 'it has none'})`, data.name);
  }
  return col.values;
}

/**
 * A field per file vertex from CSV text (see the module comment); `file`
 * names the file in errors (`INPUT` naming the line), `column` the values'
 * column, `nv` the number of file vertices.
 */
export function fieldFromCsv(text: string, file: string, nv: number, column?: string): Float64Array {
  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  while (lines.length && lines[lines.length - 1]!.trim() === '') lines.pop();
  if (lines.length === 0) throw inputError('the CSV file is empty', file);
  const header = lines[0]!.split(',').map((h) => h.trim().replace(/^"(.*)"$/, '$1'));
  const vi = header.indexOf('vertex');
  let ci: number;
  if (column !== undefined) {
    ci = header.indexOf(column);
    if (ci < 0) throw usageError(`the CSV file has no column '${column}' (it has ${header.join(', ')})`, file);
  } else {
    ci = -1;
    for (let k = header.length - 1; k >= 0; k--) if (!['vertex', 'x', 'y', 'z'].includes(header[k]!)) { ci = k; break; }
    if (ci < 0) throw inputError(`no value column in the header '${lines[0]}' (name one with FILE:COLUMN)`, `${file}:1`);
  }
  const out = new Float64Array(nv).fill(NaN);
  const rows = lines.length - 1;
  if (vi < 0 && rows !== nv) throw inputError(`${rows} rows for ${nv} mesh vertices (add a 'vertex' column to give some vertices only)`, file);
  const read = (cell: string | undefined, line: number, what: string): number => {
    const s = (cell ?? '').trim();
    if (s === '' || /^(nan|null)$/i.test(s)) return NaN;
    const x = Number(s);
    if (!Number.isFinite(x)) throw inputError(`${what} '${s}' is not a number`, `${file}:${line}`);
    return x;
  };
  for (let r = 1; r < lines.length; r++) {
    const cells = lines[r]!.split(',');
    if (cells.length !== header.length) throw inputError(`${cells.length} fields where the header has ${header.length}`, `${file}:${r + 1}`);
    const value = read(cells[ci], r + 1, 'value');
    if (vi < 0) { out[r - 1] = value; continue; }
    const v = read(cells[vi], r + 1, 'vertex index');
    if (!(Number.isInteger(v) && v >= 0 && v < nv)) throw inputError(`vertex index ${cells[vi]!.trim()} is not a vertex of the mesh (0 to ${nv - 1})`, `${file}:${r + 1}`);
    out[v] = value;
  }
  return out;
}
