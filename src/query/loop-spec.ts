/**
 * Boundary loops named in a source spec, beside the point specs of
 * `surface-point.ts`:
 *
 * | text form      | meaning                                                          |
 * |----------------|------------------------------------------------------------------|
 * | `loop:ID`      | boundary loop ID as `inspect` lists it (0 = the longest)          |
 * | `loop@X,Y,Z`   | the boundary loop passing nearest to the point (x, y, z) in 3D    |
 * | `loop@X,Y`     | the boundary loop passing nearest to (x, y) in plan view (map)     |
 *
 * Ids follow {@link namedBoundaryLoops}: longest loop first, equally long
 * loops by smallest file vertex index. "Nearest" is the straight-line
 * distance from the point to the loop's edges (in plan view: to their
 * projections on the x-y plane); on a tie the lower id wins.
 *
 * A selected loop becomes one or more source curves of vertices
 * ({@link loopCurves}), the same curves the `boundary` spelling gives for
 * that loop, so `loop:ID` measures exactly what `boundary` measures on a
 * mesh with one loop.
 */
import { inputError, usageError } from '../errors.js';
import type { Topology } from '../mesh/topology.js';
import { next } from '../mesh/topology.js';
import { namedBoundaryLoops, type NamedLoop } from '../mesh/boundary.js';
import { SPEC_NUMBER, specCoordinates, type SurfacePoint } from '../mesh/surface-point.js';

/** A parsed loop spec. */
export type LoopSpec =
  | { kind: 'loop-id'; id: number }
  | { kind: 'loop-near'; xyz: [number, number, number] }
  | { kind: 'loop-near-plan'; xy: [number, number] };

const NUM = SPEC_NUMBER;
const RE_ID = /^loop:(\d+)$/;
const RE_NEAR = new RegExp(`^loop@(${NUM}),(${NUM}),(${NUM})$`);
const RE_PLAN = new RegExp(`^loop@(${NUM}),(${NUM})$`);

/** True when `text` is meant as a loop spec (starts with `loop:` or `loop@`); it may still be malformed. */
export function isLoopSpec(text: string): boolean {
  return /^loop[:@]/.test(text.trim());
}

/**
 * Parses `loop:ID`, `loop@X,Y,Z` or `loop@X,Y`. Throws a `USAGE` error
 * naming the spec (and `label`, e.g. the option) when it is malformed.
 */
export function parseLoopSpec(text: string, label = 'loop'): LoopSpec {
  const s = text.trim();
  let m: RegExpExecArray | null;
  if ((m = RE_ID.exec(s))) {
    const id = Number(m[1]);
    if (!Number.isSafeInteger(id)) throw usageError(`loop id is too large in '${text}'`, label);
    return { kind: 'loop-id', id };
  }
  if ((m = RE_NEAR.exec(s))) return { kind: 'loop-near', xyz: specCoordinates(m, 3, text, label) };
  if ((m = RE_PLAN.exec(s))) return { kind: 'loop-near-plan', xy: specCoordinates(m, 2, text, label) };
  throw usageError(`cannot read loop '${text}' (expected loop:ID, loop@X,Y,Z or loop@X,Y)`, label);
}

/** Squared distance from p to the segment a–b (3D; z ignored when `plan`): the closest point is a + clamp(t)·(b − a). */
function segmentDistance2(p: ArrayLike<number>, P: Float64Array, a: number, b: number, plan: boolean): number {
  const dims = plan ? 2 : 3;
  let ab2 = 0, apab = 0;
  for (let d = 0; d < dims; d++) {
    const ab = P[3 * b + d]! - P[3 * a + d]!;
    ab2 += ab * ab;
    apab += (p[d]! - P[3 * a + d]!) * ab;
  }
  const s = ab2 > 0 ? Math.min(1, Math.max(0, apab / ab2)) : 0;
  let d2 = 0;
  for (let d = 0; d < dims; d++) {
    const q = P[3 * a + d]! + s * (P[3 * b + d]! - P[3 * a + d]!);
    d2 += (p[d]! - q) ** 2;
  }
  return d2;
}

