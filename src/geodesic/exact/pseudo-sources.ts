/**
 * Which vertices become pseudo-sources.
 *
 * A shortest path can pass through a vertex only when the total angle on
 * one side is ≥ π: that is an interior vertex of angle sum > 2π (a saddle)
 * or a boundary vertex of angle sum > π (a reflex boundary corner)
 * (Mitchell, Mount, Papadimitriou 1987; common practice in
 * window-propagation solvers). Behind such a vertex the windows leave a
 * shadow that only the vertex itself can light, so it emits new windows with
 * σ = its distance. Flat vertices (angle sum exactly 2π, or π on the
 * boundary) are excluded by a relative slack: rays through them continue on
 * both sides and meet without a gap, and emitting there would only duplicate
 * windows.
 */
import type { Topology } from '../../mesh/topology.js';

/** Relative slack on the angle-sum tests. */
const SLACK = 1e-9;

/** Writes out[v] = 1 for saddle and reflex boundary vertices, from the corner angles; returns how many. */
export function saddleFlags(t: Topology, ang: Float64Array, out: Uint8Array): number {
  const sum = new Float64Array(t.nv);
  const boundary = new Uint8Array(t.nv);
  for (let h = 0; h < ang.length; h++) {
    sum[t.tri[h]!]! += ang[h]!;
    if (t.twin[h] === -1) boundary[t.tri[h]!] = 1;
  }
  let n = 0;
  for (let v = 0; v < t.nv; v++) {
    const full = boundary[v] ? Math.PI : 2 * Math.PI;
    if (sum[v]! > full * (1 + SLACK)) { out[v] = 1; n++; }
  }
  return n;
}

/**
 * Marks the run's pseudo-sources (from its geometry, geometry.ts) and makes
 * the corner angles available to it; returns how many. Takes the parts of
 * the run state it touches (an `ExactState` has them), so this file does not
 * depend on state.ts, which depends on the geometry, which reads
 * {@link saddleFlags} here.
 */
export function markPseudoSources(s: {
  angle: Float64Array; readonly pseudo: Uint8Array; readonly geometry: { readonly angle: Float64Array; readonly saddle: Uint8Array; readonly saddles: number };
}): number {
  s.angle = s.geometry.angle;
  s.pseudo.set(s.geometry.saddle);
  return s.geometry.saddles;
}
