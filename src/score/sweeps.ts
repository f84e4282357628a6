/**
 * Whole-mesh distance figures for `score`: a geodesic diameter estimate by
 * two sweeps, and a sampled heat-method error against the exact method.
 *
 * Two sweeps (the double-sweep lower bound, Magnien, Latapy & Habib,
 * "Fast computation of empirically tight bounds for the diameter of massive
 * graphs", ACM JEA 13, 2009; on a surface the distances are exact polyhedral
 * ones, from window propagation): from a start vertex s, find the farthest
 * vertex a; from a, the farthest vertex b. d(a, b) is a distance between two
 * points of the surface, so it is at most the geodesic diameter: a lower
 * bound, usually tight, never an overestimate. The start is the vertex of
 * smallest index of the component with the most faces; the sweeps stay in
 * that component.
 *
 * Heat error: for k sources spread over the same component (every ⌈n/k⌉-th of
 * its vertices by index), both fields are solved in full; the error at a
 * vertex is |heat − exact| divided by the source's exact eccentricity (its
 * largest finite distance), so the figure is scale-free: 0.01 means the heat
 * distances are within 1% of the mesh's extent from that source.
 */
import type { DistanceSolver } from '../geodesic/solver.js';
import type { Topology } from '../mesh/topology.js';
import { components } from '../mesh/components.js';

/** The two-sweep estimate: a lower bound of the geodesic diameter, and its end vertices (topology ids). */
export interface DiameterEstimate {
  lowerBound: number;
  from: number;
  to: number;
}

/** The sampled heat error (fractions of each source's exact eccentricity). */
export interface HeatError {
  samples: number;
  max: number;
  mean: number;
}

/** Vertices of the component with the most faces, by increasing index (empty for a mesh without faces). */
export function mainComponentVertices(t: Topology, seams?: Int32Array): Int32Array {
  const c = components(t, seams);
  let best = -1;
  for (let i = 0; i < c.info.length; i++) if (best < 0 || c.info[i]!.faces > c.info[best]!.faces) best = i;
  let n = 0;
  for (let v = 0; v < t.nv; v++) if (c.vertexComponent[v] === best) n++;
  const out = new Int32Array(n);
  n = 0;
  for (let v = 0; v < t.nv; v++) if (c.vertexComponent[v] === best) out[n++] = v;
  return out;
}

/** A source set of one vertex. */
const vertexSource = (v: number) => ({ points: [{ kind: 'vertex' as const, vertex: v }], curves: [] });

/** The vertex of largest finite distance (smallest index among ties), and that distance; -1 when none is finite. */
function farthest(d: Float64Array): { vertex: number; distance: number } {
  let vertex = -1, distance = -Infinity;
  for (let v = 0; v < d.length; v++) {
    const x = d[v]!;
    if (Number.isFinite(x) && x > distance) { distance = x; vertex = v; }
  }
  return { vertex, distance };
}

/** Two exact sweeps from the first vertex of `main` (see the module comment); null when `main` is empty. */
export function twoSweepDiameter(exact: DistanceSolver, main: Int32Array): DiameterEstimate | null {
  if (main.length === 0) return null;
  const s = main[0]!;
  const a = farthest(exact.solve(vertexSource(s)).field.distance);
  if (a.vertex < 0) return { lowerBound: 0, from: s, to: s };
  const b = farthest(exact.solve(vertexSource(a.vertex)).field.distance);
  return { lowerBound: Math.max(0, b.distance), from: a.vertex, to: b.vertex };
}

/** Evenly spread sample of `k` vertices of `main` (by index order). */
export function sampleVertices(main: Int32Array, k: number): number[] {
  const n = main.length, out: number[] = [];
  const m = Math.min(k, n);
  for (let i = 0; i < m; i++) out.push(main[Math.floor(((i + 0.5) * n) / m)]!);
  return out;
}

/** Heat against exact from `sources` (see the module comment); null when there is no source. */
export function heatError(heat: DistanceSolver, exact: DistanceSolver, sources: number[]): HeatError | null {
  if (sources.length === 0) return null;
  let max = 0, sum = 0, count = 0;
  for (const v of sources) {
    const set = vertexSource(v);
    const e = exact.solve(set).field.distance;
    const h = heat.solve(set).field.distance;
    const ecc = farthest(e).distance;
    if (!(ecc > 0)) continue; // a component of one point: nothing to compare
    for (let u = 0; u < e.length; u++) {
      const x = e[u]!;
      if (!Number.isFinite(x)) continue;
      const y = h[u]!;
      // heat gives a finite value wherever exact does (same component); guard all the same
      const err = Number.isFinite(y) ? Math.abs(y - x) / ecc : 1;
      if (err > max) max = err;
      sum += err;
      count++;
    }
  }
  return { samples: sources.length, max, mean: count ? sum / count : 0 };
}
