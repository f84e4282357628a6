/**
 * Curve files: polylines on the surface (isolines, offsets, straightest
 * lines, boundary loops) as OBJ, GeoJSON, CSV or JSON text. Browser-safe:
 * every writer returns a string; the CLI writes it atomically
 * (`io/atomic.ts`, which also gzips `.gz` targets).
 *
 * The shape shared by every curve producer is {@link Curve}. A closed curve
 * repeats its first point as its last (as a GeoJSON ring does), so drawing
 * the points in order draws the whole curve; the writers check this.
 *
 * Precision: every coordinate and figure is printed as the shortest decimal
 * that reads back to the same double (ECMAScript Number::toString, ECMA-262
 * §6.1.6.1.20), so a northing of 5413398.123456789 survives every format
 * bit for bit. Non-finite coordinates are refused (`USAGE`), never written.
 *
 * Formats:
 * - OBJ: one `v` per point and one `l` statement per curve (a closed curve
 *   ends on its first vertex's index), each curve in its own `o` object
 *   with a comment line giving its level and length.
 * - GeoJSON (RFC 7946): a FeatureCollection; each curve is a Feature with a
 *   LineString geometry (or, grouped by level, a MultiLineString), each
 *   polygon a Feature with a Polygon geometry whose rings follow the
 *   right-hand rule of RFC 7946 §3.1.6 in plan view (outer ring
 *   counter-clockwise seen from +z, holes clockwise). Positions carry z
 *   (§3.1.1). `properties` holds level, length, units, closed and any
 *   extra properties of the curve. RFC 7946 positions are longitude and
 *   latitude; mesh coordinates are written as they are (map grid
 *   coordinates stay in their grid: the file says so in `units`).
 * - CSV: one row per point: `curve,level,closed,length,point,x,y,z`.
 * - JSON: `{"units", "curves": [{"level", "closed", "length", "points": [[x, y, z], ...]}]}`.
 */
import { usageError } from '../errors.js';

/** Points of a curve: x, y, z packed in a Float64Array, or one `[x, y, z]` per point. */
export type CurvePoints = Float64Array | number[][];

/** A property value copied into GeoJSON `properties` and the JSON output. */
export type CurveProperty = string | number | boolean | null;

/**
 * A polyline on the surface, as every curve producer returns it (isolines,
 * offsets, straightest lines, boundary loops).
 */
export interface Curve {
  /** The field value along the curve (an isoline's level, an offset's distance); absent when none. */
  level?: number;
  /** True when the curve closes: then its last point repeats its first. */
  closed: boolean;
  /** Length along the polyline, in mesh units. */
  length: number;
  /** The points, in order (at least 2; a closed curve at least 4, the last equal to the first). */
  points: CurvePoints;
  /** Extra properties written beside level, length and units (GeoJSON `properties`, JSON). */
  properties?: Record<string, CurveProperty>;
}

/** A polygon on the surface seen as a map feature (a band between two levels): outer ring first, then holes. */
export interface CurvePolygon {
  /** Closed rings (last point = first): the outer boundary, then the holes. */
  rings: CurvePoints[];
  /** Properties written into GeoJSON `properties` (e.g. `levelFrom`, `levelTo`, `area`). */
  properties?: Record<string, CurveProperty>;
}

/** The curve file formats. */
export type CurveFormat = 'obj' | 'geojson' | 'csv' | 'json';

/** File extensions of {@link CurveFormat}s (each also accepted with `.gz`). */
export const CURVE_FORMATS: readonly string[] = ['.obj', '.geojson', '.csv', '.json'];

/** Options shared by the curve writers. */
export interface CurveWriteOptions {
  /** The unit of coordinates and lengths, written into the file (default `mesh units`). */
  units?: string;
  /** GeoJSON: one MultiLineString feature per level instead of one LineString per curve (length = sum). */
  groupByLevel?: boolean;
  /** OBJ: a comment for the first line. */
  comment?: string;
}

/** Number of points of a curve. */
export function curvePointCount(points: CurvePoints): number {
  return points instanceof Float64Array ? Math.floor(points.length / 3) : points.length;
}

