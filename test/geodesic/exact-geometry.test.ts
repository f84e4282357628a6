/**
 * The exact solver's per-mesh data (src/geodesic/exact/geometry.ts), made
 * once and shared by runs:
 * - which vertices are pseudo-sources: a shortest path can only bend at an
 *   interior vertex of angle sum > 2π or a boundary vertex of angle sum > π
 *   (Mitchell, Mount & Papadimitriou, SIAM J. Comput. 16(4), 1987), so a
 *   flat grid and a cube have none and an L-shaped flat domain has exactly
 *   its reflex corner;
 * - a run with a shared geometry gives bit-for-bit the distances of a run
 *   that makes its own, and leaves the shared data unchanged (a source
 *   vertex is a pseudo-source of its own run only);
 * - geometry made for another mesh is refused with a USAGE error.
 */
import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import type { IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { exactDistance } from '../../src/geodesic/exact/index.js';
import { prepareExactGeometry } from '../../src/geodesic/exact/geometry.js';
import { prepareDistance } from '../../src/geodesic/solver.js';
import { isOrthodromeError } from '../../src/errors.js';
import { flatGrid, terrain } from '../fixtures/shapes.js';
import type { Shape } from '../fixtures/shapes.js';

const meshOf = (s: Shape): IntrinsicMesh => intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);

/** Unit cube, 12 triangles, outward-facing. */
function cube(): Shape {
  const positions = new Float64Array([0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0, 0, 1, 1, 0, 1, 1, 1, 1, 0, 1, 1]);
  const q = [[0, 3, 2, 1], [4, 5, 6, 7], [0, 1, 5, 4], [1, 2, 6, 5], [2, 3, 7, 6], [3, 0, 4, 7]];
  return { positions, triangles: new Uint32Array(q.flatMap(([a, b, c, d]) => [a!, b!, c!, a!, c!, d!])) };
}

describe('exact geometry: pseudo-sources', () => {
  it('flat grid and cube: none; L-shaped flat domain: only the reflex corner', () => {
    expect(prepareExactGeometry(meshOf(flatGrid(4, 4))).saddles).toBe(0);
    expect(prepareExactGeometry(meshOf(cube())).saddles).toBe(0);
    // 2 × 2 cells with the top-right cell removed: the centre vertex (4) has angle sum 3π/2 on the boundary
    const g = flatGrid(2, 2);
    const keep = Array.from(g.triangles).filter((_, i, a) => {
      const f = Math.floor(i / 3);
      return ![0, 1, 2].every((k) => [4, 5, 7, 8].includes(a[3 * f + k]!));
    });
    const geo = prepareExactGeometry(meshOf({ positions: g.positions, triangles: new Uint32Array(keep) }));
    expect(geo.saddles).toBe(1);
    expect(geo.saddle[4]).toBe(1);
  });
});

describe('exact geometry: shared by runs', () => {
  const m = meshOf(terrain(10, 10, 1, 1, (x, y) => 0.2 * Math.sin(6 * x) * Math.cos(5 * y)));
  const geo = prepareExactGeometry(m);
  const flags = Uint8Array.from(geo.saddle);
  // an interior vertex that is not a saddle (11 × 11 vertices, row by row)
  const calm = flags.findIndex((f, v) => f === 0 && v % 11 > 0 && v % 11 < 10 && v > 10 && v < 110);

  it('gives the distances of a fresh run, bit for bit, and stays unchanged', () => {
    const sets = [
      { points: [{ kind: 'vertex' as const, vertex: calm }], curves: [] },
      { points: [{ kind: 'face' as const, face: 77, bary: [0.2, 0.3, 0.5] as [number, number, number] }], curves: [] },
      { points: [{ kind: 'vertex' as const, vertex: 60 }, { kind: 'edge' as const, edge: 5, t: 0.4 }], curves: [] },
    ];
    expect(flags.some((f) => f === 1)).toBe(true);
    expect(calm).toBeGreaterThan(0); // a source there becomes a pseudo-source of its run only
    for (const src of sets) {
      const fresh = exactDistance(m, src).field.distance;
      const shared = exactDistance(m, src, { geometry: geo }).field.distance;
      expect(Array.from(shared)).toEqual(Array.from(fresh));
    }
    expect(Array.from(geo.saddle)).toEqual(Array.from(flags));
    // a prepared solver reuses it across solves, including stop-at-target queries
    const solver = prepareDistance(m, 'exact');
    expect(solver.prepareDetails.saddles).toBe(geo.saddles);
    const q = solver.solve(sets[0]!, { targets: [{ kind: 'vertex', vertex: 90 }], fieldNeeded: false });
    const want = exactDistance(m, sets[0]!).field.distance[90]!;
    expect(Math.abs(q.at({ kind: 'vertex', vertex: 90 }) - want)).toBeLessThanOrEqual(1e-12 * want); // the early stop may round differently
  });

  it('refuses geometry made for another mesh', () => {
    const other = meshOf(flatGrid(3, 3));
    let err: unknown;
    try {
      exactDistance(other, { points: [{ kind: 'vertex', vertex: 0 }], curves: [] }, { geometry: geo });
    } catch (e) {
      err = e;
    }
    expect(isOrthodromeError(err) && err.code).toBe('USAGE');
  });
});
