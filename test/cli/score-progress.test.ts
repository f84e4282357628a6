/**
 * The progress of `score`: the bar's text on a terminal (rate, ETA, failures
 * so far, erased at the end) and one plain line per mesh otherwise.
 */
import { describe, expect, it } from 'vitest';
import { formatBar, formatDuration, ScoreProgress } from '../../cli/score/progress.js';

describe('score progress', () => {
  it('the bar: share, meshes done, rate, ETA and failures (arithmetic: 50 of 200 in 10 s is 5/s, 150 left take 30 s; a quarter of 30 columns, rounded, is 8)', () => {
    const t = formatBar({ done: 50, total: 200, pass: 45, fail: 4, error: 1 }, 10_000, 100);
    expect(t).toBe('[########----------------------] 50/200 meshes, 5.0/s, ETA 30 s, 4 failed, 1 error');
    expect(formatBar({ done: 0, total: 3, pass: 0, fail: 0, error: 0 }, 0, 100)).toMatch(/^\[-+\] 0\/3 meshes, 0\.0\/s, ETA \?, 0 failed, 0 errors$/);
    expect(formatBar({ done: 50, total: 200, pass: 45, fail: 4, error: 1 }, 10_000, 40).length).toBeLessThanOrEqual(40);
    expect([formatDuration(42), formatDuration(185), formatDuration(7800)]).toEqual(['42 s', '3 min 5 s', '2 h 10 min']);
  });

  it('a terminal gets the bar rewritten in place and erased; a pipe gets one line per mesh', () => {
    const tty: string[] = [], pipe: string[] = [];
    const a = new ScoreProgress({ isTTY: true, columns: 100, write: (s) => tty.push(s) }, 2);
    a.record('a.obj', 'pass', '');
    a.record('b.obj', 'fail', 'angles: measured 4, needs >= 10');
    a.done();
    expect(tty[0]!.startsWith('\r[')).toBe(true);
    expect(tty[tty.length - 2]).toMatch(/2\/2 meshes, .* 1 failed, 0 errors\x1b\[K$/);
    expect(tty[tty.length - 1]).toBe('\r\x1b[K');
    const b = new ScoreProgress({ isTTY: false, write: (s) => pipe.push(s) }, 2);
    b.record('a.obj', 'pass', '');
    b.record('b.obj', 'error', 'b.obj: no vertices');
    b.done();
    expect(pipe).toEqual(['score 1/2 pass a.obj\n', 'score 2/2 error b.obj: b.obj: no vertices\n']);
  });
});
