/**
 * A flip path in the wrong homotopy class, and what the `path` entry says about it.
 *
 * A Gaussian bump stands slightly off the line between two points of a flat plate, so a
 * path round either side of it is a geodesic and the two are nearly as long. FlipOut keeps
 * the side of its edge-graph start (Sharp & Crane 2020, §4: it shortens within the start's
 * homotopy class), which on this mesh is the longer one. The entry must either prove the
 * leg and return the shorter path (window propagation in the ellipsoid that holds every
 * shorter path), or return the flip path unproven with a certified bound on its excess that
 * holds against window propagation (Mitchell, Mount & Papadimitriou 1987: exact distances).
 * The bound comes from the straight 3D distance, a lower bound on any path on the surface
 * (elementary: a path on the surface is a curve in space of the same length).
 */
import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions, type IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { flipGeodesicPath } from '../../src/geodesic/flip/index.js';
import { chordExcess } from '../../src/geodesic/flip/verify.js';
import { shortestPathThrough } from '../../src/geodesic/waypoints.js';
import { pathLength, isSurfacePath } from '../../src/geodesic/path.js';
import type { SurfacePoint } from '../../src/mesh/surface-point.js';
import { flatGrid } from '../fixtures/shapes.js';

const V = (vertex: number): SurfacePoint => ({ kind: 'vertex', vertex });
const NX = 40, NY = 20;

/** A 2 × 1 plate (jittered 40 × 20 grid, seed 2) with a bump of height 0.6 and width 0.08 at (1, 0.5 + cy). */
function bumpPlate(cy: number): { m: IntrinsicMesh; P: Float64Array; a: number; b: number } {
  const s = flatGrid(NX, NY, 2, 1, 0.25, 2);
  const P = s.positions;
  for (let i = 0; i < P.length; i += 3) P[i + 2] = 0.6 * Math.exp(-((P[i]! - 1) ** 2 + (P[i + 1]! - 0.5 - cy) ** 2) / (2 * 0.08 ** 2));
  const m = intrinsicFromPositions(buildTopology(s.triangles, P.length / 3).topology, P);
  const a = (NY / 2) * (NX + 1); // (0, 0.5) and (2, 0.5): boundary vertices, not jittered
  return { m, P, a, b: a + NX };
}

