/**
 * The intrinsic mesh: connectivity plus one positive length per edge. This is
 * the interface every solver consumes; coordinates only produce the lengths and
 * map results back to 3D. A user-supplied metric produces lengths too.
 */
import type { Topology } from '../mesh/topology.js';
import { next } from '../mesh/topology.js';
import { inputError } from '../errors.js';

/** Connectivity plus edge lengths. */
export interface IntrinsicMesh {
  /** Half-edge connectivity. */
  readonly topology: Topology;
  /** Length of every edge, indexed by edge id, in mesh units. */
  readonly edgeLength: Float64Array;
}

/**
 * √(x² + y² + z²) with exactly the result of `Math.hypot(x, y, z)` in V8
 * (the largest magnitude m factored out, the squares of x/m, y/m, z/m summed
 * with Kahan's compensation, then √sum · m; ±Infinity wins over NaN), so
 * lengths stay bit for bit what they were. `Math.hypot` is a variadic
 * builtin that the optimizing compiler does not inline: each call boxes its
 * arguments and allocates, and a mesh pass makes millions of calls.
 */
export function hypot3(x: number, y: number, z: number): number {
  x = Math.abs(x);
  y = Math.abs(y);
  z = Math.abs(z);
  if (x !== x || y !== y || z !== z) return x === Infinity || y === Infinity || z === Infinity ? Infinity : NaN;
  let m = x > y ? x : y;
  if (z > m) m = z;
  if (m === Infinity || m === 0) return m;
  const a = x / m, b = y / m, c = z / m;
  // Kahan's compensated sum of a², b², c² (the compensation after the first term is 0)
  const a2 = a * a, b2 = b * b;
  const ab = a2 + b2;
  const comp = ab - a2 - b2;
  return Math.sqrt(ab + (c * c - comp)) * m;
}

/**
 * Euclidean edge lengths from vertex positions (x, y, z per topology vertex).
 * Differences are taken in float64 before squaring, so large map coordinates
 * keep their millimetres.
 */
export function edgeLengthsFromPositions(t: Topology, positions: Float64Array): Float64Array {
  const len = new Float64Array(t.ne);
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!;
    const a = 3 * t.tri[h]!, b = 3 * t.tri[next(h)]!;
    const dx = positions[b]! - positions[a]!;
    const dy = positions[b + 1]! - positions[a + 1]!;
    const dz = positions[b + 2]! - positions[a + 2]!;
    len[e] = hypot3(dx, dy, dz);
  }
  return len;
}

/** The intrinsic mesh of an embedded surface (lengths from positions). */
export function intrinsicFromPositions(t: Topology, positions: Float64Array): IntrinsicMesh {
  return { topology: t, edgeLength: edgeLengthsFromPositions(t, positions) };
}

/**
 * An intrinsic mesh from lengths given directly (for example by a user
 * metric). Validates that every length is finite and non-negative; triangles
 * that violate the triangle inequality are allowed here and treated as
 * degenerate by the metric functions, but are counted by
 * {@link triangleInequalityViolations}.
 */
export function intrinsicFromLengths(t: Topology, edgeLength: Float64Array, label = 'edge lengths'): IntrinsicMesh {
  if (edgeLength.length !== t.ne) {
    throw inputError(`expected ${t.ne} edge lengths, got ${edgeLength.length}`, label);
  }
  for (let e = 0; e < t.ne; e++) {
    const l = edgeLength[e]!;
    if (!Number.isFinite(l) || l < 0) throw inputError(`edge ${e} has invalid length ${l}`, label);
  }
  return { topology: t, edgeLength };
}

/** Number of faces whose three lengths violate the (non-strict) triangle inequality. */
export function triangleInequalityViolations(m: IntrinsicMesh): number {
  const { topology: t, edgeLength: L } = m;
  let n = 0;
  for (let f = 0; f < t.nf; f++) {
    const a = L[t.edgeOf[3 * f]!]!, b = L[t.edgeOf[3 * f + 1]!]!, c = L[t.edgeOf[3 * f + 2]!]!;
    if (a > b + c || b > a + c || c > a + b) n++;
  }
  return n;
}

/** Mean edge length (the usual length scale h of a mesh). */
export function meanEdgeLength(m: IntrinsicMesh): number {
  let s = 0;
  for (let e = 0; e < m.edgeLength.length; e++) s += m.edgeLength[e]!;
  return m.edgeLength.length ? s / m.edgeLength.length : 0;
}
