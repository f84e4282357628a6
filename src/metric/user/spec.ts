/**
 * The text of a user metric (`--metric SPEC`) → a {@link UserMetric}:
 *
 * - `tensor:XX,XY,XZ,YY,YZ,ZZ` — a symmetric 3×3 tensor g in world
 *   coordinates, the upper triangle row by row; each entry a number or an
 *   expression in x, y, z (a constant tensor when none uses them), or
 *   `tensor:FILE.json` holding six numbers, a 3×3 array or `{"tensor": …}`;
 * - `conformal:EXPR` — a scale factor λ(x, y, z) > 0: ds = λ |dx|;
 * - `form:E;F;G` — the first fundamental form E du² + 2F du dv + G dv² over the
 *   mesh's x, y taken as parameters u, v (expressions in u, v; x, y are
 *   accepted as the same values); the mesh's z is not used;
 * - `field:NAME` — per-vertex values from the file's vertex properties (see
 *   `field.ts` for the names);
 * - `lengths:FILE` — edge lengths given directly (CSV, see `lengths-file.ts`).
 *
 * Files are read through `readText`, given by the caller (the library stays
 * free of file access).
 */
import { usageError } from '../../errors.js';
import { compileExpression, splitTopLevel, type CompiledExpression } from './expression.js';

/** A parsed user metric. `label` is the spec as given, for reports. */
export type UserMetric =
  | { kind: 'tensor'; label: string; entries: CompiledExpression[] }
  | { kind: 'conformal'; label: string; factor: CompiledExpression }
  | { kind: 'form'; label: string; E: CompiledExpression; F: CompiledExpression; G: CompiledExpression }
  | { kind: 'field'; label: string; name: string }
  | { kind: 'lengths'; label: string; file: string; text: string };

/** The kinds of {@link UserMetric}. */
export const METRIC_KINDS = ['tensor', 'conformal', 'form', 'field', 'lengths'] as const;

/** Variables of `tensor` and `conformal` expressions (world coordinates). */
export const WORLD_VARIABLES = ['x', 'y', 'z'] as const;
/** Variables of `form` expressions: the parameters u, v, and x, y as their aliases. */
export const FORM_VARIABLES = ['u', 'v', 'x', 'y'] as const;

/** Options of {@link parseMetricSpec}. */
export interface ParseMetricOptions {
  /** Reads a file named in the spec (JSON tensor, lengths CSV); without it such specs are a `USAGE` error. */
  readText?: (path: string) => string;
  /** Prefix of error messages (default `--metric`). */
  label?: string;
}

/** Parses `spec` (see the module comment). Bad text is a `USAGE` error naming the column. */
export function parseMetricSpec(spec: string, opts: ParseMetricOptions = {}): UserMetric {
  const label = opts.label ?? '--metric';
  const colon = spec.indexOf(':');
  const kind = colon < 0 ? spec.trim() : spec.slice(0, colon).trim();
  const body = colon < 0 ? '' : spec.slice(colon + 1);
  if (!(METRIC_KINDS as readonly string[]).includes(kind)) {
    throw usageError(`'${spec}' is not a metric: write ${METRIC_KINDS.map((k) => `${k}:…`).join(', ')}`, label);
  }
  if (body.trim() === '') throw usageError(`${kind}: nothing after '${kind}:'`, label);
  const read = (path: string): string => {
    if (!opts.readText) throw usageError(`${kind}: cannot read files here (${path})`, label);
    return opts.readText(path);
  };
  switch (kind) {
    case 'tensor': {
      const parts = splitTopLevel(body, ',');
      if (parts.length === 1) return { kind, label: spec, entries: tensorFromJson(read(body.trim()), body.trim(), label) };
      if (parts.length !== 6) throw usageError(`tensor: six entries XX,XY,XZ,YY,YZ,ZZ expected, got ${parts.length}`, label);
      const entries = parts.map((p, i) => compileExpression(p.part, WORLD_VARIABLES, `${label} tensor entry ${i + 1}`));
      return { kind, label: spec, entries };
    }
    case 'conformal':
      return { kind, label: spec, factor: compileExpression(body, WORLD_VARIABLES, `${label} conformal`) };
    case 'form': {
      const parts = splitTopLevel(body, ';');
      if (parts.length !== 3) throw usageError(`form: three parts E;F;G expected, got ${parts.length}`, label);
      const [E, F, G] = parts.map((p, i) => compileExpression(p.part, FORM_VARIABLES, `${label} form ${'EFG'[i]}`)) as [CompiledExpression, CompiledExpression, CompiledExpression];
      return { kind, label: spec, E, F, G };
    }
    case 'field': {
      const name = body.trim();
      if (!/^[A-Za-z_][\w-]*$/.test(name)) throw usageError(`field: '${name}' is not a property name`, label);
      return { kind, label: spec, name };
    }
    default: {
      const file = body.trim();
      return { kind: 'lengths', label: spec, file, text: read(file) };
    }
  }
}

/** Six constant entries from the text of a JSON file: `[xx,xy,xz,yy,yz,zz]`, `[[…],[…],[…]]` or `{"tensor": …}`. */
function tensorFromJson(text: string, file: string, label: string): CompiledExpression[] {
  let v: unknown;
  try {
    v = JSON.parse(text);
  } catch (e) {
    throw usageError(`tensor: ${file} is not JSON (${(e as Error).message})`, label);
  }
  if (v && typeof v === 'object' && !Array.isArray(v) && 'tensor' in v) v = (v as { tensor: unknown }).tensor;
  const num = (x: unknown): x is number => typeof x === 'number' && Number.isFinite(x);
  let six: number[] | null = null;
  if (Array.isArray(v) && v.length === 6 && v.every(num)) six = v;
  else if (Array.isArray(v) && v.length === 3 && v.every((r) => Array.isArray(r) && r.length === 3 && r.every(num))) {
    const m = v as number[][];
    const tol = 1e-12 * Math.max(...m.flat().map(Math.abs));
    for (const [i, j] of [[0, 1], [0, 2], [1, 2]] as const) {
      if (Math.abs(m[i]![j]! - m[j]![i]!) > tol) throw usageError(`tensor: ${file} is not symmetric (row ${i + 1}, column ${j + 1})`, label);
    }
    six = [m[0]![0]!, m[0]![1]!, m[0]![2]!, m[1]![1]!, m[1]![2]!, m[2]![2]!];
  }
  if (!six) throw usageError(`tensor: ${file} must hold six numbers [xx,xy,xz,yy,yz,zz], a symmetric 3×3 array, or {"tensor": …}`, label);
  return six.map((c) => ({ evaluate: () => c, constant: true, text: String(c) }));
}
