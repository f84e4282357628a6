/**
 * Straightest lines: walk straight on the surface from a point, for a given
 * length, on a bearing or toward a point in space. Written from K. Polthier
 * & M. Schmies, "Straightest geodesics on polyhedral surfaces", in
 * Mathematical Visualization (H.-C. Hege, K. Polthier, eds.), Springer 1998,
 * pp. 135–150: at every point of the line the surface angle on its left
 * equals the angle on its right (half the total angle θ there), so the line
 * is straight in every face, crosses every edge at equal angles, and leaves
 * a vertex of total angle θ with θ/2 on each side
 * (`straightest-walk.ts`). Unlike a shortest path, a straightest line is
 * fixed by its start and direction alone, like a bearing walked on the
 * ground.
 *
 * The initial direction (`straightest-start.ts` has the tangent planes):
 * - `heading`: a bearing in degrees, clockwise from the reference direction
 *   as seen from the side the tangent plane's normal points to (with +y as
 *   north and normals up, 90° is +x, east: a compass bearing). The
 *   reference is the projection of `reference` (default +y) onto the
 *   tangent plane; a reference within {@link REFERENCE_MIN_ANGLE}° of the
 *   normal has no trustworthy projection and is refused (`USAGE`): give another.
 *   With `plan`, the bearing is a map (compass) bearing instead: clockwise
 *   seen from above (+z) from the reference's horizontal direction, and the
 *   first step is the tangent direction straight above or below that
 *   horizontal direction (lifted onto the tangent plane along z). On
 *   sloping ground the two differ: a tangent-plane bearing of 40° on a
 *   40° slope can be about 31° on the map. `planBearing` in the result is
 *   the map bearing of the first step either way.
 * - `toward`: a 3D point; the direction is the chord from the start to it,
 *   projected onto the tangent plane (the line then walks toward the point's
 *   foot on the plane; it reaches the point itself only on a flat surface).
 *
 * The walk stops after `length` or on reaching the boundary
 * (`stoppedAtBoundary`); a start on the boundary facing off the surface
 * returns a line of length 0. The number of faces crossed is bounded
 * ({@link defaultMaxSteps}); beyond the bound the walk is refused with a
 * `LIMIT` error naming `maxSteps`.
 */
import { intrinsicFromPositions, type IntrinsicMesh } from '../metric/intrinsic.js';
import { attachedMetric } from '../metric/user/surface-metric.js';
import type { Topology } from '../mesh/topology.js';
import { checkSurfacePoint, canonicalSurfacePoint, surfacePointPosition, type SurfacePoint } from '../mesh/surface-point.js';
import { usageError, limitError, numericError } from '../errors.js';
import { walkStraightest } from './straightest-walk.js';
import { tangentNormal, walkStartOf, unit, projectOut, cross, type Vec3 } from './straightest-start.js';

/** The default reference direction of a heading: +y (north on a map grid). */
export const DEFAULT_REFERENCE: Readonly<Vec3> = [0, 1, 0];

/**
 * Smallest angle, in degrees, between the reference and the tangent plane's
 * normal: a reference closer to the normal is refused (`USAGE`). Why 10°: a
 * heading is measured from the reference's projection on the tangent plane,
 * and tilting the normal by a small δ turns that projection by up to about
 * δ·cot γ, γ the angle between reference and normal (differentiate the
 * projection r − (r·n)n). Normals of scanned or faceted surfaces wobble by a
 * degree or more from one vertex to the next, so near the normal the heading
 * would be decided by that noise: at γ = 10° the amplification is cot 10° ≈
 * 5.7 (a 1° wobble moves heading 0 by under 6°); at 1° it would be 57.
 */
export const REFERENCE_MIN_ANGLE = 10;

/** A reference whose projection on the tangent plane is shorter than this (times its length, sin {@link REFERENCE_MIN_ANGLE}) is refused: it is (nearly) normal to the surface. */
export const REFERENCE_TOLERANCE = Math.sin((REFERENCE_MIN_ANGLE * Math.PI) / 180);

/** Upper end of the default step bound (faces crossed). */
export const MAX_DEFAULT_STEPS = 10_000_000;