/**
 * The loop a spec selects among `loops` (as {@link namedBoundaryLoops}
 * returns them). Throws an `INPUT` error at `file` when the mesh has no
 * boundary or the id does not exist.
 */
export function selectLoop(
  loops: readonly NamedLoop[],
  spec: LoopSpec,
  t: Topology,
  positions: Float64Array,
  text: string,
  label = 'loop',
  file?: string,
): NamedLoop {
  const where = `${label} ${text.trim()}`;
  if (loops.length === 0) throw inputError(`${where}: the mesh has no boundary loop`, file);
  if (spec.kind === 'loop-id') {
    const loop = loops[spec.id];
    if (!loop) {
      const ids = loops.length === 1 ? 'id 0' : `ids 0 to ${loops.length - 1}`;
      throw inputError(`${where}: no boundary loop ${spec.id} (the mesh has ${loops.length}: ${ids}; 'inspect' lists them)`, file);
    }
    return loop;
  }
  const plan = spec.kind === 'loop-near-plan';
  const p = plan ? spec.xy : spec.xyz;
  let best = loops[0]!, bestD = Infinity;
  for (const loop of loops) {
    let d = Infinity;
    for (const h of loop.halfedges) d = Math.min(d, segmentDistance2(p, positions, t.tri[h]!, t.tri[next(h)]!, plan));
    if (d < bestD) { bestD = d; best = loop; }
  }
  return best;
}

/**
 * A loop as source curves of vertices, each consecutive pair on a common
 * face: one closed curve (first vertex repeated at the end) on an
 * orientable surface; on a surface cut along seams, one open curve per run
 * between seam copies (together the whole loop).
 */
export function loopCurves(t: Topology, loop: NamedLoop): SurfacePoint[][] {
  const H = loop.halfedges, V = loop.vertices, n = H.length;
  if (n === 0) return [];
  // edge i runs from V[i] to the other end of H[i] (the loop may run along a half-edge backwards)
  const endOf = (i: number) => (t.tri[H[i]!] === V[i] ? t.tri[next(H[i]!)]! : t.tri[H[i]!]!);
  // start right after a break (the end of one edge is not the start of the next) when there is one
  let s = 0;
  for (let i = 0; i < n; i++) if (endOf((i + n - 1) % n) !== V[i]) { s = i; break; }
  const out: SurfacePoint[][] = [];
  let run: SurfacePoint[] = [];
  for (let k = 0; k < n; k++) {
    const i = (s + k) % n;
    if (run.length && (run[run.length - 1] as { vertex: number }).vertex !== V[i]) { out.push(run); run = []; }
    if (run.length === 0) run.push({ kind: 'vertex', vertex: V[i]! });
    run.push({ kind: 'vertex', vertex: endOf(i) });
  }
  out.push(run);
  return out;
}

/** What {@link resolveLoopSpec} needs of a surface. */
export interface LoopSurface {
  topology: Topology;
  /** x, y, z per topology vertex. */
  positions: Float64Array;
  /** `BuildReport.orientationSeams` of a non-orientable surface (glued back: not boundary). */
  seams?: Int32Array;
  /** The loops, when already computed by {@link namedBoundaryLoops} on this surface. */
  loops?: readonly NamedLoop[];
}

/**
 * Parses a loop spec and selects its loop on a surface: the loop and its
 * source curves ({@link loopCurves}). Malformed spec → `USAGE`; no boundary
 * or no such id → `INPUT` at `file` (the mesh's name).
 */
export function resolveLoopSpec(
  text: string,
  surface: LoopSurface,
  label = 'loop',
  file?: string,
): { loop: NamedLoop; curves: SurfacePoint[][] } {
  const spec = parseLoopSpec(text, label);
  const t = surface.topology;
  const loops = surface.loops ?? namedBoundaryLoops(t, surface.positions, surface.seams);
  const loop = selectLoop(loops, spec, t, surface.positions, text, label, file);
  return { loop, curves: loopCurves(t, loop) };
}
