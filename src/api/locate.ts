/**
 * Points on a surface from their text form (`v:3`, `e:17:0.5`,
 * `f:2:0.2,0.3,0.5`, `p:X,Y,Z`, `p:X,Y`, and loop specs). Snapping `p:`
 * specs to the surface needs three.js and three-mesh-bvh: they are loaded
 * here, by a dynamic import, only when a `p:` spec is to be resolved, so a
 * bundle of the browser entry carries them in a chunk of their own (with a
 * bundler that splits code) and a run without `p:` points never loads them.
 */
import type { Topology } from '../mesh/topology.js';
import { PointResolver } from '../query/resolver.js';

export { PointResolver };
export type { Landing } from '../query/resolver.js';

/** True when a spec (or a curve of specs separated by `;`) has a `p:` point, which snaps to the surface. */
export function needsSnapping(text: string): boolean {
  return text.split(';').some((part) => part.trim().startsWith('p:'));
}

/**
 * A resolver of point specs on the surface `s` (a `Surface` will do):
 * `resolve(text, label)` gives the canonical surface point (a `USAGE` error
 * naming `label` and the spec when it is bad), `resolveAll` every copy of a
 * split vertex, `resolveCurve` a curve (specs separated by `;`),
 * `resolveLoop` a boundary loop named by a loop spec (`loop:ID`,
 * `loop@X,Y,Z`), and `landings` where each `p:` spec landed and how far it
 * moved. The snapping code is loaded when `specs` (the texts to be
 * resolved) has a `p:` spec, or when `specs` is not given; a resolver made
 * without it refuses `p:` specs.
 */
export async function pointLocator(
  s: { topology: Topology; positions: Float64Array; report?: { orientationSeams: Int32Array } },
  specs?: readonly string[],
): Promise<PointResolver> {
  const seams = s.report?.orientationSeams;
  if (specs !== undefined && !specs.some(needsSnapping)) return new PointResolver(s.topology, s.positions, seams);
  const snapping = await import('../query/resolve.js');
  return new snapping.PointResolver(s.topology, s.positions, seams);
}
