/**
 * Files of results, as bytes or text (the caller stores them: Node's
 * `writeFileAtomic` in the Node entry, a download or upload in a browser).
 *
 * Per-vertex columns are per topology vertex; they are mapped back to the
 * file's vertices (a split vertex reports its first copy) so indices match
 * the input file. A path is written as an OBJ polyline or a CSV table.
 */
import type { Surface } from '../mesh/surface.js';
import { writePly } from '../io/write-ply.js';
import { writeObjPolyline } from '../io/write-obj.js';
import { toCsv, writeVertexCsv } from '../io/csv.js';
import { colorize } from '../io/colormap.js';
import { toJson } from '../io/json.js';
import type { SurfaceRoute } from './path.js';
import { attachedMetric } from '../metric/user/surface-metric.js';

/** A named per-vertex column with its unit. */
export interface VertexColumn {
  /** Column name (PLY property, CSV header, JSON key). */
  name: string;
  /** Unit, written in the PLY comment and the JSON `units`. */
  unit: string;
  /** One value per topology vertex. */
  values: Float64Array;
  /** Integer flag columns are written as uint8 in PLY. */
  flag?: boolean;
  /**
   * Value written in PLY for a non-finite entry (PLY has no null). CSV writes
   * an empty field and JSON writes null instead. Default 0.
   */
  plyFill?: number;
}

/** Options of {@link encodeVertexColumns}. */
export interface VertexFileOptions {
  /** PLY: ascii instead of binary. */
  plyAscii?: boolean;
  /** PLY: the header comment (default: the columns and their units, and which one colours the mesh). */
  comment?: string;
  /** PLY: the column that colours the vertices (default the first). */
  colorBy?: string;
}

/** Maps per-topology-vertex values to per-input-vertex values (NaN where the input vertex has no face). */
export function toInputVertices(s: Surface, values: Float64Array): Float64Array {
  const n = s.data.positions.length / 3;
  const out = new Float64Array(n).fill(NaN);
  const o = s.topology.vertexOrigin;
  for (let v = s.topology.nv - 1; v >= 0; v--) out[o[v]!] = values[v]!;
  return out;
}

/**
 * A file of per-vertex columns: `ply` (the mesh with the columns, the
 * file's own vertex properties and colours from one column), `csv`
 * (vertex,x,y,z,columns…) or `json` ({ vertices, units, column: values }).
 */
export function encodeVertexColumns(s: Surface, columns: VertexColumn[], format: 'ply' | 'csv' | 'json', opts: VertexFileOptions = {}): Uint8Array | string {
  const cols = columns.map((c) => ({ ...c, values: toInputVertices(s, c.values) }));
  const P = s.data.positions;
  const n = P.length / 3;
  const user = attachedMetric(s)?.report.metric; // lengths measured in a user metric say so
  if (format === 'ply') {
    const vertexProps = cols.map((c) => ({
      name: c.name,
      type: c.flag ? ('uint8' as const) : ('float64' as const),
      values: c.values.map((x) => (Number.isFinite(x) ? x : (c.plyFill ?? 0))),
    }));
    // the file's own vertex properties (e.g. a scanner's quality) are kept, unless a new column has the name
    const names = new Set(cols.map((c) => c.name));
    const kept = s.data.vertexProps.filter((c) => !names.has(c.name) && !['red', 'green', 'blue', 'alpha'].includes(c.name));
    const colorCol = cols.find((c) => c.name === opts.colorBy) ?? cols[0];
    const colors = colorCol ? colorize(colorCol.values) : undefined;
    return writePly(
      { positions: P, faceOffsets: s.data.faceOffsets, faceIndices: s.data.faceIndices, vertexProps: [...kept, ...vertexProps], faceProps: s.data.faceProps },
      {
        format: opts.plyAscii ? 'ascii' : 'binary',
        ...(colors ? { colors } : {}),
        comment: (opts.comment ?? `orthodrome: ${cols.map((c) => `${c.name} [${c.unit}]`).join(', ')}; colours from ${colorCol?.name ?? 'none'}`) + (user ? `; metric ${user}` : ''),
      },
    );
  }
  if (format === 'csv') {
    const x = new Float64Array(n), y = new Float64Array(n), z = new Float64Array(n), id = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      id[i] = i;
      x[i] = P[3 * i]!;
      y[i] = P[3 * i + 1]!;
      z[i] = P[3 * i + 2]!;
    }
    return (user ? `# metric: ${user}\n` : '') + writeVertexCsv([
      { name: 'vertex', values: id },
      { name: 'x', values: x },
      { name: 'y', values: y },
      { name: 'z', values: z },
      ...cols.map((c) => ({ name: c.name, values: c.values })),
    ]);
  }
  const obj: Record<string, unknown> = { vertices: n, ...(user ? { metric: user } : {}), units: Object.fromEntries(cols.map((c) => [c.name, c.unit])) };
  for (const c of cols) obj[c.name] = c.values;
  return toJson(obj, 0) + '\n';
}

/**
 * A file of a path: `obj` (an OBJ polyline named `name`) or `csv`
 * (x,y,z, cumulative length, a face under each segment).
 */
export function encodeRoute(route: SurfaceRoute, format: 'obj' | 'csv', name = 'shortest_path'): Uint8Array | string {
  if (format === 'obj') return writeObjPolyline(route.polyline, name);
  const xyz = route.polyline, rows: number[][] = [];
  for (let i = 0; i < xyz.length / 3; i++) rows.push([xyz[3 * i]!, xyz[3 * i + 1]!, xyz[3 * i + 2]!, route.cumulative[i]!, route.faces[i]!]);
  return toCsv(['x', 'y', 'z', 'length', 'face'], rows);
}
