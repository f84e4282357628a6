/**
 * Every solver entry validates its surface points the same way (issue #8
 * item 11), and a path through waypoints never joins legs across a gap.
 * Sources: the contract documented on `checkSurfacePoint` (indices are
 * integers in range, edge parameters in [0, 1], barycentrics finite,
 * non-negative and summing to one) and the definition of a path on a surface
 * (no path joins two components: common practice).
 */
import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { prepareDistance } from '../../src/geodesic/solver.js';
import type { DistanceMethod } from '../../src/geodesic/shared/field.js';
import { exactDistance } from '../../src/geodesic/exact/index.js';
import { graphDistance } from '../../src/geodesic/graph.js';
import { HeatSolver } from '../../src/geodesic/heat.js';
import { pointSources } from '../../src/geodesic/shared/sources.js';
import { shortestPathThrough } from '../../src/geodesic/waypoints.js';
import { checkSurfacePoint } from '../../src/mesh/surface-point.js';
import type { SurfacePoint } from '../../src/mesh/surface-point.js';
import { isOrthodromeError } from '../../src/errors.js';
import { flatGrid } from '../fixtures/shapes.js';
import { surfaceFromMeshData } from '../../src/mesh/surface.js';
import { meshFromTriangles } from '../../src/io/mesh-data.js';

const s = flatGrid(3, 3, 3, 3);
const mesh = intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);
const t = mesh.topology;

const BAD: [string, SurfacePoint][] = [
  ['v:-1', { kind: 'vertex', vertex: -1 }],
  ['v:1.5', { kind: 'vertex', vertex: 1.5 }],
  ['v:NaN', { kind: 'vertex', vertex: NaN }],
  ['v:16', { kind: 'vertex', vertex: 16 }],
  ['e:0:3', { kind: 'edge', edge: 0, t: 3 }],
  ['e:0:-0.1', { kind: 'edge', edge: 0, t: -0.1 }],
  ['e:0:NaN', { kind: 'edge', edge: 0, t: NaN }],
  ['e:2.5:0.5', { kind: 'edge', edge: 2.5, t: 0.5 }],
  ['f:0:2,2,2', { kind: 'face', face: 0, bary: [2, 2, 2] }],
  ['f:0:-0.5,1,0.5', { kind: 'face', face: 0, bary: [-0.5, 1, 0.5] }],
  ['f:0:Inf', { kind: 'face', face: 0, bary: [Infinity, 0, 0] }],
  ['f:0:NaN', { kind: 'face', face: 0, bary: [NaN, 0.5, 0.5] }],
  ['f:18', { kind: 'face', face: 18, bary: [0.2, 0.3, 0.5] }],
];

/** The error a call throws, or null. */
function thrown(fn: () => unknown): unknown {
  try { fn(); } catch (e) { return e; }
  return null;
}

describe('one validation at every solver entry', () => {
  it('checkSurfacePoint refuses each bad point with a USAGE error naming it', () => {
    for (const [name, p] of BAD) {
      const e = thrown(() => checkSurfacePoint(p, t, '--from'));
      expect(isOrthodromeError(e) && e.code === 'USAGE', name).toBe(true);
      expect((e as Error).message, name).toMatch(/^--from: /);
    }
  });

  for (const method of ['exact', 'heat', 'graph'] as DistanceMethod[]) {
    it(`${method}: as a source and as a target`, () => {
      const solver = prepareDistance(mesh, method);
      const ok = solver.solve(pointSources([{ kind: 'vertex', vertex: 5 }]));
      for (const [name, p] of BAD) {
        const e1 = thrown(() => solver.solve(pointSources([p])));
        expect(isOrthodromeError(e1) && e1.code === 'USAGE', `${method} source ${name}`).toBe(true);
        const e2 = thrown(() => solver.solve(pointSources([{ kind: 'vertex', vertex: 5 }]), { targets: [p], fieldNeeded: false }));
        expect(isOrthodromeError(e2) && e2.code === 'USAGE', `${method} target ${name}`).toBe(true);
        const e3 = thrown(() => ok.at(p));
        expect(isOrthodromeError(e3) && e3.code === 'USAGE', `${method} at ${name}`).toBe(true);
      }
    });
  }

  it('the low-level entries too (exactDistance, graphDistance, HeatSolver, shortestPathThrough)', () => {
    const heat = HeatSolver.prepare(mesh, {});
    for (const [name, p] of BAD) {
      for (const [which, fn] of [
        ['exact', () => exactDistance(mesh, pointSources([p]))],
        ['graph', () => graphDistance(mesh, pointSources([p]))],
        ['heat', () => heat.distance(pointSources([p]))],
        ['path', () => shortestPathThrough(mesh, [{ kind: 'vertex', vertex: 0 }, p])],
      ] as const) {
        const e = thrown(fn);
        expect(isOrthodromeError(e) && e.code === 'USAGE', `${which} ${name}`).toBe(true);
      }
    }
  });

  it('barycentrics summing to one within 1e-6 are accepted and rescaled; [2,2,2] is refused, not normalised', () => {
    const p = checkSurfacePoint({ kind: 'face', face: 3, bary: [0.2, 0.3, 0.5 + 5e-7] }, t);
    expect(p.kind).toBe('face');
    const b = (p as { bary: number[] }).bary;
    expect(b[0]! + b[1]! + b[2]!).toBeCloseTo(1, 15);
    expect(() => checkSurfacePoint({ kind: 'face', face: 3, bary: [2, 2, 2] }, t)).toThrow(/sum to 1/);
  });
});

