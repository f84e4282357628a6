/**
 * The parts of a user metric: Gauss–Legendre rules, the expression compiler,
 * spec parsing, the lengths file, quadrature of edge lengths.
 */
import { describe, expect, it } from 'vitest';
import { gaussLegendre } from '../../src/metric/user/gauss-legendre.js';
import { compileExpression } from '../../src/metric/user/expression.js';
import { parseMetricSpec } from '../../src/metric/user/spec.js';
import * as speedModule from '../../src/metric/user/speed.js';
const { isPositiveDefinite } = speedModule;
import { lengthsFromCsv } from '../../src/metric/user/lengths-file.js';
import { quadratureEdgeLengths } from '../../src/metric/user/edge-lengths.js';
import { openSurface } from '../../src/index.js';
import { metricLengths } from '../../src/metric/user/surface-metric.js';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { OrthodromeError } from '../../src/errors.js';

const XYZ = ['x', 'y', 'z'];
const ev = (s: string, x = 2, y = 3, z = 0.5) => compileExpression(s, XYZ, 'test').evaluate(new Float64Array([x, y, z]));
const err = (f: () => unknown): OrthodromeError => {
  try {
    f();
  } catch (e) {
    return e as OrthodromeError;
  }
  throw new Error('no error');
};

describe('Gauss–Legendre rules', () => {
  it('5 points: the nodes and weights of Abramowitz & Stegun table 25.4 (mapped to [0, 1])', () => {
    // A&S table 25.4, n = 5 (from memory): ±0.906179845938664, ±0.538469310105683, 0; weights 0.236926885056189, 0.478628670499366, 0.568888888888889
    const r = gaussLegendre(5);
    const x = [-0.906179845938664, -0.538469310105683, 0, 0.538469310105683, 0.906179845938664];
    const w = [0.236926885056189, 0.478628670499366, 0.568888888888889, 0.478628670499366, 0.236926885056189];
    for (let i = 0; i < 5; i++) {
      expect(r.nodes[i]).toBeCloseTo((1 + x[i]!) / 2, 14);
      expect(r.weights[i]).toBeCloseTo(w[i]! / 2, 14);
    }
  });
  it('the n-point rule integrates t^k exactly on [0, 1] up to k = 2n − 1 (A&S 25.4.29), and not k = 2n', () => {
    for (const n of [1, 2, 3, 8, 16]) {
      const { nodes, weights } = gaussLegendre(n);
      const q = (k: number) => nodes.reduce((a, t, i) => a + weights[i]! * t ** k, 0);
      for (let k = 0; k <= 2 * n - 1; k++) expect(Math.abs(q(k) - 1 / (k + 1))).toBeLessThan(1e-14);
      if (n <= 3) expect(Math.abs(q(2 * n) - 1 / (2 * n + 1))).toBeGreaterThan(1e-4); // degree 2n is not exact
    }
  });
});

describe('expressions', () => {
  it('follow mathematical precedence (common practice): ^ above * and unary minus, right-associative', () => {
    expect(ev('-x^2')).toBe(-4);
    expect(ev('(-x)^2')).toBe(4);
    expect(ev('2^3^2')).toBe(512);
    expect(ev('x*-y^2')).toBe(-18);
    expect(ev('2*x**3')).toBe(16);
    expect(ev('1 + 2*3 - 4/2')).toBe(5);
    expect(ev('sqrt(x) + max(1, y, z) - min(z, 7)')).toBeCloseTo(Math.SQRT2 + 3 - 0.5, 15);
    expect(ev('exp(-z)*cos(pi*x) + log(e)')).toBeCloseTo(Math.exp(-0.5) + 1, 15);
    expect(ev('pow(y, 2) + abs(-z) + atan2(1, 1)')).toBeCloseTo(9 + 0.5 + Math.PI / 4, 15);
    expect(compileExpression('2*pi', XYZ, 't').constant).toBe(true);
    expect(compileExpression('2*y', XYZ, 't').constant).toBe(false);
  });
  it('a bad expression is a one-line USAGE error naming the column, marked with ‸', () => {
    const e = err(() => compileExpression('1/yy', XYZ, '--metric conformal'));
    expect(e.code).toBe('USAGE');
    expect(e.message).toContain("unknown name 'yy'");
    expect(e.message).toContain('column 3: 1/‸yy');
    expect(err(() => compileExpression('foo(x)', XYZ, 'm')).message).toContain("unknown function 'foo' (functions: sqrt");
    expect(err(() => compileExpression('1+', XYZ, 'm')).message).toContain('column 3');
    expect(err(() => compileExpression('x % 2', XYZ, 'm')).message).toContain('column 3');
    expect(err(() => compileExpression('sin(1, 2)', XYZ, 'm')).message).toContain('sin takes 1 argument(s), got 2');
    expect(err(() => compileExpression('(x', XYZ, 'm')).message).toContain('Unclosed (');
    expect(err(() => compileExpression('2 x', XYZ, 'm')).message).toContain('column 3: 2 ‸x');
    // no property access, no strings, no constructor reach
    expect(err(() => compileExpression('x.constructor', XYZ, 'm')).code).toBe('USAGE');
    expect(err(() => compileExpression("'a'", XYZ, 'm')).code).toBe('USAGE');
    expect(err(() => compileExpression('u', XYZ, 'm')).message).toContain("unknown name 'u'");
    for (const m of [err(() => compileExpression('1/yy', XYZ, 'm')).message]) expect(m).not.toContain('\n');
  });
});

