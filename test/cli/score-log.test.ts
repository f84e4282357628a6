/**
 * The results log of `score` on disk: records appended whole, a torn last
 * record cut off on --resume, records with the expected settings kept (error
 * records too unless --retry-errors), others scored again, and the final
 * rewrite sorted by file.
 */
import { describe, expect, it } from 'vitest';
import { appendFileSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ResultLog, resultsText, type ScorePlan } from '../../cli/score/log.js';
import { resultColumns, type ScoreRow } from '../../src/score/index.js';

const columns = resultColumns(['health'], []);
const plan = (files: [string, string][]): ScorePlan => ({
  orthodrome: 'score-plan', version: 1, columns, settings: 'g', inputs: files.length, inputsHash: 'h', shard: { index: 0, count: 1 },
  files: files.map(([file, settings]) => ({ file, settings })),
});
const row = (file: string, settings: string, status: ScoreRow['status'] = 'pass'): ScoreRow => ({
  file, status, settings, tag: '', units: '', error: status === 'error' ? `${file}: no vertices` : '', metrics: { vertices: 8 }, landmarks: [], failed: {},
});

describe('score results log', () => {
  for (const format of ['csv', 'jsonl'] as const) {
    it(`${format}: resume keeps matching records, cuts a torn tail, re-scores stale ones; the end is sorted`, async () => {
      const out = join(mkdtempSync(join(tmpdir(), 'orthodrome-log-')), `r.${format}`);
      const p = plan([['c.obj', 's1'], ['a.obj', 's1'], ['b.obj', 's2'], ['d.obj', 's1']]);
      const first = new ResultLog(out, format, p, false, false);
      first.write(row('c.obj', 's1'));
      first.write(row('b.obj', 'old')); // made with other settings: scored again
      first.write(row('d.obj', 's1', 'error'));
      await first.close(false); // killed before the end: no rewrite
      appendFileSync(out, format === 'csv' ? 'a.obj,pass,s1,,,,' : '{"file":"a.obj","sta'); // a torn record
      const again = new ResultLog(out, format, p, true, false);
      expect([...again.kept.keys()].sort()).toEqual(['c.obj', 'd.obj']);
      expect(new ResultLog(out, format, p, true, true).kept.has('d.obj')).toBe(false); // --retry-errors
      again.write(row('a.obj', 's1'));
      again.write(row('b.obj', 's2'));
      await again.close(true);
      const whole = resultsText(columns, format, ['a.obj', 'b.obj', 'c.obj', 'd.obj'].map((f) => {
        const r = f === 'b.obj' ? row(f, 's2') : f === 'd.obj' ? row(f, 's1', 'error') : row(f, 's1');
        const one = new ResultLog(join(mkdtempSync(join(tmpdir(), 'orthodrome-log-')), `x.${format}`), format, p, false, false);
        one.write(r);
        return one.records().find((x) => x.file === f)!;
      }));
      expect(readFileSync(out, 'utf8')).toBe(whole);
    });
  }

  it('--resume refuses a file with other columns', () => {
    const out = join(mkdtempSync(join(tmpdir(), 'orthodrome-log-')), 'r.csv');
    new ResultLog(out, 'csv', plan([['a.obj', 's']]), false, false);
    const other = { ...plan([['a.obj', 's']]), columns: resultColumns(['health', 'quality'], []) };
    expect(() => new ResultLog(out, 'csv', other, true, false)).toThrow(/has other columns/);
  });
});
