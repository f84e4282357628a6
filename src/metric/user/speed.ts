/**
 * The integrand of an edge's length under a metric g: along the straight
 * edge γ(t) = a + t (b − a), t ∈ [0, 1], the speed √(γ′ᵀ g(γ(t)) γ′)
 * (the length of a curve in a Riemannian metric, e.g. do Carmo, Differential
 * Geometry of Curves and Surfaces, 1976, §4-2 — from memory).
 *
 * Positive definiteness is checked at every point evaluated, by the pivots
 * of the Cholesky factorisation (all positive exactly when the matrix is
 * positive definite; Golub & Van Loan, Matrix Computations, §4.2 — from
 * memory). A violation is an `INPUT` error naming the point and the edge.
 */
import { inputError } from '../../errors.js';
import type { UserMetric } from './spec.js';

/** A metric's speed along the edges of one surface. */
export interface EdgeSpeed {
  /** True when the speed is constant along every edge (a single evaluation is exact). */
  readonly constant: boolean;
  /** Makes edge `va` → `vb` (topology vertices) current. */
  edge(va: number, vb: number): void;
  /** The speed at parameter t ∈ [0, 1] of the current edge (mesh units per unit of t). */
  at(t: number): number;
}

/** What a speed needs of a surface. */
export interface MetricSurface {
  /** x, y, z per topology vertex. */
  positions: Float64Array;
  /** The file vertex of each topology vertex (split vertices share one). */
  vertexOrigin: Uint32Array | Int32Array;
  /** Name for messages (the file). */
  name: string;
}

/**
 * True when the symmetric matrix (upper triangle `g`: 2×2 as [a, b, c] or
 * 3×3 as [xx, xy, xz, yy, yz, zz]) is positive definite, by Cholesky pivots
 * with a relative floor of 1e-14 of the largest diagonal entry.
 */
export function isPositiveDefinite(g: ArrayLike<number>): boolean {
  if (g.length === 3) {
    const a = g[0]!, b = g[1]!, c = g[2]!;
    const floor = 1e-14 * Math.max(Math.abs(a), Math.abs(c));
    const d2 = c - (b * b) / a;
    return a > floor && d2 > floor && Number.isFinite(a + b + c);
  }
  const [xx, xy, xz, yy, yz, zz] = [g[0]!, g[1]!, g[2]!, g[3]!, g[4]!, g[5]!];
  if (!Number.isFinite(xx + xy + xz + yy + yz + zz)) return false;
  const floor = 1e-14 * Math.max(Math.abs(xx), Math.abs(yy), Math.abs(zz));
  if (!(xx > floor)) return false;
  const l10 = xy / xx, l20 = xz / xx;
  const d2 = yy - l10 * xy;
  if (!(d2 > floor)) return false;
  const l21 = (yz - l20 * xy) / d2;
  const d3 = zz - l20 * xz - l21 * l21 * d2;
  return d3 > floor;
}

/** A coordinate for messages: up to 6 significant digits. */
const c6 = (x: number) => String(Number(x.toPrecision(6)));

/** The `INPUT` error for a metric that is not positive definite at a point of an edge. */
export function notPositiveDefinite(s: MetricSurface, label: string, p: ArrayLike<number>, va: number, vb: number, what: string): Error {
  const at = Array.from(p, c6).join(', ');
  return inputError(
    `the metric ${label} is not positive definite at (${at}) on the edge between vertices ${s.vertexOrigin[va]} and ${s.vertexOrigin[vb]}: ${what}`,
    s.name,
  );
}

/** The speed of a `tensor`, `conformal` or `form` metric on `s` (a `field` or `lengths` metric has its own module). */
export function expressionSpeed(s: MetricSurface, m: Exclude<UserMetric, { kind: 'field' | 'lengths' }>): EdgeSpeed {
  const P = s.positions;
  let va = 0, vb = 0, dLength = 0;
  const a = new Float64Array(3), d = new Float64Array(3), p = new Float64Array(3);
  const vars = new Float64Array(4);
  const setEdge = (u: number, w: number): void => {
    va = u;
    vb = w;
    for (let k = 0; k < 3; k++) {
      a[k] = P[3 * u + k]!;
      d[k] = P[3 * w + k]! - a[k]!;
    }
    dLength = Math.sqrt(d[0]! * d[0]! + d[1]! * d[1]! + d[2]! * d[2]!);
  };
  const point = (t: number): void => {
    for (let k = 0; k < 3; k++) p[k] = a[k]! + t * d[k]!;
  };
  if (m.kind === 'conformal') {
    const f = m.factor.evaluate;
    return {
      constant: m.factor.constant,
      edge: setEdge,
      at(t) {
        point(t);
        const lambda = f(p);
        if (!(lambda > 0 && Number.isFinite(lambda))) throw notPositiveDefinite(s, m.label, p, va, vb, `the factor is ${lambda}`);
        return lambda * dLength;
      },
    };
  }
  if (m.kind === 'form') {
    const E = m.E.evaluate, F = m.F.evaluate, G = m.G.evaluate;
    const g = new Float64Array(3);
    return {
      constant: m.E.constant && m.F.constant && m.G.constant,
      edge: setEdge,
      at(t) {
        point(t);
        vars[0] = vars[2] = p[0]!;
        vars[1] = vars[3] = p[1]!;
        g[0] = E(vars);
        g[1] = F(vars);
        g[2] = G(vars);
        if (!isPositiveDefinite(g)) throw notPositiveDefinite(s, m.label, [p[0]!, p[1]!], va, vb, `E = ${g[0]}, F = ${g[1]}, G = ${g[2]}`);
        const du = d[0]!, dv = d[1]!;
        return Math.sqrt(Math.max(0, g[0]! * du * du + 2 * g[1]! * du * dv + g[2]! * dv * dv));
      },
    };
  }
  const fs = m.entries.map((x) => x.evaluate);
  const g = new Float64Array(6);
  const constant = m.entries.every((x) => x.constant);
  if (constant) {
    for (let k = 0; k < 6; k++) g[k] = fs[k]!(p);
    if (!isPositiveDefinite(g)) throw usageErrorForTensor(m.label, g);
  }
  return {
    constant,
    edge: setEdge,
    at(t) {
      if (!constant) {
        point(t);
        for (let k = 0; k < 6; k++) g[k] = fs[k]!(p);
        if (!isPositiveDefinite(g)) throw notPositiveDefinite(s, m.label, p, va, vb, `entries ${Array.from(g, c6).join(', ')}`);
      }
      return Math.sqrt(Math.max(0, quadratic(g, d)));
    },
  };
}

/** dᵀ g d for the upper triangle g = [xx, xy, xz, yy, yz, zz]. */
export function quadratic(g: ArrayLike<number>, d: ArrayLike<number>): number {
  const x = d[0]!, y = d[1]!, z = d[2]!;
  return g[0]! * x * x + g[3]! * y * y + g[5]! * z * z + 2 * (g[1]! * x * y + g[2]! * x * z + g[4]! * y * z);
}

function usageErrorForTensor(label: string, g: Float64Array): Error {
  return inputError(`the tensor (${Array.from(g, c6).join(', ')}) is not positive definite`, `--metric ${label}`);
}
