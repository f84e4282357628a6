/**
 * Curve file writers (src/io/write-curves.ts): every format keeps float64
 * coordinates bit for bit, and each follows its format's structure.
 *
 * Outside sources:
 * - ECMA-262 Number::toString gives the shortest decimal that reads back
 *   (StringToNumber, correctly rounded) to the same double, so a text
 *   written with it parses back with `===` equality.
 * - RFC 7946 (GeoJSON): a FeatureCollection has `features`, each Feature a
 *   `geometry` and a `properties` member (§3.2, §3.3); LineString
 *   coordinates are two or more positions (§3.1.4), MultiLineString an
 *   array of those (§3.1.5); a Polygon is an array of linear rings, each
 *   closed (first position = last) with at least four positions, the
 *   exterior ring counter-clockwise and holes clockwise (§3.1.6); a
 *   position may carry a third number, the altitude (§3.1.1).
 * - Wavefront OBJ: `v x y z` vertices and `l i j k …` polylines with
 *   1-based indices (common practice; the format's own description).
 * - RFC 4180 CSV: a header line, then one record per line.
 */
import { describe, expect, it } from 'vitest';
import {
  curvesToObj, curvesToGeoJson, curvesToCsv, curvesToJson, writeCurves, curveFormatOf, type Curve,
} from '../../src/io/write-curves.js';
import { isOrthodromeError } from '../../src/errors.js';

// map-grid coordinates: metres east and north, millimetres and below must survive
const E = 612345.678901234, N = 5413398.123456789, Z = 387.0000000001;
const open: Curve = { level: 25, closed: false, length: 12.5, points: [[E, N, Z], [E + 0.001, N + 1e-9, Z], [E + 10, N - 7.5, 0.1 + 0.2]] };
const square = (d: number): number[][] => [[E, N, Z], [E + d, N, Z], [E + d, N + d, Z], [E, N + d, Z], [E, N, Z]];
const closed: Curve = { level: 50, closed: true, length: 4, points: Float64Array.from(square(1).flat()), properties: { source: 'loop:1' } };

/** The x, y, z triples of a curve's points. */
const triples = (c: Curve): number[][] => (c.points instanceof Float64Array ? Array.from({ length: c.points.length / 3 }, (_, i) => Array.from(c.points.slice(3 * i, 3 * i + 3) as Float64Array)) : c.points);

function usage(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    if (isOrthodromeError(e) && e.code === 'USAGE') return e.message;
    throw e;
  }
  throw new Error('did not throw');
}

