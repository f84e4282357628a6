/**
 * Exit codes of the CLI (cli/run.ts): the table is this project's own
 * contract (README "Exit codes"); the runtime error messages matched are
 * V8's and Node's own, produced here by really triggering them (no recalled
 * strings), so a change of wording in a new Node fails this test.
 */
import { afterEach, describe, expect, it, vi } from 'vitest';
import { EXIT_GATE, EXIT_INPUT, EXIT_INTERNAL, EXIT_LIMIT, GateFailure, reportError, resourceFailure } from '../../cli/run.js';
import { inputError, limitError, numericError, usageError } from '../../src/errors.js';

function caught(fn: () => unknown): unknown {
  try {
    fn();
  } catch (e) {
    return e;
  }
  throw new Error('expected a throw');
}

let lines: string[] = [];
afterEach(() => {
  vi.restoreAllMocks();
  lines = [];
});
function report(e: unknown): number {
  vi.spyOn(process.stderr, 'write').mockImplementation((chunk: string | Uint8Array) => {
    lines.push(String(chunk));
    return true;
  });
  const code = reportError(e);
  vi.restoreAllMocks();
  return code;
}

describe('exit codes', () => {
  it('LIMIT has its own code 3, distinct from bad input (2), gates (1) and bugs (70)', () => {
    expect(new Set([EXIT_GATE, EXIT_INPUT, EXIT_LIMIT, EXIT_INTERNAL]).size).toBe(4);
    expect(report(limitError('the memory budget of 1 MiB was reached; raise memoryBudget (--memory-budget)'))).toBe(3);
    expect(lines.join('')).toBe('orthodrome: the memory budget of 1 MiB was reached; raise memoryBudget (--memory-budget)\n');
    expect(report(inputError('bad index', 'a.obj:3'))).toBe(2);
    expect(report(usageError('bad option'))).toBe(2);
    expect(report(numericError('NaN'))).toBe(2);
    expect(report(new GateFailure('1 of 2 requirements failed'))).toBe(1);
    expect(report(new Error('boom'))).toBe(70);
  });

  it('runtime allocation failures map to exit 3 with one line and no stack', () => {
    const errors = [
      caught(() => new ArrayBuffer(2 ** 50)), // "Array buffer allocation failed" (1 PiB: beyond a 47-bit address space)
      caught(() => new Float64Array(2 ** 34)), // "Invalid typed array length: …"
      caught(() => new ArrayBuffer(2 ** 53)), // "Invalid array buffer length"
      caught(() => new Array(2 ** 32)), // "Invalid array length"
      caught(() => 'x'.repeat(2 ** 30)), // "Invalid string length"
    ];
    for (const e of errors) {
      expect(e).toBeInstanceOf(RangeError);
      expect(resourceFailure(e)).toBeTypeOf('string');
      lines = [];
      expect(report(e)).toBe(3);
      const text = lines.join('');
      expect(text.split('\n').filter(Boolean)).toHaveLength(1);
      expect(text).not.toMatch(/\bat \w+ \(/);
    }
  });

  it('a negative length and other RangeErrors are bugs (70), not limits', () => {
    const neg = caught(() => new Float64Array(-1));
    expect(resourceFailure(neg)).toBeUndefined();
    expect(report(neg)).toBe(70);
    const prec = caught(() => (1).toFixed(500));
    expect(report(prec)).toBe(70);
  });
});
