/**
 * JSON text of results: typed arrays become plain arrays and every
 * non-finite number (unreachable: Infinity; undefined: NaN) becomes `null`,
 * JSON having neither (RFC 8259 §6). The one JSON writer of the CLI's
 * printed results and of the facade's `.json` files.
 */

/** `JSON.stringify` with typed arrays as arrays and non-finite numbers as null; `indent` spaces (0: one line). */
export function toJson(value: unknown, indent = 2): string {
  return JSON.stringify(
    value,
    (_k, v) => {
      if (typeof v === 'number' && !Number.isFinite(v)) return null;
      if (ArrayBuffer.isView(v) && !(v instanceof DataView)) return Array.from(v as unknown as ArrayLike<number>, (x) => (Number.isFinite(x) ? x : null));
      return v;
    },
    indent,
  );
}