/** The surface to walk on: its half-edge topology and x, y, z per topology vertex (a `Surface` will do). */
export interface StraightSurface {
  /** Half-edge connectivity. */
  topology: Topology;
  /** x, y, z per topology vertex. */
  positions: Float64Array;
}

/** How to walk. Give exactly one of `heading` and `toward`. */
export interface StraightestOptions {
  /** Length to walk, in mesh units (> 0). */
  length: number;
  /** Bearing in degrees, clockwise from the reference direction seen from the normal's side. */
  heading?: number;
  /** Measure `heading` in plan view: clockwise from the reference's horizontal direction seen from +z (a map bearing). Ignored with `toward`. */
  plan?: boolean;
  /** A 3D point: the direction is the chord to it projected onto the tangent plane. */
  toward?: ArrayLike<number>;
  /** The direction of heading 0, projected onto the tangent plane (default +y). */
  reference?: ArrayLike<number>;
  /** Most faces the walk may cross (default {@link defaultMaxSteps}); more is a `LIMIT` error. */
  maxSteps?: number;
  /**
   * The edge lengths to walk by, for this topology (default: from the
   * positions, made on every call; pass one to reuse it, or a metric of
   * your own: the walk then follows it while the tangent planes and the 3D
   * points still come from the positions).
   */
  mesh?: IntrinsicMesh;
}

/** A straightest line on the surface. */
export interface StraightestLine {
  /** x, y, z of every point: the start, each edge crossing and vertex passed, the end. */
  points: Float64Array;
  /** Length walked on the surface, mesh units (the requested length unless the boundary came first). */
  length: number;
  /** The length asked for. */
  requestedLength: number;
  /** True when the walk ended on the boundary before the requested length. */
  stoppedAtBoundary: boolean;
  /** The start, canonical. */
  start: SurfacePoint;
  /** Where the walk ended. */
  end: SurfacePoint;
  /** Unit normal of the tangent plane at the start. */
  normal: Vec3;
  /** Unit initial direction, in the tangent plane at the start. */
  direction: Vec3;
  /** Bearing of `direction` in degrees in [0, 360), clockwise from the reference; undefined when the reference is normal to the surface (a `toward` walk). */
  heading: number | undefined;
  /** Map bearing of `direction` in degrees in [0, 360): its horizontal part, clockwise from the reference's horizontal part seen from +z; undefined when either is vertical. */
  planBearing: number | undefined;
  /** Faces crossed. */
  steps: number;
  /** Vertices the line passed through (where the θ/2 rule chose the way on). */
  vertexPassages: number;
}

/** Shortest positive edge per edge-length array, found once (walks from many starts on one mesh). */
const shortestEdge = new WeakMap<Float64Array, number>();

/**
 * The default bound on faces crossed: 64 + 8 × length / (shortest edge), at
 * most {@link MAX_DEFAULT_STEPS}. A straight segment crosses more faces than
 * length / (shortest edge) only near vertices of high valence and through
 * slivers; 8× leaves room for both.
 */
export function defaultMaxSteps(m: IntrinsicMesh, length: number): number {
  const L = m.edgeLength;
  let lmin = shortestEdge.get(L);
  if (lmin === undefined) {
    lmin = Infinity;
    for (let e = 0; e < L.length; e++) if (L[e]! > 0 && L[e]! < lmin) lmin = L[e]!;
    shortestEdge.set(L, lmin);
  }
  const n = 64 + Math.ceil((8 * length) / lmin);
  return Number.isFinite(n) ? Math.min(n, MAX_DEFAULT_STEPS) : MAX_DEFAULT_STEPS;
}

const vec3 = (a: ArrayLike<number> | undefined, what: string): Vec3 | undefined => {
  if (a === undefined) return undefined;
  if (a.length !== 3 || ![a[0], a[1], a[2]].every((x) => typeof x === 'number' && Number.isFinite(x))) {
    throw usageError(`${what} must be three finite numbers x, y, z`);
  }
  return [a[0]!, a[1]!, a[2]!];
};

