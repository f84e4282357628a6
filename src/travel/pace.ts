/**
 * Walking pace on slopes: how long one straight step on the ground takes,
 * given its horizontal length and its rise. Direction matters: a step's
 * rise is signed, so A→B and B→A differ.
 *
 * Models (chosen by name):
 * - `tobler` (default): Tobler's hiking function, W. Tobler, "Three
 *   presentations on geographical analysis and modeling", NCGIA Technical
 *   Report 93-1, 1993: W = 6·exp(−3.5·|dh/dx + 0.05|) km/h, where dh/dx is
 *   the rise over the horizontal run. As it is usually applied, W is the
 *   speed over the horizontal (map) distance: t = dx / W. Flat ground gives
 *   6·exp(−0.175) = 5.036 km/h; the fastest slope is a gentle descent
 *   (dh/dx = −0.05, 6 km/h).
 * - `naismith`: W. W. Naismith's rule (1892): 5 km/h over the horizontal
 *   distance plus 1 hour per 600 m of ascent, with Langmuir's corrections
 *   for descent (E. Langmuir, "Mountaincraft and Leadership", 1984, from
 *   memory): on descents between 5° and 12° subtract 10 minutes per 300 m
 *   of descent, on descents steeper than 12° add 10 minutes per 300 m;
 *   descents gentler than 5° are timed as flat. Per metre of descent that is
 *   ∓2 s; the gentle-descent subtraction never makes a step faster than
 *   0.295 s per horizontal metre (at 12°), so time stays positive.
 * - `table`: a user table of speed (km/h) against slope, linearly
 *   interpolated; a slope outside the table is impassable.
 *
 * A maximum passable slope (degrees) blocks any step steeper than it, in
 * either direction: such a step takes `Infinity`.
 *
 * Lengths are in metres (the caller scales mesh units); times in seconds.
 */
import { inputError, usageError } from '../errors.js';

/** The speed model names. */
export type PaceModelName = 'tobler' | 'naismith' | 'table';

/** The names accepted by {@link paceModel}. */
export const PACE_MODELS: readonly PaceModelName[] = ['tobler', 'naismith', 'table'];

/** Seconds per metre at 1 km/h. */
const S_PER_M_AT_1KMH = 3.6;

/** A walking-time model: the seconds of one straight step. */
export interface PaceModel {
  /** The model's name, for reports. */
  readonly name: PaceModelName;
  /** The steepest passable slope in degrees (90 when unlimited). */
  readonly maxSlopeDeg: number;
  /** Its tangent (rise over run; Infinity when unlimited). */
  readonly maxGrade: number;
  /**
   * Seconds to walk a straight step of horizontal length `dx` ≥ 0 (metres)
   * rising by `dh` (metres; negative downhill). 0 for a step of no length,
   * `Infinity` when the step is blocked (too steep, a vertical step, a slope
   * outside a table). Never NaN.
   */
  seconds(dx: number, dh: number): number;
  /** Speed on flat ground, km/h (over the horizontal distance). */
  readonly flatKmh: number;
  /**
   * A lower bound of the seconds per horizontal metre over every slope (the
   * fastest pace the model allows): a search skips a step whose bound
   * cannot improve a time, without evaluating the model.
   */
  readonly minSecondsPerMeter: number;
}

/** One row of a speed table: slope as rise over run (dh/dx) and speed in km/h. */
export interface PaceRow {
  /** Rise over horizontal run (tan of the slope angle), negative downhill. */
  grade: number;
  /** Speed over the horizontal distance, km/h (0 = impassable). */
  kmh: number;
}

/** Options of {@link paceModel}. */
export interface PaceOptions {
  /** Steepest passable slope, degrees in (0, 90]; default 90 (no limit). */
  maxSlopeDeg?: number;
  /** The table of model `table` (sorted by grade here). */
  table?: PaceRow[];
}

