/**
 * Gauss–Legendre quadrature on [0, 1].
 *
 * The n-point rule ∫₋₁¹ f ≈ Σ wᵢ f(xᵢ) (Abramowitz & Stegun, Handbook of
 * Mathematical Functions, 1964, 25.4.29) takes the nodes xᵢ at the zeros of
 * the Legendre polynomial Pₙ and the weights wᵢ = 2 / ((1 − xᵢ²) Pₙ′(xᵢ)²).
 * The nodes are computed, not tabulated: Newton's method on Pₙ evaluated by
 * the three-term recurrence (k+1) P_{k+1} = (2k+1) x P_k − k P_{k−1}
 * (A&S 22.7.10), with the derivative (1 − x²) Pₙ′ = n (P_{n−1} − x Pₙ)
 * (A&S 22.8.5), started from the classical estimate
 * xᵢ ≈ cos(π (i − ¼) / (n + ½)) (A&S 22.16.6), which converges to the i-th
 * zero for every n. The rule is exact for polynomials of degree 2n − 1.
 */

/** Nodes in (0, 1) and weights summing to 1 of an n-point rule on [0, 1]. */
export interface GaussRule {
  /** Nodes on [0, 1], ascending. */
  nodes: Float64Array;
  /** Weights (sum 1). */
  weights: Float64Array;
}

const rules = new Map<number, GaussRule>();

/** The n-point Gauss–Legendre rule mapped to [0, 1] (computed once per n). */
export function gaussLegendre(n: number): GaussRule {
  if (!Number.isInteger(n) || n < 1 || n > 512) throw new RangeError(`Gauss–Legendre rule of ${n} points`);
  const cached = rules.get(n);
  if (cached) return cached;
  const nodes = new Float64Array(n), weights = new Float64Array(n);
  for (let i = 1; i <= Math.ceil(n / 2); i++) {
    let x = Math.cos((Math.PI * (i - 0.25)) / (n + 0.5));
    let dp = 0;
    for (let it = 0; it < 100; it++) {
      let p0 = 1, p1 = x;
      for (let k = 1; k < n; k++) {
        const p2 = ((2 * k + 1) * x * p1 - k * p0) / (k + 1);
        p0 = p1;
        p1 = p2;
      }
      const pn = n === 1 ? x : p1, pn1 = n === 1 ? 1 : p0;
      dp = (n * (pn1 - x * pn)) / (1 - x * x);
      const dx = pn / dp;
      x -= dx;
      if (Math.abs(dx) <= 1e-16) break;
    }
    const w = 2 / ((1 - x * x) * dp * dp);
    // the zero x and its mirror −x; on [0, 1]: t = (1 ± x) / 2, weight w / 2
    nodes[i - 1] = (1 - x) / 2;
    nodes[n - i] = (1 + x) / 2;
    weights[i - 1] = w / 2;
    weights[n - i] = w / 2;
  }
  const rule = { nodes, weights };
  rules.set(n, rule);
  return rule;
}
