/**
 * Exit codes and error reporting shared by every command.
 *
 * 0 success · 1 a check or gate failed · 2 bad input or usage (one line on
 * stderr naming the file and location) · 3 a resource limit was reached (a
 * LIMIT error naming the limit and the option that raises it, or the runtime
 * refusing memory) · 70 internal error.
 * No stack trace is printed unless ORTHODROME_DEBUG=1.
 */
import { isOrthodromeError, OrthodromeError } from '../src/index.js';
import { toJson } from '../src/api/io.js';

export { toJson };

/** Exit status for a successful run. */
export const EXIT_OK = 0;
/** Exit status when a check or gate failed. */
export const EXIT_GATE = 1;
/** Exit status for bad input or usage. */
export const EXIT_INPUT = 2;
/** Exit status when a resource limit was reached (memory budget, input size, allocation refused). */
export const EXIT_LIMIT = 3;
/** Exit status for an internal error (a bug). */
export const EXIT_INTERNAL = 70;

/** Thrown by a command to end with exit 1 after it printed its findings. */
export class GateFailure extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'GateFailure';
  }
}

/**
 * Runtime errors that mean "not enough memory" or "too large for the
 * runtime", not a bug: V8's RangeErrors for a refused or over-long
 * ArrayBuffer, typed array, array or string, and Node's size errors for
 * files, buffers and strings. Returns a one-line description, or undefined.
 */
export function resourceFailure(e: unknown): string | undefined {
  if (!(e instanceof Error)) return undefined;
  const code = (e as { code?: unknown }).code;
  if (code === 'ERR_FS_FILE_TOO_LARGE' || code === 'ERR_BUFFER_TOO_LARGE' || code === 'ERR_STRING_TOO_LONG') {
    return `a size limit of the runtime was reached: ${firstLine(e.message)}`;
  }
  if (!(e instanceof RangeError)) return undefined;
  const m = e.message;
  if (/allocation failed|out of memory/i.test(m)) {
    return `out of memory: the system refused an allocation (${firstLine(m)}); free memory or use a smaller mesh (distance: --max-distance, or --method heat for whole fields)`;
  }
  // a negative length is a bug, not a limit
  if (/^Invalid (typed array|array buffer|array|string) length(?!: -)|^Cannot create a string longer/i.test(m)) {
    return `a size limit of the runtime was reached (${firstLine(m)}): the mesh or its output is too large for one array or string`;
  }
  return undefined;
}

function firstLine(s: string): string {
  return s.split('\n')[0]!.trim();
}

/** Maps any thrown value to an exit code and prints one line about it. */
export function reportError(e: unknown): number {
  const debug = process.env.ORTHODROME_DEBUG === '1';
  if (e instanceof GateFailure) {
    process.stderr.write(`orthodrome: ${e.message}\n`);
    return EXIT_GATE;
  }
  if (isOrthodromeError(e)) {
    process.stderr.write(`orthodrome: ${e.message.replace(/\s*\n\s*/g, ' ')}\n`);
    if (debug && e.stack) process.stderr.write(e.stack + '\n');
    return e.code === 'LIMIT' ? EXIT_LIMIT : EXIT_INPUT;
  }
  const resource = resourceFailure(e);
  if (resource) {
    process.stderr.write(`orthodrome: ${resource}\n`);
    if (debug && e instanceof Error && e.stack) process.stderr.write(e.stack + '\n');
    return EXIT_LIMIT;
  }
  const msg = e instanceof Error ? e.message : String(e);
  process.stderr.write(`orthodrome: internal error: ${msg.split('\n')[0]} (set ORTHODROME_DEBUG=1 for details)\n`);
  if (debug && e instanceof Error && e.stack) process.stderr.write(e.stack + '\n');
  return EXIT_INTERNAL;
}

/**
 * A NUMERIC or LIMIT error that names no place gets the command's mesh file
 * (its first argument, when a string) as location, so that every refusal of
 * a run names the file it was working on.
 */
function naming(e: unknown, file: unknown): unknown {
  if (typeof file !== 'string' || !isOrthodromeError(e) || e.location !== undefined || (e.code !== 'NUMERIC' && e.code !== 'LIMIT')) return e;
  const named = new OrthodromeError(e.code, e.detail, file);
  named.stack = e.stack;
  return named;
}

/** Wraps a command action: runs it and sets the exit code from its outcome. */
export function action<A extends unknown[]>(fn: (...args: A) => Promise<number | void> | number | void) {
  return async (...args: A): Promise<void> => {
    try {
      const code = await fn(...args);
      process.exitCode = typeof code === 'number' ? code : EXIT_OK;
    } catch (e) {
      process.exitCode = reportError(naming(e, args[0]));
    }
  };
}

/** Milliseconds since `t0`, rounded to 0.01 ms. */
export function since(t0: number): number {
  return Math.round((performance.now() - t0) * 100) / 100;
}

/** Formats a number for humans with `digits` significant digits. */
export function fmt(x: number, digits = 6): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (a >= 1e-4 && a < 1e9) return String(Number(x.toPrecision(digits)));
  return x.toExponential(digits - 1);
}

/**
 * Formats a coordinate exactly: the shortest decimal that reads back to the
 * same double (ECMAScript Number-to-String), so map coordinates keep their
 * millimetres (`fmt` would print a northing of 5413398.123 as 5413400).
 */
export function fmtCoord(x: number): string {
  return String(x);
}
