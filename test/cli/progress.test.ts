/**
 * The progress line (cli/progress.ts) with a fake terminal and a fake clock.
 * Conventions checked (common practice for terminal progress lines): nothing
 * for the first second, nothing at all when the stream is not a terminal,
 * each redraw starts with a carriage return and ends with "erase to end of
 * line" (ESC [ K, EL in ECMA-48 §8.3.41), redraws are throttled, and the line
 * is erased at the end. The CLI end to end never shows it: its stderr is a
 * pipe (test/cli/jobs.test.ts expects an empty stderr).
 */
import { describe, expect, it } from 'vitest';
import { ProgressLine, formatProgress } from '../../cli/progress.js';

function fake(isTTY: boolean, columns = 80) {
  const out: string[] = [];
  let now = 0;
  return { out, stream: { isTTY, columns, write: (s: string) => out.push(s) }, clock: { now: () => now, set: (t: number) => { now = t; } } };
}

describe('formatProgress', () => {
  it('says what runs, which set, the share in whole percent (rounded down) and the elapsed seconds', () => {
    expect(formatProgress({ label: 'exact distance', set: [2, 6], share: 0.437, elapsedMs: 12_345 })).toBe('exact distance: set 2 of 6, 43%, 12.3 s');
    expect(formatProgress({ label: 'heat: preparing', elapsedMs: 1500 })).toBe('heat: preparing: 1.5 s');
    // one set is not worth naming; a share never shows above 100% or below 0, and NaN not at all
    expect(formatProgress({ label: 'x', set: [1, 1], share: 1.2, elapsedMs: 0 })).toBe('x: 100%, 0.0 s');
    expect(formatProgress({ label: 'x', share: NaN, elapsedMs: 0 })).toBe('x: 0.0 s');
  });

  it('fits the width', () => {
    const s = formatProgress({ label: 'a'.repeat(100), elapsedMs: 0 }, 30);
    expect(s).toHaveLength(30);
    expect(s.endsWith('…')).toBe(true);
  });
});

describe('ProgressLine', () => {
  it('on a terminal: silent for the first second, then redrawn in place at most every 100 ms, erased at the end', () => {
    const f = fake(true);
    const line = new ProgressLine(f.stream, { now: f.clock.now });
    f.clock.set(999);
    line.update({ label: 'exact distance', share: 0.1 });
    expect(f.out).toEqual([]);
    f.clock.set(1000);
    line.update({ share: 0.2 });
    expect(f.out).toEqual(['\rexact distance: 20%, 1.0 s\x1b[K']);
    f.clock.set(1050); // throttled
    line.update({ share: 0.3 });
    expect(f.out).toHaveLength(1);
    f.clock.set(1100);
    line.update({ share: 0.4 });
    expect(f.out[1]).toBe('\rexact distance: 40%, 1.1 s\x1b[K');
    line.done();
    expect(f.out[2]).toBe('\r\x1b[K');
    line.done(); // erased once only
    expect(f.out).toHaveLength(3);
  });

  it('not a terminal (pipe, file): never writes, not even the erase', () => {
    const f = fake(false);
    const line = new ProgressLine(f.stream, { now: f.clock.now });
    expect(line.enabled).toBe(false);
    for (const t of [0, 2000, 5000]) { f.clock.set(t); line.update({ label: 'heat distance' }); }
    line.done();
    expect(f.out).toEqual([]);
  });

  it('a run that ends within the first second leaves nothing behind', () => {
    const f = fake(true);
    const line = new ProgressLine(f.stream, { now: f.clock.now });
    f.clock.set(500);
    line.update({ label: 'graph distance' });
    line.done();
    expect(f.out).toEqual([]);
  });

  it('keeps to the terminal width', () => {
    const f = fake(true, 24);
    const line = new ProgressLine(f.stream, { now: f.clock.now, delayMs: 0 });
    line.update({ label: 'exact distance, 3 of 12 sets done', share: 0.25 });
    const text = f.out[0]!.slice(1, -3);
    expect(text.length).toBeLessThanOrEqual(23);
  });
});
