/**
 * Result rows written and read back (CSV per RFC 4180, JSON Lines), a torn
 * last record left out, and the manifest format.
 */
import { describe, expect, it } from 'vitest';
import { resultColumns, encodeRow, csvHeader, readResults, csvRecords, parseManifest, parseRules, type ScoreRow } from '../../src/score/index.js';

const rules = await parseRules(JSON.stringify({ rules: [{ name: 'angles', metric: 'minAngleDeg', op: '>=', value: 10 }] }), 'r.json');
const columns = resultColumns(['health', 'landmarks'], rules);
const row = (file: string, over: Partial<ScoreRow> = {}): ScoreRow => ({
  file, status: 'fail', settings: 'abc123', tag: 'batch, "7"', units: 'mm', error: '',
  metrics: { genus: null, orientable: true, minAngleDeg: 4.25, triangles: 12, landmarkCount: 1 },
  landmarks: [{ name: 'a', from: 'v:0', to: 'v:1', nominal: 1, measured: 1.5, deviation: 0.5, relDeviation: 0.5 }],
  failed: { angles: 'measured 4.25, needs >= 10' }, ...over,
});

describe('result files', () => {
  it('columns: fixed ones, the metrics of the groups, landmarks, one per gate', () => {
    expect(columns.slice(0, 6)).toEqual(['file', 'status', 'settings', 'tag', 'units', 'error']);
    expect(columns.slice(-2)).toEqual(['landmarks', 'gate:angles']);
    expect(columns).toContain('genus');
    expect(columns).not.toContain('aspectRatioP50'); // quality group not selected
  });

  for (const format of ['csv', 'jsonl'] as const) {
    it(`${format}: records read back with their values; a torn last record is left out`, () => {
      const a = row('dir/a "quoted", name.obj'), b = row('b.obj', { status: 'error', error: 'b.obj: no vertices', metrics: {}, landmarks: [], failed: {} });
      const whole = (format === 'csv' ? csvHeader(columns) : '') + encodeRow(a, columns, format) + encodeRow(b, columns, format);
      const torn = whole + encodeRow(row('c.obj'), columns, format).slice(0, 20);
      const r = readResults(torn, format, 'out');
      expect(r.completeLength).toBe(whole.length);
      expect(r.rows.map((x) => [x.file, x.status, x.settings])).toEqual([[a.file, 'fail', 'abc123'], ['b.obj', 'error', 'abc123']]);
      expect(r.rows[0]!.values).toMatchObject({ genus: null, orientable: true, minAngleDeg: 4.25, tag: 'batch, "7"', 'gate:angles': 'measured 4.25, needs >= 10' });
      expect(r.rows[1]!.values['gate:angles']).toBeNull();
      expect(r.columns).toEqual(columns);
      expect(r.rows.map((x) => x.raw).join('')).toBe(whole.slice(format === 'csv' ? csvHeader(columns).length : 0));
    });
  }

  it('CSV records: quotes, doubled quotes, commas and line breaks inside fields (RFC 4180 §2)', () => {
    const recs = csvRecords('a,"b ""c"", d","e\nf"\r\nx,,\n');
    expect(recs.map((r) => r.fields)).toEqual([['a', 'b "c", d', 'e\nf'], ['x', '', '']]);
  });
});

describe('manifest', () => {
  it('reads path, landmarks, units and tag in any order; refuses unknown columns and bad landmarks with the line', () => {
    const m = parseManifest('tag,path,landmarks,units\nt1,a.obj,"v:0>v:1=1; d=v:0>v:2=2±0.1",mm\n\n,b.ply,,\n', 'm.csv');
    expect(m.map((e) => [e.path, e.landmarks.length, e.units, e.tag, e.where])).toEqual([['a.obj', 2, 'mm', 't1', 'm.csv:2'], ['b.ply', 0, '', '', 'm.csv:4']]);
    expect(() => parseManifest('path,landmark\na.obj,x\n', 'm.csv')).toThrow(/m\.csv:1: unknown manifest column 'landmark'/);
    expect(() => parseManifest('path,landmarks\na.obj,v:0>v:1\n', 'm.csv')).toThrow(/m\.csv:2/);
    expect(() => parseManifest('landmarks\nx\n', 'm.csv')).toThrow(/no 'path' column/);
  });
});
