/**
 * Turning user point specs into surface points on a given surface.
 */
import type { Topology } from '../mesh/topology.js';
import { checkSurfacePoint, parsePointSpec, type SurfacePoint } from './surface-point.js';
import { SurfaceLocator } from './snap.js';

/** Resolves point specs (text or parsed) on a surface; `p:` specs snap to the nearest surface point. */
export class PointResolver {
  private locator: SurfaceLocator | null = null;
  constructor(
    private readonly topology: Topology,
    private readonly positions: Float64Array,
  ) {}

  /** Parses and checks `text`; `label` names the option in errors (e.g. `--from`). */
  resolve(text: string, label = 'point'): SurfacePoint {
    const spec = parsePointSpec(text, label);
    if (spec.kind === 'position') {
      this.locator ??= new SurfaceLocator(this.topology, this.positions);
      return this.locator.closest(spec.xyz).point;
    }
    return checkSurfacePoint(spec, this.topology, label);
  }
}
