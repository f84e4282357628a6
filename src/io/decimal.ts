/**
 * Decimal number scanning on bytes, the one home for reading numbers from
 * text (the OBJ and ASCII PLY readers): no string per token, correctly
 * rounded doubles (Clinger's fast path, W. D. Clinger, "How to read floating
 * point numbers accurately", PLDI 1990, for mantissas below 2^53 and powers of
 * ten up to 10^22; `Number()` on the token otherwise).
 */

/**
 * Where {@link scanReal} stopped (`pos`) and whether the token was malformed
 * (`bad`). Each parse owns one (no module state), so scanning is re-entrant and
 * allocates nothing per number.
 */
export class ScanCursor {
  /** First byte after the token. */
  pos = 0;
  /** True when no number starts at the scanned offset or it is not followed by a delimiter. */
  bad = false;
}

/** 2^53: an integer below it is exact, and so is every partial sum of its digits. */
const EXACT_INT = 9007199254740992;

// 10^0 .. 10^22 are exact doubles: m·10^k or m/10^k with m < 2^53 and
// |k| <= 22 is then one correctly rounded operation (Clinger's fast path).
const POW10 = new Float64Array(23);
for (let i = 0, p = 1; i < 23; i++, p *= 10) POW10[i] = p;

/** True for bytes that end a token: space, tab, CR, LF, `\`, `#`, `/`. */
export function isDelimiter(c: number): boolean {
  return c === 32 || c === 9 || c === 13 || c === 10 || c === 92 || c === 35 || c === 47 || c === 11 || c === 12;
}

function lower(c: number): number {
  return c | 0x20;
}

/**
 * Reads a decimal real (`-12`, `3.25`, `.5`, `6.02e23`, `nan`, `inf`,
 * `infinity`) from `b` at `p`; the token ends at a delimiter or the end of
 * `b` (reads past the end give `undefined`, which no test matches). Sets `cur.pos` to the
 * first byte after the token and `cur.bad` when no number starts at `p`
 * or it is not followed by a delimiter. The result is the correctly rounded
 * double: a mantissa below 2^53 with a power of ten up to 10^22 takes the exact
 * fast path, anything else goes through `Number()` on the token.
 */
export function scanReal(b: Uint8Array, p: number, cur: ScanCursor): number {
  const end = b.length;
  const start = p;
  let neg = false;
  let c = b[p]!;
  if (c === 45 || c === 43) {
    neg = c === 45;
    c = b[++p]!;
  }
  // m: the digits as an integer, exact while it stays below 2^53 (rounding is
  // monotone, so a computed m < 2^53 means no partial sum was rounded: the
  // digits 9007199254740993 round to 2^53 and fail the test); frac: digits
  // after the point.
  let m = 0;
  const intStart = p;
  while (c >= 48 && c <= 57) {
    m = m * 10 + (c - 48);
    c = b[++p]!;
  }
  let digits = p - intStart, frac = 0;
  if (c === 46) {
    const fracStart = ++p;
    c = b[p]!;
    while (c >= 48 && c <= 57) {
      m = m * 10 + (c - 48);
      c = b[++p]!;
    }
    frac = p - fracStart;
    digits += frac;
  }
  if (digits === 0) {
    if (p > start + (neg || b[start] === 43 ? 1 : 0)) { cur.pos = p; cur.bad = true; return 0; }
    return scanWord(b, p, neg, cur);
  }
  let e = 0;
  if (c === 101 || c === 69) {
    c = b[++p]!;
    let eneg = false;
    if (c === 45 || c === 43) { eneg = c === 45; c = b[++p]!; }
    if (!(c >= 48 && c <= 57)) { cur.pos = p; cur.bad = true; return 0; }
    while (c >= 48 && c <= 57) {
      if (e < 100000) e = e * 10 + (c - 48);
      c = b[++p]!;
    }
    if (eneg) e = -e;
  }
  cur.pos = p;
  cur.bad = p < end && !isDelimiter(c);
  const k = e - frac;
  let v: number;
  if (m < EXACT_INT && k >= -22 && k <= 22) v = k >= 0 ? m * POW10[k]! : m / POW10[-k]!;
  else if (m === 0) v = 0;
  else v = Number(latin1(b, neg ? start + 1 : start, p));
  return neg ? -v : v;
}

/** `nan`, `inf`, `infinity` (any case) after an optional sign; otherwise bad. */
function scanWord(b: Uint8Array, p: number, neg: boolean, cur: ScanCursor): number {
  const end = b.length;
  let q = p;
  while (q < end && !isDelimiter(b[q]!)) q++;
  const n = q - p;
  cur.pos = q;
  cur.bad = false;
  if (n === 3 && lower(b[p]!) === 110 && lower(b[p + 1]!) === 97 && lower(b[p + 2]!) === 110) return NaN;
  const w = n === 3 || n === 8 ? latin1(b, p, q).toLowerCase() : '';
  if (w === 'inf' || w === 'infinity') return neg ? -Infinity : Infinity;
  cur.bad = true;
  return 0;
}

/** Bytes `b[s..e)` as a string, one char per byte (for short tokens and messages). */
export function latin1(b: Uint8Array, s: number, e: number): string {
  let out = '';
  for (let i = s; i < e; i++) out += String.fromCharCode(b[i]!);
  return out;
}

/**
 * `b` without a leading UTF-8 byte-order mark (EF BB BF), which some editors
 * write at the start of text files (Unicode Standard, section 23.8). A view,
 * not a copy; line numbers are unchanged since the mark holds no newline.
 */
export function stripBom(b: Uint8Array): Uint8Array {
  return b.length >= 3 && b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf ? b.subarray(3) : b;
}

/** True when `b` starts with a UTF-16 byte-order mark (FF FE or FE FF). */
export function hasUtf16Bom(b: Uint8Array): boolean {
  return b.length >= 2 && ((b[0] === 0xff && b[1] === 0xfe) || (b[0] === 0xfe && b[1] === 0xff));
}
