/**
 * `field:NAME`: a metric given per vertex in the mesh file's vertex
 * properties (PLY), interpolated linearly along each edge. By the columns
 * present:
 *
 * - `NAME_xx, NAME_xy, NAME_xz, NAME_yy, NAME_yz, NAME_zz`: a symmetric 3×3
 *   tensor in world coordinates;
 * - `NAME_xx, NAME_xy, NAME_yy` (no z columns): a 2×2 form over the mesh's x, y
 *   taken as parameters (as `form:`), z not used;
 * - `NAME` alone: a conformal factor λ > 0 (ds = λ |dx|).
 *
 * Positive definiteness is checked at every vertex an edge uses; a linear
 * interpolation of two positive definite matrices stays positive definite
 * (a convex combination; common practice), so the edges need no more checks.
 */
import { inputError, usageError } from '../../errors.js';
import type { PropertyColumn } from '../../io/mesh-data.js';
import { isPositiveDefinite, quadratic, type EdgeSpeed, type MetricSurface } from './speed.js';

/** The property names `field:NAME` reads, by layout. */
export const FIELD_LAYOUTS = {
  tensor: ['xx', 'xy', 'xz', 'yy', 'yz', 'zz'],
  form: ['xx', 'xy', 'yy'],
} as const;

/** The speed of `field:name` on `s`, whose file has the vertex property columns `props`. */
export function fieldSpeed(s: MetricSurface, props: readonly PropertyColumn[], name: string, label: string): EdgeSpeed {
  const col = (suffix: string) => props.find((p) => p.name === (suffix ? `${name}_${suffix}` : name));
  const tensorCols = FIELD_LAYOUTS.tensor.map(col);
  const formCols = FIELD_LAYOUTS.form.map(col);
  let cols: PropertyColumn[];
  let layout: 'tensor' | 'form' | 'scalar';
  if (tensorCols.every(Boolean)) [cols, layout] = [tensorCols as PropertyColumn[], 'tensor'];
  else if (formCols.every(Boolean) && !col('xz') && !col('yz') && !col('zz')) [cols, layout] = [formCols as PropertyColumn[], 'form'];
  else if (col('')) [cols, layout] = [[col('')!], 'scalar'];
  else {
    const have = props.map((p) => p.name).join(', ') || 'none';
    throw usageError(
      `field:${name}: the mesh has no vertex properties ${name}_xx, ${name}_xy, ${name}_xz, ${name}_yy, ${name}_yz, ${name}_zz (tensor), ${name}_xx, ${name}_xy, ${name}_yy (form) or ${name} (factor); it has: ${have}`,
      s.name,
    );
  }
  const k = cols.length;
  const checked = new Uint8Array(s.vertexOrigin.length);
  const P = s.positions;
  const check = (v: number): void => {
    if (checked[v]) return;
    const o = s.vertexOrigin[v]!;
    const g = cols.map((c) => c.values[o]!);
    const ok = layout === 'scalar' ? g[0]! > 0 && Number.isFinite(g[0]!) : isPositiveDefinite(g);
    if (!ok) {
      const at = [P[3 * v]!, P[3 * v + 1]!, P[3 * v + 2]!].map((x) => String(Number(x.toPrecision(6)))).join(', ');
      throw inputError(`the metric ${label} is not positive definite at vertex ${o} (${at}): ${cols.map((c, i) => `${c.name} = ${g[i]}`).join(', ')}`, s.name);
    }
    checked[v] = 1;
  };
  const ga = new Float64Array(k), gb = new Float64Array(k), d = new Float64Array(3);
  let qa = 0, qb = 0;
  return {
    constant: false,
    edge(va, vb) {
      check(va);
      check(vb);
      const oa = s.vertexOrigin[va]!, ob = s.vertexOrigin[vb]!;
      for (let i = 0; i < k; i++) {
        ga[i] = cols[i]!.values[oa]!;
        gb[i] = cols[i]!.values[ob]!;
      }
      for (let j = 0; j < 3; j++) d[j] = P[3 * vb + j]! - P[3 * va + j]!;
      if (layout === 'tensor') {
        qa = quadratic(ga, d);
        qb = quadratic(gb, d);
      } else if (layout === 'form') {
        const du = d[0]!, dv = d[1]!;
        qa = ga[0]! * du * du + 2 * ga[1]! * du * dv + ga[2]! * dv * dv;
        qb = gb[0]! * du * du + 2 * gb[1]! * du * dv + gb[2]! * dv * dv;
      } else {
        const len = Math.hypot(d[0]!, d[1]!, d[2]!);
        qa = ga[0]! * len;
        qb = gb[0]! * len;
      }
    },
    at(t) {
      // g(t) = (1 − t) g_a + t g_b, so dᵀ g(t) d is linear in t; a factor λ(t) |d| is linear itself
      const q = (1 - t) * qa + t * qb;
      return layout === 'scalar' ? q : Math.sqrt(Math.max(0, q));
    },
  };
}
