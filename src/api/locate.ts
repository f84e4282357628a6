/**
 * Points on a surface from their text form (`v:3`, `e:17:0.5`,
 * `f:2:0.2,0.3,0.5`, `p:X,Y,Z`, `p:X,Y`). Snapping `p:` specs to the surface
 * needs three.js and three-mesh-bvh: they are loaded here, on first use,
 * by a dynamic import, so a bundle of the browser entry that never locates
 * points does not carry them (a bundler that splits code puts them in their
 * own chunk).
 */
import type { Topology } from '../mesh/topology.js';
import type { PointResolver } from '../query/resolve.js';

export type { PointResolver };
export type { Landing } from '../query/resolve.js';

/**
 * A resolver of point specs on the surface of `topology` and `positions`
 * (a `Surface` has both): `resolve(text, label)` gives the canonical
 * surface point (a `USAGE` error naming `label` and the spec when it is
 * bad), `resolveAll` every copy of a split vertex, `resolveCurve` a curve
 * (specs separated by `;`), `resolveLoop` a boundary loop named by a loop
 * spec (`loop:ID`, `loop@X,Y,Z`), and `landings` where each `p:` spec
 * landed and how far it moved.
 */
export async function pointLocator(s: { topology: Topology; positions: Float64Array; report?: { orientationSeams: Int32Array } }): Promise<PointResolver> {
  const { PointResolver } = await import('../query/resolve.js');
  return new PointResolver(s.topology, s.positions, s.report?.orientationSeams);
}
