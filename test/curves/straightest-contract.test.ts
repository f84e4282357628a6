/**
 * The contract of straightestLine: typed errors for bad options, a LIMIT
 * error for the step bound, and finite, straight output through a triangle
 * without area.
 */
import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { straightestLine, type StraightestOptions } from '../../src/curves/straightest.js';
import { OrthodromeError } from '../../src/errors.js';
import type { SurfacePoint } from '../../src/mesh/surface-point.js';
import { flatGrid, cylinder, type Shape } from '../fixtures/shapes.js';

function build(s: Shape) {
  const m = intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);
  return { m, P: s.positions, S: { topology: m.topology, positions: s.positions } };
}
function codeOf(fn: () => unknown): string | undefined {
  try {
    fn();
  } catch (e) {
    return e instanceof OrthodromeError ? e.code : 'not an OrthodromeError';
  }
  return undefined;
}

describe('bad options are USAGE errors', () => {
  const { m, P, S } = build(flatGrid(4, 4));
  const p: SurfacePoint = { kind: 'face', face: 9, bary: [0.2, 0.3, 0.5] };
  const cases: [string, StraightestOptions][] = [
    ['neither heading nor toward', { length: 1 }],
    ['both heading and toward', { length: 1, heading: 10, toward: [1, 1, 0] }],
    ['length 0', { length: 0, heading: 10 }],
    ['length NaN', { length: NaN, heading: 10 }],
    ['length Infinity', { length: Infinity, heading: 10 }],
    ['heading NaN', { length: 1, heading: NaN }],
    ['reference normal to the surface (+z on the z = 0 plane)', { length: 1, heading: 10, reference: [0, 0, 2] }],
    ['reference of two numbers', { length: 1, heading: 10, reference: [0, 1] }],
    ['toward a point on the start\'s normal line', { length: 1, toward: [0.25, 0.25, 5] }],
    ['maxSteps 0', { length: 1, heading: 10, maxSteps: 0 }],
  ];
  for (const [what, o] of cases) {
    it(what, () => {
      const start: SurfacePoint = what.startsWith('toward') ? { kind: 'vertex', vertex: 6 } : p; // vertex 6 is (0.25, 0.25, 0)
      expect(codeOf(() => straightestLine(S, start, o))).toBe('USAGE');
    });
  }
  it('a start that is not on the mesh', () => {
    expect(codeOf(() => straightestLine(S, { kind: 'face', face: 999, bary: [1, 0, 0] }, { length: 1, heading: 0 }))).toBe('USAGE');
    expect(codeOf(() => straightestLine({ topology: m.topology, positions: P.subarray(3) }, p, { length: 1, heading: 0 }))).toBe('USAGE');
  });
  it('edge lengths for another topology', () => {
    const other = build(flatGrid(4, 4)).m;
    expect(codeOf(() => straightestLine(S, p, { length: 0.1, heading: 0, mesh: other }))).toBe('USAGE');
    expect(straightestLine(S, p, { length: 0.1, heading: 0, mesh: m }).length).toBe(0.1);
  });
});

describe('a reference near the normal is refused (REFERENCE_MIN_ANGLE = 10°)', () => {
  // the threshold is a choice of this project (heading 0 turns by about δ·cot γ for a normal tilted by δ,
  // γ the reference's angle from the normal: differentiating r − (r·n)n; common practice to bound it)
  const { S } = build(flatGrid(4, 4)); // the z = 0 plane, normal +z
  const p: SurfacePoint = { kind: 'face', face: 9, bary: [0.2, 0.3, 0.5] };
  const tilt = (deg: number): [number, number, number] => [Math.sin((deg * Math.PI) / 180), 0, Math.cos((deg * Math.PI) / 180)];
  it('5° from the normal: USAGE, naming the angle', () => {
    let err: unknown;
    try { straightestLine(S, p, { length: 0.1, heading: 0, reference: tilt(5) }); } catch (e) { err = e; }
    expect((err as OrthodromeError).code).toBe('USAGE');
    expect((err as OrthodromeError).message).toMatch(/5° from the normal, at least 10° needed/);
  });
  it('15° from the normal: accepted, heading 0 along the projection +x (elementary: the projection of (sin 15°, 0, cos 15°) on z = 0)', () => {
    const r = straightestLine(S, p, { length: 0.1, heading: 0, reference: tilt(15) });
    expect(Math.abs(r.direction[0] - 1)).toBeLessThan(1e-12);
    expect(Math.abs(r.direction[1])).toBeLessThan(1e-12);
  });
});