/** Point i of a curve as `[x, y, z]`; throws `USAGE` on a non-finite or missing coordinate. */
function pointAt(points: CurvePoints, i: number, what: string): [number, number, number] {
  let x: number, y: number, z: number;
  if (points instanceof Float64Array) {
    x = points[3 * i]!; y = points[3 * i + 1]!; z = points[3 * i + 2]!;
  } else {
    const p = points[i]!;
    x = p[0]!; y = p[1]!; z = p[2]!;
  }
  if (!Number.isFinite(x) || !Number.isFinite(y) || !Number.isFinite(z)) {
    throw usageError(`cannot write ${what}: point ${i} has a non-finite or missing coordinate (${x}, ${y}, ${z})`);
  }
  return [x, y, z];
}

/** Every point of a curve, checked: at least 2 (a closed curve at least 4, its last point equal to its first). */
function checkedPoints(points: CurvePoints, closed: boolean, what: string): [number, number, number][] {
  const n = curvePointCount(points);
  const out: [number, number, number][] = [];
  for (let i = 0; i < n; i++) out.push(pointAt(points, i, what));
  if (n < 2) throw usageError(`cannot write ${what}: a curve needs at least 2 points, got ${n}`);
  if (closed) {
    const a = out[0]!, b = out[n - 1]!;
    if (n < 4 || a[0] !== b[0] || a[1] !== b[1] || a[2] !== b[2]) {
      throw usageError(`cannot write ${what}: a closed curve must repeat its first point as its last (at least 4 points), got ${n}`);
    }
  }
  return out;
}

const num = (x: number | undefined): string => (x === undefined || !Number.isFinite(x) ? '' : String(x));
const jsonNum = (x: number | undefined): number | null => (x === undefined || !Number.isFinite(x) ? null : x);

/** Properties of a curve for GeoJSON and JSON: level, length, units, closed, then its own properties. */
function curveProperties(c: Curve, units: string): Record<string, CurveProperty> {
  return { level: jsonNum(c.level), length: jsonNum(c.length), units, closed: c.closed, ...(c.properties ?? {}) };
}

/**
 * OBJ text: every point as `v x y z`, then per curve an `o curve_K` object
 * with a `# level L, length S` comment and one `l` statement (1-based
 * indices; a closed curve's last index is its first point's, not a repeated
 * vertex).
 */
export function curvesToObj(curves: readonly Curve[], opts: CurveWriteOptions = {}): string {
  const units = opts.units ?? 'mesh units';
  const L: string[] = [];
  if (opts.comment) L.push(`# ${opts.comment.replace(/[\r\n]+/g, ' ')}`);
  L.push(`# ${curves.length} curve(s), coordinates and lengths in ${units.replace(/[\r\n]+/g, ' ')}`);
  let base = 0;
  curves.forEach((c, k) => {
    const pts = checkedPoints(c.points, c.closed, `curve ${k}`);
    const n = c.closed ? pts.length - 1 : pts.length;
    L.push(`o curve_${k}`);
    L.push(`# level ${c.level === undefined ? 'none' : num(c.level)}, length ${num(c.length)}, ${c.closed ? 'closed' : 'open'}`);
    for (let i = 0; i < n; i++) L.push(`v ${pts[i]![0]} ${pts[i]![1]} ${pts[i]![2]}`);
    let l = 'l';
    for (let i = 0; i < n; i++) l += ` ${base + i + 1}`;
    if (c.closed) l += ` ${base + 1}`;
    L.push(l);
    base += n;
  });
  return L.join('\n') + '\n';
}

/** CSV text: header `curve,level,closed,length,point,x,y,z`, one row per point (a closed curve's last row repeats its first point). */
export function curvesToCsv(curves: readonly Curve[]): string {
  const L: string[] = ['curve,level,closed,length,point,x,y,z'];
  curves.forEach((c, k) => {
    const pts = checkedPoints(c.points, c.closed, `curve ${k}`);
    const head = `${k},${num(c.level)},${c.closed ? 1 : 0},${num(c.length)}`;
    pts.forEach((p, i) => L.push(`${head},${i},${p[0]},${p[1]},${p[2]}`));
  });
  return L.join('\n') + '\n';
}