/**
 * Seconds of a straight step under Tobler's function, written out for the
 * search's inner loop: dx · 3.6/6 · e^{3.5·|dh/dx + 0.05|}; 0 for no step,
 * Infinity for a vertical step or one steeper than `maxGrade` (never NaN).
 */
export function toblerStepSeconds(dx: number, dh: number, maxGrade: number): number {
  if (!(dx > 0)) return dh === 0 ? 0 : Infinity;
  const g = dh / dx;
  if (Math.abs(g) > maxGrade) return Infinity;
  return dx * 0.6 * Math.exp(3.5 * Math.abs(g + 0.05)); // overflow gives Infinity (dx > 0)
}

/** Tobler's hiking function (Tobler 1993): speed in km/h at rise over run `grade`. */
export function toblerKmh(grade: number): number {
  return 6 * Math.exp(-3.5 * Math.abs(grade + 0.05));
}

/**
 * Naismith's rule with Langmuir's descent corrections (see the module
 * comment): seconds per horizontal metre at rise over run `grade`.
 */
export function naismithSecondsPerMeter(grade: number): number {
  const flat = S_PER_M_AT_1KMH / 5; // 5 km/h: 0.72 s per metre
  if (grade >= 0) return flat + 6 * grade; // 600 m per hour of ascent: 6 s per metre of rise
  const deg = (Math.atan(-grade) * 180) / Math.PI;
  if (deg < 5) return flat;
  return deg <= 12 ? flat - 2 * -grade : flat + 2 * -grade; // ∓10 min per 300 m of descent
}

/** The model `name` with its options; `USAGE` for an unknown name, a bad limit or a missing table. */
export function paceModel(name: string, opts: PaceOptions = {}): PaceModel {
  const maxSlopeDeg = opts.maxSlopeDeg ?? 90;
  if (!(maxSlopeDeg > 0 && maxSlopeDeg <= 90)) throw usageError(`the maximum slope must be in (0, 90] degrees, got ${maxSlopeDeg}`);
  // tan(90°) is finite in floating point: treat 90 as no limit
  const maxGrade = maxSlopeDeg >= 90 ? Infinity : Math.tan((maxSlopeDeg * Math.PI) / 180);
  let perMeter: (grade: number) => number;
  let flatKmh: number, minPerMeter: number;
  switch (name) {
    case 'tobler':
      perMeter = (g) => S_PER_M_AT_1KMH / toblerKmh(g);
      flatKmh = toblerKmh(0);
      minPerMeter = S_PER_M_AT_1KMH / 6; // at dh/dx = −0.05
      break;
    case 'naismith':
      perMeter = naismithSecondsPerMeter;
      flatKmh = 5;
      minPerMeter = S_PER_M_AT_1KMH / 5 - 2 * Math.tan((12 * Math.PI) / 180); // the gentle-descent rule at its steepest (12°)
      break;
    case 'table': {
      const rows = [...(opts.table ?? [])].sort((a, b) => a.grade - b.grade);
      if (rows.length < 2) throw usageError('the speed model table needs a table of at least 2 rows (slope, speed)');
      perMeter = (g) => {
        const kmh = interpolate(rows, g);
        return kmh > 0 ? S_PER_M_AT_1KMH / kmh : Infinity;
      };
      flatKmh = interpolate(rows, 0);
      const fastest = Math.max(...rows.map((r) => r.kmh)); // linear pieces peak at a row
      minPerMeter = fastest > 0 ? S_PER_M_AT_1KMH / fastest : Infinity;
      break;
    }
    default:
      throw usageError(`unknown speed model '${name}' (use ${PACE_MODELS.join(', ')})`);
  }
  const general = (dx: number, dh: number): number => {
    if (!(dx > 0)) return dh === 0 ? 0 : Infinity; // a vertical step is a cliff
    const g = dh / dx;
    if (Math.abs(g) > maxGrade) return Infinity;
    const s = dx * perMeter(g);
    return s >= 0 ? s : Infinity; // NaN (overflow) → blocked, never out
  };
  const tobler = (dx: number, dh: number): number => toblerStepSeconds(dx, dh, maxGrade);
  return { name: name as PaceModelName, maxSlopeDeg, maxGrade, flatKmh, minSecondsPerMeter: minPerMeter, seconds: name === 'tobler' ? tobler : general };
}

