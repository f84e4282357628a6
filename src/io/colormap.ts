/**
 * Scalar field to 8-bit sRGB colours on a fixed ramp of our own design:
 * dark indigo, blue, teal, green, lime, pale yellow. Lightness rises steadily
 * along it (CIE L* of the stops ≈ 10, 26, 42, 56, 70, 82, 93, with linear
 * interpolation in sRGB between them), so order in the data reads as order
 * in brightness, also in grey-scale print. Non-finite values get a neutral
 * grey that no ramp colour has (every stop is clearly chromatic).
 */

/** Ramp stops, r, g, b per stop, evenly spaced over t ∈ [0, 1]. */
export const RAMP_STOPS: readonly number[] = [
  36, 18, 64,
  52, 52, 128,
  30, 104, 146,
  24, 150, 136,
  96, 190, 96,
  190, 214, 72,
  250, 236, 150,
];

/** Colour given to NaN and ±Infinity. */
export const NO_VALUE_RGB: readonly [number, number, number] = [128, 128, 128];

/** Options of {@link colorize}. */
export interface ColorizeOptions {
  /** Value mapped to the start of the ramp (default: smallest finite value). */
  min?: number;
  /** Value mapped to the end of the ramp (default: largest finite value). */
  max?: number;
  /** Output buffer of 3·n bytes to fill instead of allocating. */
  out?: Uint8Array;
}

/** Writes the ramp colour at `t` (clamped to [0, 1]; NaN → grey) to `out[o..o+3)`. */
export function rampColor(t: number, out: Uint8Array, o = 0): void {
  if (Number.isNaN(t)) {
    out[o] = NO_VALUE_RGB[0]; out[o + 1] = NO_VALUE_RGB[1]; out[o + 2] = NO_VALUE_RGB[2];
    return;
  }
  const segs = RAMP_STOPS.length / 3 - 1;
  const x = Math.min(1, Math.max(0, t)) * segs;
  const s = Math.min(segs - 1, Math.floor(x));
  const u = x - s;
  for (let ch = 0; ch < 3; ch++) {
    const a = RAMP_STOPS[3 * s + ch]!, b = RAMP_STOPS[3 * s + 3 + ch]!;
    out[o + ch] = Math.round(a + (b - a) * u);
  }
}

/**
 * Colours one value per vertex: r, g, b bytes per value. Values are mapped
 * linearly from [min, max] to the ramp and clamped; when max = min every
 * finite value gets the start of the ramp. NaN and ±Infinity get
 * {@link NO_VALUE_RGB}.
 */
export function colorize(values: ArrayLike<number>, opts: ColorizeOptions = {}): Uint8Array {
  const n = values.length;
  let lo = opts.min, hi = opts.max;
  if (lo === undefined || hi === undefined) {
    let a = Infinity, b = -Infinity;
    for (let i = 0; i < n; i++) {
      const v = values[i]!;
      if (Number.isFinite(v)) { if (v < a) a = v; if (v > b) b = v; }
    }
    lo ??= a;
    hi ??= b;
  }
  const out = opts.out ?? new Uint8Array(3 * n);
  const span = hi - lo;
  const scale = Number.isFinite(span) && span > 0 ? 1 / span : 0;
  for (let i = 0; i < n; i++) {
    const v = values[i]!;
    rampColor(Number.isFinite(v) ? (v - lo) * scale : NaN, out, 3 * i);
  }
  return out;
}