describe('boundary vertices', () => {
  const { S } = build(flatGrid(4, 4)); // v:12 = (0.5, 0.5), v:24 = (1, 1); cells (2, 2) and (3, 3) have the diagonal along y = x
  it('a line into a corner stops there: length = distance to the corner (elementary), end = that vertex', () => {
    const r = straightestLine(S, { kind: 'vertex', vertex: 12 }, { heading: 45, length: 3 });
    expect(r.stoppedAtBoundary).toBe(true);
    expect(Math.abs(r.length - Math.SQRT1_2)).toBeLessThan(1e-12);
    expect(r.end).toEqual({ kind: 'vertex', vertex: 24 });
    expect(r.vertexPassages).toBe(1); // through v:18 = (0.75, 0.75) on the way
  });
});

describe('the step bound', () => {
  const { S } = build(cylinder(24, 10, 1, 10));
  const start: SurfacePoint = { kind: 'face', face: 100, bary: [0.3, 0.3, 0.4] };
  it('more faces than maxSteps is a LIMIT error naming the option', () => {
    let err: unknown;
    try {
      straightestLine(S, start, { heading: 80, reference: [0, 0, 1], length: 20, maxSteps: 10 });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(OrthodromeError);
    expect((err as OrthodromeError).code).toBe('LIMIT');
    expect((err as OrthodromeError).message).toMatch(/--max-steps/);
  });
  it('the default bound lets a long helix (many turns round the cylinder) through', () => {
    const r = straightestLine(S, start, { heading: 85, reference: [0, 0, 1], length: 40 });
    expect(r.length).toBe(40);
    expect(r.steps).toBeGreaterThan(300);
  });
});

describe('a triangle without area inside a flat square (collinear corners 0, 4, 2)', () => {
  // (0,0) (1,0) (1,1) (0,1) and (0.5,0.5) on the diagonal: face (4, 2, 0) has no area; the vertex 4 has total angle 2π
  const s: Shape = {
    positions: Float64Array.from([0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0.5, 0.5, 0]),
    triangles: Uint32Array.from([0, 1, 4, 1, 2, 4, 4, 2, 0, 0, 2, 3]),
  };
  const { S } = build(s);
  it('a line across it goes on straight (elementary), every number finite', () => {
    const start: SurfacePoint = { kind: 'face', face: 0, bary: [0.5, 0.3, 0.2] }; // (0.4, 0.1)
    const r = straightestLine(S, start, { toward: [0.2, 0.9, 0], length: Math.hypot(0.2, 0.8) });
    expect(r.points.every(Number.isFinite)).toBe(true);
    const n = r.points.length / 3;
    expect(Math.hypot(r.points[3 * n - 3]! - 0.2, r.points[3 * n - 2]! - 0.9)).toBeLessThan(1e-12);
    expect(r.stoppedAtBoundary).toBe(false);
  });
  it('a line through the vertex on its long side goes on straight (θ = 2π, elementary)', () => {
    const start: SurfacePoint = { kind: 'face', face: 1, bary: [0.5, 0.25, 0.25] }; // (0.875, 0.375)
    const r = straightestLine(S, start, { toward: [0.5, 0.5, 0], length: 2 * Math.hypot(0.375, 0.125) });
    expect(r.vertexPassages).toBe(1);
    const n = r.points.length / 3;
    expect(r.points.every(Number.isFinite)).toBe(true);
    expect(Math.hypot(r.points[3 * n - 3]! - 0.125, r.points[3 * n - 2]! - 0.625)).toBeLessThan(1e-12);
  });
});
