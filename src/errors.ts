/**
 * Typed errors raised at the public boundary of the library.
 *
 * Numerical kernels never throw mid-loop; they return a status, `Infinity` for
 * unreachable, or a defined empty result. Only validating entry points throw,
 * and always one of these, so the CLI can map them to exit codes:
 *
 * | code      | meaning                                   | CLI exit |
 * |-----------|-------------------------------------------|----------|
 * | `INPUT`   | a file or value the user gave is invalid  | 2        |
 * | `USAGE`   | options or arguments do not fit           | 2        |
 * | `NUMERIC` | a numerical method met a case it rejects  | 2        |
 * | `LIMIT`   | a resource limit (memory budget, input    | 3        |
 * |           | size) was reached; the message names the  |          |
 * |           | limit and the option that raises it       |          |
 *
 * A resource limit is not bad input: the same file may succeed with a larger
 * budget, so `LIMIT` has its own exit code. The CLI maps allocation failures
 * of the runtime (a refused `ArrayBuffer`, an over-long array or string) to
 * exit 3 as well (cli/run.ts).
 */

/** Machine-readable class of an {@link OrthodromeError}. */
export type ErrorCode = 'INPUT' | 'USAGE' | 'NUMERIC' | 'LIMIT';

/**
 * An error with a code and an optional location (for example `hill.obj:12`,
 * `part.ply: vertex 7`, `face 31`). `message` already includes the location, so
 * printing `err.message` on one line is enough for a user.
 */
export class OrthodromeError extends Error {
  /** The class of the error. */
  readonly code: ErrorCode;
  /** Where the problem is (file:line, element index, face id), if known. */
  readonly location: string | undefined;
  /** The message without the location prefix. */
  readonly detail: string;

  /**
   * @param code - class of the error
   * @param detail - one-line description, without location
   * @param location - optional location prefix
   */
  constructor(code: ErrorCode, detail: string, location?: string) {
    super(location ? `${location}: ${detail}` : detail);
    this.name = 'OrthodromeError';
    this.code = code;
    this.detail = detail;
    this.location = location;
  }
}

/** Shorthand for an `INPUT` error at a location. */
export function inputError(detail: string, location?: string): OrthodromeError {
  return new OrthodromeError('INPUT', detail, location);
}

/** Shorthand for a `USAGE` error. */
export function usageError(detail: string, location?: string): OrthodromeError {
  return new OrthodromeError('USAGE', detail, location);
}

/** Shorthand for a `NUMERIC` error. */
export function numericError(detail: string, location?: string): OrthodromeError {
  return new OrthodromeError('NUMERIC', detail, location);
}

/**
 * Shorthand for a `LIMIT` error. The detail should name the limit, its value
 * and the option that raises it (for example "the memory budget of 512 MiB
 * … raise memoryBudget (--memory-budget)").
 */
export function limitError(detail: string, location?: string): OrthodromeError {
  return new OrthodromeError('LIMIT', detail, location);
}

/** A byte count for limit messages: `1 GiB`, `512 MiB`, `1.5 KiB`, `900 bytes` (powers of 1024). */
export function formatBytes(n: number): string {
  if (!Number.isFinite(n)) return String(n);
  const units = ['bytes', 'KiB', 'MiB', 'GiB', 'TiB'];
  let u = 0, x = n;
  while (x >= 1024 && u < units.length - 1) { x /= 1024; u++; }
  return u === 0 ? `${Math.round(n)} bytes` : `${Number(x.toPrecision(4))} ${units[u]}`;
}

/** True when `e` is an {@link OrthodromeError}. */
export function isOrthodromeError(e: unknown): e is OrthodromeError {
  return e instanceof OrthodromeError;
}