/** Speed at `g` by linear interpolation in `rows` (sorted); 0 outside the table. */
function interpolate(rows: PaceRow[], g: number): number {
  if (!(g >= rows[0]!.grade && g <= rows[rows.length - 1]!.grade)) return 0;
  let lo = 0, hi = rows.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (rows[mid]!.grade <= g) lo = mid;
    else hi = mid;
  }
  const a = rows[lo]!, b = rows[hi]!;
  if (b.grade === a.grade) return Math.max(a.kmh, b.kmh);
  const s = (g - a.grade) / (b.grade - a.grade);
  return a.kmh + s * (b.kmh - a.kmh);
}

/**
 * A speed table from CSV text: a header row naming the slope column
 * (`slope_deg`: degrees, `grade`: rise over run, `slope_percent`: percent)
 * and `speed_kmh`, then one row per slope (negative downhill). `INPUT`
 * naming `file` and the line for a bad row.
 */
export function parsePaceTable(text: string, file: string): PaceRow[] {
  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  const header = (lines[0] ?? '').split(',').map((s) => s.trim().toLowerCase());
  const slopeCol = header.findIndex((h) => h === 'slope_deg' || h === 'grade' || h === 'slope_percent');
  const speedCol = header.indexOf('speed_kmh');
  if (slopeCol < 0 || speedCol < 0) throw inputError("the header must name a slope column (slope_deg, grade or slope_percent) and 'speed_kmh'", `${file}:1`);
  const unit = header[slopeCol]!;
  const rows: PaceRow[] = [];
  for (let i = 1; i < lines.length; i++) {
    const line = lines[i]!.trim();
    if (line === '' || line.startsWith('#')) continue;
    const cells = line.split(',');
    const s = Number(cells[slopeCol]?.trim() || NaN), v = Number(cells[speedCol]?.trim() || NaN);
    if (!Number.isFinite(s) || !Number.isFinite(v) || v < 0) throw inputError(`expected a slope and a speed ≥ 0, got '${line}'`, `${file}:${i + 1}`);
    if (unit === 'slope_deg' && !(Math.abs(s) < 90)) throw inputError(`a slope in degrees must be in (−90, 90), got ${s}`, `${file}:${i + 1}`);
    const grade = unit === 'grade' ? s : unit === 'slope_percent' ? s / 100 : Math.tan((s * Math.PI) / 180);
    rows.push({ grade, kmh: v });
  }
  if (rows.length < 2) throw inputError(`a speed table needs at least 2 rows, got ${rows.length}`, file);
  return rows;
}

/**
 * The up direction from text: `+z` (default), `-y`, `x`, … or three numbers
 * `A,B,C` (normalised). `USAGE` naming `label` otherwise.
 */
export function parseUpAxis(text: string, label = '--up'): [number, number, number] {
  const m = /^([+-]?)([xyz])$/i.exec(text.trim());
  if (m) {
    const s = m[1] === '-' ? -1 : 1, i = 'xyz'.indexOf(m[2]!.toLowerCase());
    const u: [number, number, number] = [0, 0, 0];
    u[i] = s;
    return u;
  }
  const p = text.split(',').map((x) => (x.trim() === '' ? NaN : Number(x)));
  const n = Math.hypot(p[0] ?? NaN, p[1] ?? NaN, p[2] ?? NaN);
  if (p.length !== 3 || !(n > 0) || !Number.isFinite(n)) throw usageError(`${label} must be +x, -x, +y, -y, +z, -z or a direction A,B,C, got '${text}'`);
  return [p[0]! / n, p[1]! / n, p[2]! / n];
}