describe('curve writers keep float64 coordinates', () => {
  it('the sample northing is not representable in fewer than 16 significant digits (the check can fail)', () => {
    expect(Number(N.toPrecision(15))).not.toBe(N);
    expect(Number(N.toPrecision(9))).toBe(5413398.12);
  });

  it('OBJ: v lines parse back ===; one l per curve; a closed curve ends on its first index, no repeated vertex', () => {
    const text = curvesToObj([open, closed]);
    const lines = text.trim().split('\n');
    const v = lines.filter((l) => l.startsWith('v ')).map((l) => l.slice(2).split(' ').map(Number));
    expect(v).toEqual([...triples(open), ...triples(closed).slice(0, 4)]);
    expect(v[0]![1]).toBe(N);
    const l = lines.filter((x) => x.startsWith('l '));
    expect(l).toEqual(['l 1 2 3', 'l 4 5 6 7 4']);
    expect(lines.filter((x) => x.startsWith('o '))).toEqual(['o curve_0', 'o curve_1']);
    expect(text).toContain('# level 25, length 12.5, open');
  });

  it('CSV: header and one row per point; coordinates parse back ===', () => {
    const rows = curvesToCsv([open, closed]).trim().split('\n');
    expect(rows[0]).toBe('curve,level,closed,length,point,x,y,z');
    expect(rows.length).toBe(1 + 3 + 5);
    const cells = rows.slice(1).map((r) => r.split(','));
    expect(cells.map((c) => c.slice(5).map(Number))).toEqual([...triples(open), ...triples(closed)]);
    expect(cells[3]!.slice(0, 5)).toEqual(['1', '50', '1', '4', '0']);
    expect(Number(cells[0]![6])).toBe(N);
  });

  it('JSON: {units, curves: [{level, closed, length, points}]}; coordinates parse back ===', () => {
    const j = JSON.parse(curvesToJson([open, closed], { units: 'm' }));
    expect(j.units).toBe('m');
    expect(j.curves.map((c: Curve) => [c.level, c.closed, c.length])).toEqual([[25, false, 12.5], [50, true, 4]]);
    expect(j.curves[0].points).toEqual(triples(open));
    expect(j.curves[1].points).toEqual(triples(closed));
    expect(j.curves[1].source).toBe('loop:1');
    expect(j.curves[0].points[0][1]).toBe(N);
  });

  it('GeoJSON: FeatureCollection of LineStrings with z and properties {level, length, units}; coordinates ===', () => {
    const g = JSON.parse(curvesToGeoJson([open, closed], [], { units: 'm' }));
    expect(g.type).toBe('FeatureCollection');
    expect(g.features.length).toBe(2);
    for (const f of g.features) {
      expect(f.type).toBe('Feature');
      expect(f.geometry.type).toBe('LineString');
      expect(f.geometry.coordinates.length).toBeGreaterThanOrEqual(2);
      for (const p of f.geometry.coordinates) expect(p.length).toBe(3);
    }
    expect(g.features[0].properties).toEqual({ level: 25, length: 12.5, units: 'm', closed: false });
    expect(g.features[1].properties).toEqual({ level: 50, length: 4, units: 'm', closed: true, source: 'loop:1' });
    expect(g.features[0].geometry.coordinates).toEqual(triples(open));
    expect(g.features[1].geometry.coordinates[0]).toEqual(g.features[1].geometry.coordinates[4]);
    expect(g.features[0].geometry.coordinates[0][1]).toBe(N);
  });

  it('GeoJSON grouped by level: one MultiLineString per level, length the sum', () => {
    const second: Curve = { level: 25, closed: false, length: 2.25, points: [[0, 0, 0], [1, 0, 0]] };
    const g = JSON.parse(curvesToGeoJson([open, closed, second], [], { groupByLevel: true }));
    expect(g.features.map((f: { geometry: { type: string } }) => f.geometry.type)).toEqual(['MultiLineString', 'MultiLineString']);
    expect(g.features[0].properties).toMatchObject({ level: 25, length: 14.75, units: 'mesh units', curves: 2 });
    expect(g.features[0].geometry.coordinates).toEqual([triples(open), triples(second)]);
  });

  it('GeoJSON polygons: rings closed, exterior counter-clockwise and holes clockwise in plan (RFC 7946 §3.1.6), whatever the input order', () => {
    const cw = square(10).reverse(); // a clockwise exterior given
    const hole = [[E + 2, N + 2, Z], [E + 4, N + 2, Z], [E + 4, N + 4, Z], [E + 2, N + 4, Z], [E + 2, N + 2, Z]]; // counter-clockwise given
    const g = JSON.parse(curvesToGeoJson([], [{ rings: [cw, hole], properties: { levelFrom: 0, levelTo: 25, area: 96 } }], { units: 'm' }));
    const f = g.features[0];
    expect(f.geometry.type).toBe('Polygon');
    expect(f.properties).toEqual({ units: 'm', levelFrom: 0, levelTo: 25, area: 96 });
    // shoelace signed area, relative to the first point (keeps the check exact at map coordinates)
    const signed = (ring: number[][]) => {
      let s = 0;
      const x0 = ring[0]![0]!, y0 = ring[0]![1]!;
      for (let i = 0; i + 1 < ring.length; i++) s += (ring[i]![0]! - x0) * (ring[i + 1]![1]! - y0) - (ring[i + 1]![0]! - x0) * (ring[i]![1]! - y0);
      return s / 2;
    };
    const [outer, inner] = f.geometry.coordinates as number[][][];
    expect(signed(outer!)).toBeGreaterThan(0);
    expect(signed(inner!)).toBeLessThan(0);
    for (const r of [outer!, inner!]) {
      expect(r.length).toBeGreaterThanOrEqual(4);
      expect(r[0]).toEqual(r[r.length - 1]);
    }
    expect(outer!.some((p) => p[1] === N)).toBe(true);
  });
});

describe('curve writers refuse what they cannot write faithfully', () => {
  it('a non-finite coordinate, a closed curve without its closing point, a one-point curve: USAGE, nothing written', () => {
    const nan: Curve = { closed: false, length: 1, points: [[0, 0, 0], [NaN, 0, 0]] };
    expect(usage(() => curvesToCsv([nan]))).toMatch(/curve 0: point 1 has a non-finite/);
    expect(usage(() => curvesToObj([{ closed: true, length: 3, points: square(1).slice(0, 4) }]))).toMatch(/repeat its first point/);
    expect(usage(() => curvesToJson([{ closed: false, length: 0, points: [[1, 2, 3]] }]))).toMatch(/at least 2 points/);
    expect(usage(() => writeCurves('csv', [], { polygons: [{ rings: [square(1)] }] }))).toMatch(/GeoJSON only/);
  });
  it('a non-finite level or length becomes null (JSON) or an empty field (CSV), never NaN', () => {
    const c: Curve = { level: NaN, closed: false, length: Infinity, points: [[0, 0, 0], [1, 0, 0]] };
    expect(JSON.parse(curvesToJson([c])).curves[0]).toMatchObject({ level: null, length: null });
    expect(curvesToCsv([c]).split('\n')[1]).toBe('0,,0,,0,0,0,0');
    expect(curvesToGeoJson([c])).not.toMatch(/NaN|Infinity/);
  });
  it('format by extension, .gz ignored', () => {
    expect(['a.obj', 'b.GeoJSON', 'c.csv.gz', 'd.json', 'e.ply', 'f'].map(curveFormatOf)).toEqual(['obj', 'geojson', 'csv', 'json', null, null]);
  });
});