describe('a corrupted metric is refused, never measured', () => {
  it('a NaN edge length is an INPUT error for every method (a NaN would drop the edge from the search)', () => {
    const m = intrinsicFromPositions(t, s.positions);
    (m.edgeLength as Float64Array)[5] = NaN;
    for (const method of ['exact', 'heat', 'graph'] as DistanceMethod[]) {
      const e = thrown(() => prepareDistance(m, method).solve(pointSources([{ kind: 'vertex', vertex: 0 }])));
      expect(isOrthodromeError(e) && e.code === 'INPUT', method).toBe(true);
      expect((e as Error).message).toMatch(/edge 5 has invalid length NaN/);
    }
  });
});

describe('mesh units the solvers cannot measure in are refused', () => {
  it('edge lengths near 1e±77 are an INPUT error naming the edge (measured: exact degrades silently there)', () => {
    for (const scale of [1e62, 1e-62]) {
      const p = s.positions.map((x) => x * scale);
      const m = intrinsicFromPositions(t, p);
      for (const method of ['exact', 'heat', 'graph'] as DistanceMethod[]) {
        const e = thrown(() => prepareDistance(m, method));
        expect(isOrthodromeError(e) && e.code === 'INPUT', `${method} ${scale}`).toBe(true);
        expect((e as Error).message).toMatch(/rescale the mesh/);
      }
      const e = thrown(() => shortestPathThrough(m, [{ kind: 'vertex', vertex: 0 }, { kind: 'vertex', vertex: 15 }]));
      expect(isOrthodromeError(e) && e.code === 'INPUT', `path ${scale}`).toBe(true);
    }
    // a file at such coordinates is refused while loading, naming the file and the vertex
    const e = thrown(() => surfaceFromMeshData(meshFromTriangles(s.positions.map((x) => x * 1e62), s.triangles, 'huge.obj')));
    expect(isOrthodromeError(e) && e.code === 'INPUT').toBe(true);
    expect((e as Error).message).toMatch(/^huge\.obj: vertex \d+: coordinate .* rescale the mesh/);
    // 1e±50 is fine: the distance corner to corner of the flat 3×3 square scales exactly (similarity)
    for (const scale of [1e50, 1e-50]) {
      const m = intrinsicFromPositions(t, s.positions.map((x) => x * scale));
      expect(prepareDistance(m, 'exact').solve(pointSources([{ kind: 'vertex', vertex: 0 }])).field.distance[15]! / scale).toBeCloseTo(3 * Math.SQRT2, 12);
    }
  });
});

describe('waypoints across an unreachable gap', () => {
  it('two separate squares: the result is unreachable, with no joined path', () => {
    const a = flatGrid(2, 2, 1, 1);
    const n = a.positions.length / 3;
    const pos = new Float64Array(2 * a.positions.length);
    pos.set(a.positions);
    for (let i = 0; i < a.positions.length; i += 3) { pos[a.positions.length + i] = a.positions[i]! + 5; pos[a.positions.length + i + 1] = a.positions[i + 1]!; }
    const tris = new Uint32Array(2 * a.triangles.length);
    tris.set(a.triangles);
    for (let i = 0; i < a.triangles.length; i++) tris[a.triangles.length + i] = a.triangles[i]! + n;
    const m = intrinsicFromPositions(buildTopology(tris, 2 * n).topology, pos);
    const r = shortestPathThrough(m, [{ kind: 'vertex', vertex: 0 }, { kind: 'vertex', vertex: n + 1 }, { kind: 'vertex', vertex: n + 4 }]);
    expect(r.length).toBe(Infinity);
    expect(r.path.points).toHaveLength(0);
    expect(r.legs[0]!.length).toBe(Infinity);
    expect(r.legs[1]!.length).toBeCloseTo(0.5, 12); // one cell side of the second square (flat: Euclidean)
    // the same stops on one component do join
    const ok = shortestPathThrough(m, [{ kind: 'vertex', vertex: n }, { kind: 'vertex', vertex: n + 8 }]);
    expect(ok.length).toBeCloseTo(Math.SQRT2, 12); // corner to corner of a flat unit square (Euclidean)
  });
});
