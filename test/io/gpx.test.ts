/**
 * GPX 1.1 output checked structurally against the GPX 1.1 schema
 * (http://www.topografix.com/GPX/1/1/gpx.xsd, from memory): root element
 * `gpx` with version="1.1" and the GPX 1.1 namespace, children in the
 * schema's order (metadata, wpt, rte, trk), `trkpt`/`rtept`/`wpt` with
 * decimal `lat` in [−90, 90] and `lon` in [−180, 180] and an `ele` child;
 * the document is well formed (every tag closed in order, text escaped:
 * XML 1.0 §2.4). Map coordinates go to longitude/latitude through proj4,
 * checked on the central meridian of UTM zone 33 (15° E; the false easting
 * of 500 000 m: common practice).
 */
import { describe, expect, it } from 'vitest';
import { writeGpx, xmlEscape } from '../../src/io/gpx.js';
import { crsMember, parseEpsg, toWgs84 } from '../../src/travel/map-crs.js';

interface El { name: string; attrs: Record<string, string>; children: El[]; text: string }

/** A minimal XML reader for the test: elements, attributes and text; throws on a tag closed out of order. */
function parseXml(xml: string): El {
  const body = xml.replace(/^<\?xml[^?]*\?>\s*/, '');
  const root: El = { name: '#doc', attrs: {}, children: [], text: '' };
  const stack = [root];
  const re = /<(\/?)([A-Za-z_][\w:.-]*)((?:\s+[\w:.-]+="[^"]*")*)\s*(\/?)>|([^<]+)/g;
  let m: RegExpExecArray | null, pos = 0;
  while ((m = re.exec(body))) {
    if (m.index !== pos) throw new Error(`bad markup at ${pos}`);
    pos = re.lastIndex;
    if (m[5] !== undefined) {
      if (/&(?!(amp|lt|gt|quot|apos);)/.test(m[5])) throw new Error(`unescaped & in '${m[5]}'`);
      stack.at(-1)!.text += m[5];
      continue;
    }
    if (m[1]) {
      const open = stack.pop()!;
      if (open.name !== m[2]) throw new Error(`</${m[2]}> closes <${open.name}>`);
      continue;
    }
    const attrs: Record<string, string> = {};
    for (const a of m[3]!.matchAll(/([\w:.-]+)="([^"]*)"/g)) attrs[a[1]!] = a[2]!;
    const el: El = { name: m[2]!, attrs, children: [], text: '' };
    stack.at(-1)!.children.push(el);
    if (!m[4]) stack.push(el);
  }
  if (pos !== body.length || stack.length !== 1) throw new Error('unclosed element or trailing text');
  return root.children[0]!;
}

describe('GPX 1.1', () => {
  const pts = [
    { lat: 46.5123456789, lon: 14.99, ele: 812.25 },
    { lat: 46.513, lon: 15.0001, ele: 830 },
    { lat: 46.5141, lon: 15.0003, ele: 1e-7 },
  ];

  it('a track: root, namespace, order, trkpt with lat/lon/ele, names escaped', () => {
    const xml = writeGpx({ name: 'Ostrel Knoll <loop> & back', desc: '1:02:03', points: pts, waypoints: [{ ...pts[0]!, name: 'trailhead "north"' }] });
    const gpx = parseXml(xml);
    expect(gpx.name).toBe('gpx');
    expect(gpx.attrs.version).toBe('1.1');
    expect(gpx.attrs.xmlns).toBe('http://www.topografix.com/GPX/1/1');
    expect(gpx.attrs.creator).toBeTruthy();
    expect(gpx.children.map((c) => c.name)).toEqual(['metadata', 'wpt', 'trk']);
    const trkpts = gpx.children[2]!.children.find((c) => c.name === 'trkseg')!.children;
    expect(trkpts).toHaveLength(3);
    trkpts.forEach((p, i) => {
      expect(p.name).toBe('trkpt');
      expect(p.attrs.lat).toMatch(/^-?\d+(\.\d+)?$/); // xsd:decimal, no exponent
      expect(Number(p.attrs.lat)).toBeCloseTo(pts[i]!.lat, 9);
      expect(Number(p.attrs.lon)).toBeCloseTo(pts[i]!.lon, 9);
      expect(p.children[0]!.name).toBe('ele');
      expect(p.children[0]!.text).toMatch(/^-?\d+(\.\d+)?$/);
    });
    expect(xml).toContain('Ostrel Knoll &lt;loop&gt; &amp; back');
    expect(xml).toContain('trailhead &quot;north&quot;');
  });

  it('a route: rte with rtept; positions off the WGS 84 ranges are refused', () => {
    const gpx = parseXml(writeGpx({ name: 'r', points: pts }, { as: 'rte' }));
    expect(gpx.children.map((c) => c.name)).toEqual(['metadata', 'rte']);
    expect(gpx.children[1]!.children.filter((c) => c.name === 'rtept')).toHaveLength(3);
    expect(() => writeGpx({ name: 'r', points: [{ lat: 512345, lon: 5413398 }] })).toThrow(/not a WGS 84/);
    expect(xmlEscape(`a&b<c>'"`)).toBe('a&amp;b&lt;c&gt;&apos;&quot;');
  });

  it('map coordinates → WGS 84 through proj4: UTM zone 33 central meridian, EPSG parsing, unknown CRS refused', async () => {
    const f = await toWgs84({ epsg: 32633, proj: null });
    const [lon, lat] = f(500000, 0); // UTM: false easting 500 000 m on the central meridian 15° E, equator at northing 0
    expect(lon).toBeCloseTo(15, 9);
    expect(lat).toBeCloseTo(0, 9);
    expect(f(500000, 5413398)[0]).toBeCloseTo(15, 9);
    expect(parseEpsg('EPSG:32633')).toBe(32633);
    expect(() => parseEpsg('utm33')).toThrow(/EPSG/);
    await expect(toWgs84({ epsg: null, proj: null })).rejects.toThrow(/--crs/);
    expect(crsMember({ epsg: 32633, proj: null })).toMatchObject({ name: 'EPSG:32633' });
  });
});