/**
 * Walks the straightest line on `surface` from `start` (see the module
 * comment). The positions give the tangent planes and the 3D points; the
 * walk itself uses the edge lengths (`options.mesh`, default from the
 * positions).
 *
 * Throws `USAGE` for a bad start point or options, a reference normal to the
 * surface, a `toward` point on the start's normal line; `LIMIT` when the
 * walk would cross more than `maxSteps` faces; `NUMERIC` when a degenerate
 * face stops it.
 */
export function straightestLine(surface: StraightSurface, start: SurfacePoint, options: StraightestOptions): StraightestLine {
  const { topology: t, positions } = surface;
  if (positions.length !== 3 * t.nv) throw usageError(`expected ${3 * t.nv} coordinates (x, y, z per vertex), got ${positions.length}`, 'positions');
  if (options.mesh && options.mesh.topology !== t) throw usageError('the edge lengths given (mesh) are for another topology', 'mesh');
  const user = attachedMetric(surface);
  if (user) throw usageError(`a straightest line unfolds the embedding's faces (positions), so it cannot walk in the metric ${user.report.metric}; drop --metric`);
  const p = checkSurfacePoint(start, t, 'start');
  const length = options.length;
  if (!(typeof length === 'number' && Number.isFinite(length) && length > 0)) throw usageError(`length must be a positive number of mesh units, got ${length}`);
  const toward = vec3(options.toward, 'toward');
  if ((options.heading === undefined) === (toward === undefined)) throw usageError('give exactly one of heading and toward');
  if (options.heading !== undefined && !(typeof options.heading === 'number' && Number.isFinite(options.heading))) {
    throw usageError(`heading must be a finite number of degrees, got ${options.heading}`);
  }
  const refIn = vec3(options.reference, 'reference') ?? ([...DEFAULT_REFERENCE] as Vec3);
  const mesh = options.mesh ?? intrinsicFromPositions(t, positions);
  const maxSteps = options.maxSteps ?? defaultMaxSteps(mesh, length);
  if (!(Number.isInteger(maxSteps) && maxSteps >= 1)) throw usageError(`maxSteps must be a whole number ≥ 1, got ${maxSteps}`);

  const n = tangentNormal(mesh, positions, p);
  if (!n) throw usageError('the start lies on faces without area: no tangent plane there; start from a nearby point', 'start');
  const refLen = Math.hypot(...refIn);
  const refProj = projectOut(refIn, n);
  const ref = refLen > 0 && Math.hypot(...refProj) > REFERENCE_TOLERANCE * refLen ? unit(refProj) : null;
  const left = ref ? cross(n, ref) : null; // n × ref: 90° counter-clockwise of the reference
  let d: Vec3;
  if (options.heading !== undefined && !options.plan) {
    if (!ref || !left) {
      throw usageError(`the reference direction (${refIn.join(', ')}) is nearly normal to the surface at the start (${fmtAngle(refIn, n)}° from the normal, at least ${REFERENCE_MIN_ANGLE}° needed: nearer, the heading's zero would be decided by the normal's noise); give another reference`, 'reference');
    }
    const a = (options.heading * Math.PI) / 180, c = Math.cos(a), s = Math.sin(a);
    // clockwise seen from the normal's side: d = cos α · ref − sin α · (n × ref)
    d = unit([c * ref[0] - s * left[0], c * ref[1] - s * left[1], c * ref[2] - s * left[2]])!;
  } else if (options.heading !== undefined) {
    d = planDirection(options.heading, refIn, n);
  } else {
    const from = surfacePointPosition(p, t, positions, [0, 0, 0]) as number[];
    const chord: Vec3 = [toward![0] - from[0]!, toward![1] - from[1]!, toward![2] - from[2]!];
    const cl = Math.hypot(...chord), cp = projectOut(chord, n);
    const u = cl > 0 && Math.hypot(...cp) > 1e-9 * cl ? unit(cp) : null;
    if (!u) throw usageError(`the point (${toward!.join(', ')}) lies on the surface normal at the start (or is the start): it gives no direction along the surface`, 'toward');
    d = u;
  }
  const heading = ref && left ? bearing(d, ref, left) : undefined;
  const ws = walkStartOf(mesh, positions, p, n, d);
  const base = { requestedLength: length, start: p, normal: n, direction: d, heading, planBearing: planBearingOf(d, refIn) };
  if (!ws) {
    const q = surfacePointPosition(p, t, positions) as Float64Array;
    return { ...base, points: Float64Array.from(q), length: 0, stoppedAtBoundary: true, end: p, steps: 0, vertexPassages: 0 };
  }
  const r = walkStraightest(mesh, positions, ws, surfacePointPosition(p, t, positions), length, maxSteps);
  if (r.status === 'steps') {
    throw limitError(`the straightest line crossed ${maxSteps} faces after ${r.length} of ${length} mesh units, the step limit; raise maxSteps (--max-steps)`);
  }
  if (r.status === 'stuck') throw numericError(`the straightest line cannot go on through face ${r.face} (a triangle without area) after ${r.length} mesh units`);
  return {
    ...base,
    points: r.points,
    length: r.status === 'complete' ? length : r.length,
    stoppedAtBoundary: r.status === 'boundary',
    end: canonicalSurfacePoint(r.end, t),
    steps: r.steps,
    vertexPassages: r.vertexPassages,
  };
}

