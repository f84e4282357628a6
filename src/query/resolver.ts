/**
 * Turning user point specs into surface points (without the snapping code:
 * see query/resolve.ts) on a given surface, and the
 * bookkeeping for vertices that were split while building the topology.
 *
 * Split vertices (`--split-nonmanifold`: bow-ties, ends of cut edges) have
 * several topology copies of one file vertex (`Topology.vertexOrigin` maps
 * each copy back). A point at such a vertex lies on every copy: as a source
 * it seeds all of them ({@link PointResolver.copies}), and a per-vertex
 * value for the file vertex is the minimum over its copies
 * ({@link PointResolver.foldCopies}).
 */
import type { Topology } from '../mesh/topology.js';
import { checkSurfacePoint, parsePointSpec, type SurfacePoint } from '../mesh/surface-point.js';
import type { SnapResult } from './snap.js';
import { vertexCopies } from './copies.js';
import { isLoopSpec, resolveLoopSpec } from './loop-spec.js';
import { commonFaces } from '../metric/face-points.js';
import { usageError } from '../errors.js';

/** Where a `p:` spec landed: the surface point, its position and how far it moved. */
export interface Landing extends SnapResult {
  /** The spec as typed. */
  spec: string;
}

/** What snaps `p:` specs to the surface (query/snap.ts's `SurfaceLocator`, which needs three.js). */
export interface Snapper {
  /** The nearest surface point to a position in space. */
  closest(xyz: [number, number, number]): SnapResult;
  /** The highest surface point on the vertical line through (x, y); a `USAGE` error naming `text` and `label` when there is none. */
  dropVertical(xy: [number, number], text: string, label: string): SnapResult;
}

/**
 * Resolves point specs (text or parsed) on a surface. `p:` specs snap to the
 * surface through `snapper` (made on first use); without one they are an
 * error: query/resolve.ts binds the three.js snapping code, the facade's
 * `pointLocator` loads it only when it is needed.
 */
export class PointResolver {
  private locator: Snapper | null = null;
  private copyList: Map<number, number[]> | null = null;
  /** Every `p:` spec resolved so far, in order: where it landed and how far it moved. */
  readonly landings: Landing[] = [];

  /**
   * @param topology - the mesh connectivity
   * @param positions - x, y, z per topology vertex
   * @param seams - the orientation seams of a non-orientable surface (`BuildReport.orientationSeams`), for loop specs
   * @param snapper - makes the snapping of `p:` specs (absent: `p:` specs throw)
   */
  constructor(
    private readonly topology: Topology,
    private readonly positions: Float64Array,
    private readonly seams?: Int32Array,
    private readonly snapper?: (t: Topology, positions: Float64Array) => Snapper,
  ) {}

  /** True when `text` is meant as a loop spec (`loop:` or `loop@`; it may still be malformed). */
  isLoop(text: string): boolean {
    return isLoopSpec(text);
  }

  /**
   * The source curves of one boundary loop named by a loop spec (`loop:ID`,
   * `loop@X,Y,Z`, `loop@X,Y`: see query/loop-spec.ts); `label` names the
   * option and `file` the mesh in errors.
   */
  resolveLoop(text: string, label = 'loop', file?: string): SurfacePoint[][] {
    return this.resolveLoopNamed(text, label, file).curves;
  }

  /** {@link resolveLoop} with the id of the loop it picked (as `inspect` lists them), so output can say which. */
  resolveLoopNamed(text: string, label = 'loop', file?: string): { id: number; curves: SurfacePoint[][] } {
    const r = resolveLoopSpec(text, { topology: this.topology, positions: this.positions, ...(this.seams ? { seams: this.seams } : {}) }, label, file);
    return { id: r.loop.id, curves: r.curves };
  }

  /**
   * Parses and checks `text`; `label` names the option in errors (e.g.
   * `--from`). `p:X,Y,Z` is the nearest surface point in 3D; `p:X,Y` is the
   * surface point straight below or above (X, Y) along +z (the highest one
   * when the vertical line meets the surface several times; a `USAGE` error
   * naming the point when it meets none). The result is in canonical
   * spelling (`checkSurfacePoint`).
   */
  resolve(text: string, label = 'point'): SurfacePoint {
    const spec = parsePointSpec(text, label);
    if (spec.kind === 'position' || spec.kind === 'column') {
      if (!this.snapper) throw new Error(`internal: '${text}' needs snapping, which was not loaded (pass the specs to pointLocator)`);
      this.locator ??= this.snapper(this.topology, this.positions);
      const hit = spec.kind === 'position' ? this.locator.closest(spec.xyz) : this.locator.dropVertical(spec.xy, text, label);
      const point = checkSurfacePoint(hit.point, this.topology, label);
      this.landings.push({ ...hit, point, spec: text });
      return point;
    }
    return checkSurfacePoint(spec, this.topology, label);
  }

  /**
   * A curve as typed: point specs separated by `;` ({@link resolve} each),
   * at least two, each consecutive pair on a common face (a `USAGE` error
   * naming `label` and the curve otherwise).
   */
  resolveCurve(text: string, label = 'curve'): SurfacePoint[] {
    const pts = text.split(';').map((x) => x.trim()).filter(Boolean).map((x) => this.resolve(x, label));
    if (pts.length < 2) throw usageError(`a curve needs at least two points in '${text}'`, label);
    for (let i = 1; i < pts.length; i++) {
      if (commonFaces(this.topology, pts[i - 1]!, pts[i]!).length === 0) {
        throw usageError(`points ${i} and ${i + 1} of '${text}' share no face (insert the points where the curve crosses edges)`, label);
      }
    }
    return pts;
  }

  /** The topology copies of a point: every copy of a split vertex, else the point itself. */
  copies(p: SurfacePoint): SurfacePoint[] {
    if (p.kind !== 'vertex') return [p];
    const list = this.copyMap().get(this.topology.vertexOrigin[p.vertex]!);
    return list ? list.map((vertex) => ({ kind: 'vertex', vertex })) : [p];
  }

  /** {@link resolve}, then every copy of the point ({@link copies}): what a source spec seeds. */
  resolveAll(text: string, label = 'point'): SurfacePoint[] {
    return this.copies(this.resolve(text, label));
  }

  /**
   * Per-topology-vertex values with every copy of a split vertex set to the
   * minimum over its copies (the distance to the file vertex). Returns
   * `values` itself when nothing was split.
   */
  foldCopies(values: Float64Array): Float64Array {
    const map = this.copyMap();
    if (map.size === 0) return values;
    const out = values.slice();
    for (const list of map.values()) {
      let m = Infinity;
      for (const v of list) if (out[v]! < m) m = out[v]!;
      for (const v of list) out[v] = m;
    }
    return out;
  }

  /** The topology copies of every split file vertex (one list per file vertex, two or more copies each). */
  splitGroups(): number[][] {
    return [...this.copyMap().values()];
  }

  /** File vertex → its topology copies, for split vertices only. */
  private copyMap(): Map<number, number[]> {
    return (this.copyList ??= vertexCopies(this.topology));
  }
}
