/**
 * The point resolver with snapping: `p:X,Y,Z` and `p:X,Y` specs snap to the
 * surface through query/snap.ts (three.js and three-mesh-bvh). See
 * query/resolver.ts for the resolver itself.
 */
import type { Topology } from '../mesh/topology.js';
import { PointResolver as Resolver } from './resolver.js';
import { SurfaceLocator } from './snap.js';

export type { Landing, Snapper } from './resolver.js';

/** Resolves point specs on a surface; `p:` specs snap to the surface (see {@link SurfaceLocator}). */
export class PointResolver extends Resolver {
  /**
   * @param topology - the mesh connectivity
   * @param positions - x, y, z per topology vertex
   * @param seams - the orientation seams of a non-orientable surface (`BuildReport.orientationSeams`), for loop specs
   */
  constructor(topology: Topology, positions: Float64Array, seams?: Int32Array) {
    super(topology, positions, seams, (t, p) => new SurfaceLocator(t, p));
  }
}