/** Bearing of d in degrees [0, 360), clockwise from ref (n × ref, to the left, is 270°). */
function bearing(d: Vec3, ref: Vec3, left: Vec3): number {
  const c = d[0] * ref[0] + d[1] * ref[1] + d[2] * ref[2];
  const s = -(d[0] * left[0] + d[1] * left[1] + d[2] * left[2]);
  const deg = (Math.atan2(s, c) * 180) / Math.PI;
  const b = deg < 0 ? deg + 360 : deg;
  return b >= 360 ? 0 : b;
}

/** Unit horizontal part of a reference (x, y, 0), or null when it is (nearly) vertical. */
function horizontal(r: Vec3): Vec3 | null {
  const l = Math.hypot(r[0], r[1], r[2]), h = Math.hypot(r[0], r[1]);
  return l > 0 && h > REFERENCE_TOLERANCE * l ? [r[0] / h, r[1] / h, 0] : null;
}

/**
 * The tangent direction (normal n) whose plan view has map bearing `deg`
 * from the horizontal part of `ref`: h = cos α·r − sin α·(ẑ × r), lifted
 * along z onto the plane: d ∝ h − (h·n / n_z)·ẑ.
 */
function planDirection(deg: number, ref: Vec3, n: Vec3): Vec3 {
  const r = horizontal(ref);
  if (!r) throw usageError(`the reference direction (${ref.join(', ')}) is vertical: it gives no map direction; give another reference`, 'reference');
  if (!(Math.abs(n[2]) > REFERENCE_TOLERANCE)) {
    throw usageError('the surface is vertical at the start: a map bearing gives no direction along it; measure the heading in the tangent plane (without plan, --plan)', 'start');
  }
  const a = (deg * Math.PI) / 180, c = Math.cos(a), s = Math.sin(a);
  const h: Vec3 = [c * r[0] + s * r[1], c * r[1] - s * r[0], 0]; // ẑ × r = (−r_y, r_x, 0)
  const k = (h[0] * n[0] + h[1] * n[1]) / n[2];
  return unit([h[0], h[1], -k])!;
}

/** Map bearing of d from the horizontal part of ref ({@link StraightestLine.planBearing}). */
function planBearingOf(d: Vec3, ref: Vec3): number | undefined {
  const r = horizontal(ref), dh = Math.hypot(d[0], d[1]);
  if (!r || !(dh > REFERENCE_TOLERANCE)) return undefined;
  // the horizontal frame: r and ẑ × r = (−r_y, r_x, 0), 90° counter-clockwise of r seen from +z
  return bearing([d[0], d[1], 0], r, [-r[1], r[0], 0]);
}

/** Angle in degrees between a direction and a unit normal (either side: 0–90), rounded to 0.1°. */
function fmtAngle(r: Vec3, n: Vec3): string {
  const l = Math.hypot(...r);
  const c = l > 0 ? Math.abs(r[0] * n[0] + r[1] * n[1] + r[2] * n[2]) / l : 1;
  return (Math.round((Math.acos(Math.min(1, c)) * 1800) / Math.PI) / 10).toString();
}
