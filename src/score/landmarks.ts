/**
 * Landmark pairs of a mesh and their geodesic distances against nominal
 * values, measured with the exact method (window propagation), so a
 * deviation is the part's, not the method's.
 *
 * Text form (a manifest cell; entries separated by `;`):
 *
 *     [NAME=]FROM>TO=NOMINAL[±TOL]
 *
 * FROM and TO are point specs (`v:3`, `e:17:0.5`, `f:2:0.2,0.3,0.5`,
 * `p:X,Y,Z`, `p:X,Y`), NOMINAL the expected geodesic distance in mesh units,
 * TOL (also written `+-TOL`) the pair's own tolerance, which takes the place
 * of a rules file's landmark tolerance for this pair. Unnamed pairs are
 * called L1, L2, … by position. Example:
 * `diag=v:0>v:6=1.41421356±0.001; v:0>v:7=1.7320508`.
 */
import { usageError } from '../errors.js';
import type { Surface } from '../mesh/surface.js';
import type { DistanceSolver } from '../geodesic/solver.js';

/** One landmark pair as given. */
export interface LandmarkSpec {
  name: string;
  from: string;
  to: string;
  /** Nominal geodesic distance, mesh units. */
  nominal: number;
  /** The pair's own tolerance, mesh units. */
  tolerance?: number;
}

/** One landmark pair measured. */
export interface LandmarkResult extends LandmarkSpec {
  /** Exact geodesic distance, mesh units; null when TO cannot be reached from FROM (another component). */
  measured: number | null;
  /** measured − nominal; null when unreachable. */
  deviation: number | null;
  /** |deviation| / nominal; null when unreachable, or when the nominal is 0 and the deviation is not. */
  relDeviation: number | null;
}

const NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i;
const NAME = /^[A-Za-z_][\w.-]*$/;

function num(text: string, what: string, entry: string, where: string): number {
  const t = text.trim();
  const x = Number(t);
  if (!NUMBER.test(t) || !Number.isFinite(x) || x < 0) throw usageError(`landmark '${entry}': ${what} '${t}' is not a non-negative number`, where);
  return x;
}

/**
 * Parses a landmark cell (see the module comment); `where` locates it in
 * errors (`USAGE`, e.g. `parts.csv:4`). An empty cell is no landmark.
 */
export function parseLandmarks(text: string, where: string): LandmarkSpec[] {
  const out: LandmarkSpec[] = [];
  const entries = text.split(';').map((e) => e.trim()).filter((e) => e.length > 0);
  for (const [i, entry] of entries.entries()) {
    const parts = entry.split('=');
    if (parts.length < 2 || parts.length > 3) throw usageError(`landmark '${entry}': expected [NAME=]FROM>TO=NOMINAL[±TOL]`, where);
    const name = parts.length === 3 ? parts[0]!.trim() : `L${i + 1}`;
    if (!NAME.test(name)) throw usageError(`landmark '${entry}': name '${name}' must be a letter or _ followed by letters, digits, _ . -`, where);
    const pair = parts[parts.length - 2]!.split('>');
    if (pair.length !== 2 || !pair[0]!.trim() || !pair[1]!.trim()) throw usageError(`landmark '${entry}': expected FROM>TO (two point specs)`, where);
    const [nomText, tolText] = parts[parts.length - 1]!.split(/±|\+-/);
    const spec: LandmarkSpec = { name, from: pair[0]!.trim(), to: pair[1]!.trim(), nominal: num(nomText!, 'nominal', entry, where) };
    if (tolText !== undefined) spec.tolerance = num(tolText, 'tolerance', entry, where);
    if (out.some((x) => x.name === name)) throw usageError(`landmark '${entry}': the name '${name}' is used twice`, where);
    out.push(spec);
  }
  return out;
}

/** The text form of landmark specs (parses back to the same specs). */
export function formatLandmarks(specs: LandmarkSpec[]): string {
  return specs.map((l) => `${l.name}=${l.from}>${l.to}=${l.nominal}${l.tolerance !== undefined ? `±${l.tolerance}` : ''}`).join('; ');
}

/**
 * Measures every pair on `s` with the exact method: one solve per distinct
 * FROM, stopping once its TO points are settled. `exact` is a prepared exact
 * solver of `s` (made when absent). A bad point spec is a `USAGE` error
 * naming the landmark.
 */
export async function measureLandmarks(s: Surface, specs: LandmarkSpec[], exact?: DistanceSolver, memoryBudget?: number): Promise<LandmarkResult[]> {
  if (specs.length === 0) return [];
  // loaded on first use: a score run without landmark pairs never loads the point locator or the solvers
  const loc = await (await import('../api/locate.js')).pointLocator(s);
  const solver = exact ?? (await import('../api/distance.js')).prepareDistances(s, 'exact', memoryBudget !== undefined ? { memoryBudget } : {});
  const points = specs.map((l) => ({ from: loc.resolve(l.from, `landmark ${l.name} (from)`), to: loc.resolve(l.to, `landmark ${l.name} (to)`) }));
  const byFrom = new Map<string, number[]>();
  for (let i = 0; i < specs.length; i++) {
    const k = JSON.stringify(points[i]!.from);
    byFrom.set(k, [...(byFrom.get(k) ?? []), i]);
  }
  const measured = new Array<number>(specs.length);
  for (const idx of byFrom.values()) {
    const from = points[idx[0]!]!.from;
    const r = solver.solve({ points: [from], curves: [] }, { targets: idx.map((i) => points[i]!.to), fieldNeeded: false });
    for (const i of idx) measured[i] = r.at(points[i]!.to);
  }
  return specs.map((l, i) => {
    const d = measured[i]!;
    if (!Number.isFinite(d)) return { ...l, measured: null, deviation: null, relDeviation: null };
    const dev = d - l.nominal;
    const rel = l.nominal > 0 ? Math.abs(dev) / l.nominal : dev === 0 ? 0 : null;
    return { ...l, measured: d, deviation: dev, relDeviation: rel };
  });
}

/** The largest |deviation| and relative deviation over `r` (null when a pair is unreachable or there is none). */
export function landmarkExtremes(r: LandmarkResult[]): { maxAbs: number | null; maxRel: number | null } {
  if (r.length === 0) return { maxAbs: null, maxRel: null };
  let maxAbs: number | null = 0, maxRel: number | null = 0;
  for (const l of r) {
    maxAbs = l.deviation === null || maxAbs === null ? null : Math.max(maxAbs, Math.abs(l.deviation));
    maxRel = l.relDeviation === null || maxRel === null ? null : Math.max(maxRel, l.relDeviation);
  }
  return { maxAbs, maxRel };
}