/** JSON text: `{"units", "curves": [{"level", "closed", "length", "points": [[x, y, z], ...], ...properties}]}`. */
export function curvesToJson(curves: readonly Curve[], opts: CurveWriteOptions = {}): string {
  const units = opts.units ?? 'mesh units';
  const out = curves.map((c, k) => ({
    ...(c.properties ?? {}),
    level: jsonNum(c.level),
    closed: c.closed,
    length: jsonNum(c.length),
    points: checkedPoints(c.points, c.closed, `curve ${k}`),
  }));
  return JSON.stringify({ units, curves: out }) + '\n';
}

/** Twice the signed area of a ring in plan view (x, y): positive when counter-clockwise seen from +z (shoelace formula). */
function planArea2(ring: [number, number, number][]): number {
  let s = 0;
  for (let i = 0; i + 1 < ring.length; i++) s += ring[i]![0] * ring[i + 1]![1] - ring[i + 1]![0] * ring[i]![1];
  return s;
}

/**
 * GeoJSON text (RFC 7946): a FeatureCollection of the curves (LineString
 * each, or one MultiLineString per level with `groupByLevel`) followed by
 * the polygons (Polygon each; rings reordered to the right-hand rule in
 * plan view). See the module comment.
 */
export function curvesToGeoJson(curves: readonly Curve[], polygons: readonly CurvePolygon[] = [], opts: CurveWriteOptions = {}): string {
  const units = opts.units ?? 'mesh units';
  const features: unknown[] = [];
  if (opts.groupByLevel) {
    const groups = new Map<string, { level: number | undefined; lines: [number, number, number][][]; length: number; closed: boolean[] }>();
    curves.forEach((c, k) => {
      const key = c.level === undefined ? 'none' : String(c.level);
      const g = groups.get(key) ?? { level: c.level, lines: [], length: 0, closed: [] };
      g.lines.push(checkedPoints(c.points, c.closed, `curve ${k}`));
      g.length += c.length;
      g.closed.push(c.closed);
      groups.set(key, g);
    });
    for (const g of groups.values()) {
      features.push({
        type: 'Feature',
        geometry: { type: 'MultiLineString', coordinates: g.lines },
        properties: { level: jsonNum(g.level), length: jsonNum(g.length), units, curves: g.lines.length, closed: g.closed },
      });
    }
  } else {
    curves.forEach((c, k) => {
      features.push({
        type: 'Feature',
        geometry: { type: 'LineString', coordinates: checkedPoints(c.points, c.closed, `curve ${k}`) },
        properties: curveProperties(c, units),
      });
    });
  }
  polygons.forEach((p, k) => {
    if (p.rings.length === 0) throw usageError(`cannot write polygon ${k}: it has no ring`);
    const rings = p.rings.map((r, i) => {
      const pts = checkedPoints(r, true, `polygon ${k} ring ${i}`);
      const ccw = planArea2(pts) > 0;
      return (i === 0) === ccw ? pts : pts.reverse(); // outer ring counter-clockwise, holes clockwise
    });
    features.push({ type: 'Feature', geometry: { type: 'Polygon', coordinates: rings }, properties: { units, ...(p.properties ?? {}) } });
  });
  return JSON.stringify({ type: 'FeatureCollection', features }) + '\n';
}

/** The curve format of an output path by extension, ignoring a trailing `.gz` (`iso.GeoJSON.gz` → `geojson`); null when none fits. */
export function curveFormatOf(path: string): CurveFormat | null {
  const m = /\.(obj|geojson|csv|json)(?:\.gz)?$/i.exec(path);
  return m ? (m[1]!.toLowerCase() as CurveFormat) : null;
}

/** Curves (and, for GeoJSON, polygons) as text in `format`; polygons given to another format are refused (`USAGE`). */
export function writeCurves(format: CurveFormat, curves: readonly Curve[], opts: CurveWriteOptions & { polygons?: readonly CurvePolygon[] } = {}): string {
  const polygons = opts.polygons ?? [];
  if (polygons.length && format !== 'geojson') throw usageError(`polygons can be written to GeoJSON only, not ${format.toUpperCase()}`);
  switch (format) {
    case 'obj': return curvesToObj(curves, opts);
    case 'geojson': return curvesToGeoJson(curves, polygons, opts);
    case 'csv': return curvesToCsv(curves);
    case 'json': return curvesToJson(curves, opts);
    default: throw usageError(`unknown curve format '${String(format)}' (use obj, geojson, csv or json)`);
  }
}