describe('bump between two nearly equal routes: the flip start is on the longer side', () => {
  const { m, P, a, b } = bumpPlate(0.015);
  const exact = shortestPathThrough(m, [V(a), V(b)], { method: 'windows' }).length;
  const flipAlone = flipGeodesicPath(m, a, b);

  it('flips alone return the longer geodesic (the case this suite is about)', () => {
    expect(flipAlone.status).toBe('ok');
    expect(flipAlone.path.length).toBeGreaterThan(exact * (1 + 1e-3)); // measured 0.45% longer
  });

  it('with the proof: proven, and the shorter path of window propagation to 1e-9', () => {
    const r = shortestPathThrough(m, [V(a), V(b)], { method: 'flip', positions: P });
    expect(r.legs[0]!.proven).toBe(true);
    expect(r.legs[0]!.excessBound).toBe(0);
    expect(r.excessBound).toBe(0);
    expect(Math.abs(r.length - exact)).toBeLessThanOrEqual(1e-9 * exact);
    expect(isSurfacePath(m.topology, r.path.points)).toBe(true);
    expect(Math.abs(pathLength(m, r.path.points) - exact)).toBeLessThanOrEqual(1e-9 * exact);
  });

  it('without it (--prove-limit 0): unproven, and the certified bound holds against window propagation', () => {
    for (const method of ['flip', 'auto'] as const) {
      const r = shortestPathThrough(m, [V(a), V(b)], { method, positions: P, verifyFaces: 0 });
      if (method === 'auto') { expect(r.legs[0]!.method).toBe('windows'); continue; } // below AUTO_FLIP_FACES: windows
      expect(r.legs[0]!.proven).toBe(false);
      expect(r.length).toBeCloseTo(flipAlone.path.length, 12);
      const bound = r.legs[0]!.excessBound!;
      expect(bound).toBeGreaterThan(0);
      expect(r.excessBound).toBe(bound);
      // the bound is L / chord − 1 (the chord, elementary), and it holds: (L − d)/d ≤ bound
      const chord = Math.hypot(P[3 * b]! - P[3 * a]!, P[3 * b + 1]! - P[3 * a + 1]!, P[3 * b + 2]! - P[3 * a + 2]!);
      expect(Math.abs(bound - (r.length / chord - 1))).toBeLessThanOrEqual(1e-9);
      expect((r.length - exact) / exact).toBeLessThanOrEqual(bound);
    }
  });

  it('a second leg and a leg without positions: the path bound is the largest leg bound, unknown without positions', () => {
    const c = a + 5; // a point on the line before the bump: a straight, flat leg
    const r = shortestPathThrough(m, [V(a), V(c), V(b)], { method: 'flip', positions: P, verifyFaces: 0 });
    expect(r.legs[0]!.proven).toBe(true); // as long as the chord: proven without a search
    expect(r.legs[0]!.excessBound).toBe(0);
    expect(r.excessBound).toBe(r.legs[1]!.excessBound);
    expect(r.excessBound!).toBeGreaterThan(0);
    const blind = shortestPathThrough(m, [V(a), V(b)], { method: 'flip' });
    expect(blind.legs[0]!.proven).toBe(false);
    expect(blind.legs[0]!.excessBound).toBeUndefined();
    expect(blind.excessBound).toBe(Infinity);
  });
});

describe('a metric of the user\'s own: the chord says nothing, so nothing is claimed from it', () => {
  it('lengths halved (not those of the positions): the longer flip path is neither proven nor bounded; auto uses windows', () => {
    const { m, P, a, b } = bumpPlate(0.015);
    const half: IntrinsicMesh = { topology: m.topology, edgeLength: m.edgeLength.map((l) => l / 2) };
    const exact = shortestPathThrough(half, [V(a), V(b)], { method: 'windows' }).length;
    // with the chord of the positions, L/2 would look shorter than the chord and pass as proven
    const r = shortestPathThrough(half, [V(a), V(b)], { method: 'flip', positions: P });
    expect(r.legs[0]!.method).toBe('flip');
    expect(r.length).toBeGreaterThan(exact * (1 + 1e-3)); // the wrong side, as on the true plate
    expect(r.legs[0]!.proven).toBe(false);
    expect(r.legs[0]!.excessBound).toBeUndefined();
    expect(r.excessBound).toBe(Infinity);
  });
});

describe('chord bound', () => {
  it('on a flat plate a straight flip path is proven by the chord alone (the segment is shortest: elementary)', () => {
    const s = flatGrid(30, 30, 3, 3, 0.3, 5);
    const m = intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);
    const r = shortestPathThrough(m, [V(0), V(960)], { method: 'flip', positions: s.positions, verifyFaces: 0 });
    expect(r.legs[0]!.method).toBe('flip');
    expect(r.legs[0]!.proven).toBe(true);
    expect(Math.abs(r.length - Math.hypot(3, 3))).toBeLessThanOrEqual(1e-9 * 3);
  });

  it('chordExcess: (L − c)/c, 0 for a zero path, never below 0, Infinity when the ends meet in space only', () => {
    expect(chordExcess(2, 1)).toBeGreaterThanOrEqual(1); // (2 − 1)/1, rounded up
    expect(chordExcess(2, 1)).toBeLessThan(1 + 1e-9);
    expect(chordExcess(0, 0)).toBe(0);
    expect(chordExcess(1, 1)).toBeGreaterThanOrEqual(0);
    expect(chordExcess(1, 0)).toBe(Infinity);
  });
});