describe('metric specs', () => {
  it('parses each form; a bad one is USAGE', () => {
    const t = parseMetricSpec('tensor:1,0,0,1,0,4');
    expect(t.kind).toBe('tensor');
    expect(t.label).toBe('tensor:1,0,0,1,0,4');
    expect(parseMetricSpec('conformal:1/y').kind).toBe('conformal');
    const f = parseMetricSpec('form:cos(v)^2;0;1');
    expect(f.kind === 'form' && f.E.evaluate(new Float64Array([0, Math.PI / 3, 0, Math.PI / 3]))).toBeCloseTo(0.25, 15);
    expect(parseMetricSpec('field:g').kind).toBe('field');
    const json = parseMetricSpec('tensor:m.json', { readText: () => '{"tensor": [[1,0.5,0],[0.5,2,0],[0,0,3]]}' });
    expect(json.kind === 'tensor' && json.entries.map((c) => c.evaluate(new Float64Array(3)))).toEqual([1, 0.5, 0, 2, 0, 3]);
    expect(err(() => parseMetricSpec('tensor:m.json', { readText: () => '[[1,0.5,0],[0.4,2,0],[0,0,3]]' })).message).toContain('not symmetric');
    expect(err(() => parseMetricSpec('tensor:1,0,0,1')).message).toContain('six entries');
    expect(err(() => parseMetricSpec('form:1;0')).message).toContain('three parts');
    expect(err(() => parseMetricSpec('riemann:1')).code).toBe('USAGE');
    expect(err(() => parseMetricSpec('form:1;0;z')).message).toContain("unknown name 'z'");
  });
  it('positive definiteness by Cholesky pivots (Sylvester: leading minors > 0, common practice)', () => {
    expect(isPositiveDefinite([1, 0, 0, 1, 0, 4])).toBe(true);
    expect(isPositiveDefinite([1, 2, 0, 1, 0, 1])).toBe(false); // minor 1·1 − 2² < 0
    expect(isPositiveDefinite([2, 1, 1, 2, 1, 2])).toBe(true); // minors 2, 3, 4
    expect(isPositiveDefinite([1, 1, 1, 1, 1, 1])).toBe(false); // rank one
    expect(isPositiveDefinite([1, 0.9, 1])).toBe(true);
    expect(isPositiveDefinite([1, 1.1, 1])).toBe(false);
  });
});

describe('edge lengths', () => {
  // one triangle (0,0.5) (1,0.5) (0,1.5) in the plane
  const tri = () => openSurface(meshFromTriangles(new Float64Array([0, 0.5, 0, 1, 0.5, 0, 0, 1.5, 0]), [0, 1, 2], 'tri.obj'));
  it('conformal 1/y: a vertical edge has length ln(y₂/y₁) (hyperbolic upper half-plane, closed form; Beardon, The Geometry of Discrete Groups, §7.2 — from memory)', () => {
    const s = tri();
    const m = parseMetricSpec('conformal:1/y');
    if (m.kind !== 'conformal') throw new Error('kind');
    const q = quadratureEdgeLengths(s.topology, speedModule.expressionSpeed({ positions: s.positions, vertexOrigin: s.topology.vertexOrigin, name: 'tri' }, m), 1e-12);
    const t = s.topology;
    for (let e = 0; e < t.ne; e++) {
      const h = t.edgeHalfedge[e]!, a = t.tri[h]!, b = t.tri[h % 3 === 2 ? h - 2 : h + 1]!;
      const ya = s.positions[3 * a + 1]!, yb = s.positions[3 * b + 1]!, dx = s.positions[3 * b]! - s.positions[3 * a]!;
      // straight segment (not the geodesic): ∫ |d| / y(t) dt = |d| ln(yb/ya)/(yb − ya), or |dx|/y on a horizontal one (calculus)
      const want = ya === yb ? Math.abs(dx) / ya : (Math.hypot(dx, yb - ya) * Math.log(yb / ya)) / (yb - ya);
      expect(Math.abs(q.lengths[e]! - want)).toBeLessThan(1e-12 * want);
    }
    expect(q.toleranceReached).toBeLessThan(1e-12);
  });
  it('adaptive refinement reaches the tolerance on a kinked integrand: λ = 1 + |x − 0.3| on a unit edge gives 1 + (0.3² + 0.7²)/2 (calculus)', () => {
    const s = openSurface(meshFromTriangles(new Float64Array([0, 0, 0, 1, 0, 0, 0, 1, 0]), [0, 1, 2], 'kink'));
    const m = parseMetricSpec('conformal:1 + abs(x - 0.3)');
    if (m.kind !== 'conformal') throw new Error('kind');
    const q = quadratureEdgeLengths(s.topology, speedModule.expressionSpeed({ positions: s.positions, vertexOrigin: s.topology.vertexOrigin, name: 'kink' }, m), 1e-10);
    const t = s.topology;
    let found = false;
    for (let e = 0; e < t.ne; e++) {
      const h = t.edgeHalfedge[e]!, a = t.tri[h]!, b = t.tri[h % 3 === 2 ? h - 2 : h + 1]!;
      if (s.positions[3 * a + 1] !== 0 || s.positions[3 * b + 1] !== 0) continue; // the edge along y = 0
      expect(Math.abs(q.lengths[e]! - 1.29)).toBeLessThan(1e-10 * 1.29);
      found = true;
    }
    expect(found).toBe(true);
    expect(q.evaluations).toBeGreaterThan(3 * 15); // the kinked edge was split (a smooth edge takes 15)
    expect(q.toleranceReached).toBeLessThanOrEqual(1e-10);
  });
  it('field:NAME reads per-vertex factors and tensors, interpolated linearly along edges (a linear λ integrates to its mean, calculus)', () => {
    const data = meshFromTriangles(new Float64Array([0, 0, 0, 2, 0, 0, 0, 1, 0]), [0, 1, 2], 'f.ply');
    data.vertexProps = [
      { name: 'c', type: 'float64', values: new Float64Array([1, 1.5, 2]) },
      ...['xx', 'xy', 'xz', 'yy', 'yz', 'zz'].map((k, i) => ({ name: `g_${k}`, type: 'float64' as const, values: new Float64Array(3).fill([4, 0, 0, 1, 0, 1][i]!) })),
    ];
    const s = openSurface(data);
    const byEnds = (L: Float64Array) => {
      const out: Record<string, number> = {};
      const t = s.topology;
      for (let e = 0; e < t.ne; e++) {
        const h = t.edgeHalfedge[e]!, a = t.tri[h]!, b = t.tri[h % 3 === 2 ? h - 2 : h + 1]!;
        out[[a, b].sort().join('-')] = L[e]!;
      }
      return out;
    };
    const c = byEnds(metricLengths(s, parseMetricSpec('field:c')).mesh.edgeLength);
    expect(c['0-1']).toBeCloseTo(2 * 1.25, 12); // |d| = 2, mean factor (1 + 1.5)/2; the triangle stays valid (no mollification)
    expect(c['0-2']).toBeCloseTo(1 * 1.5, 12);
    expect(c['1-2']).toBeCloseTo(Math.sqrt(5) * 1.75, 12);
    const g = byEnds(metricLengths(s, parseMetricSpec('field:g')).mesh.edgeLength);
    expect(g['0-1']).toBeCloseTo(4, 12); // √(4·2²)
    expect(g['1-2']).toBeCloseTo(Math.sqrt(4 * 4 + 1), 12);
    expect(err(() => metricLengths(s, parseMetricSpec('field:nope'))).message).toContain('has no vertex properties nope_xx');
    data.vertexProps[0]!.values[2] = -1;
    expect(err(() => metricLengths(openSurface(data), parseMetricSpec('field:c'))).message).toMatch(/not positive definite at vertex 2 \(0, 1, 0\): c = -1/);
  });
  it('a lengths file gives every edge; a missing edge or a non-edge is INPUT naming the line', () => {
    const s = tri();
    const L = lengthsFromCsv(s.topology, 'a,b,length\n0,1,3\n# comment\n2,1,5\n0,2,4\n', 'l.csv');
    expect([...L].sort()).toEqual([3, 4, 5]);
    expect(err(() => lengthsFromCsv(s.topology, '0,1,3\n2,1,5\n', 'l.csv')).message).toMatch(/no length for the edge between vertices (0 and 2|2 and 0) \(1 of 3 edges missing\)/);
    expect(err(() => lengthsFromCsv(s.topology, '0,1,3\n2,1,5\n0,3,4\n', 'l.csv')).message).toContain('l.csv:3: vertices 0 and 3 are not joined');
    expect(err(() => lengthsFromCsv(s.topology, '0,1,-3\n', 'l.csv')).message).toContain('l.csv:1: length must be');
  });
});
