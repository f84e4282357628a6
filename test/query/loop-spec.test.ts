/**
 * Loop source specs (src/query/loop-spec.ts): `loop:ID`, `loop@X,Y,Z`,
 * `loop@X,Y`.
 *
 * Outside facts:
 * - On a flat surface the geodesic distance from a point to a set is the
 *   straight-line distance whenever the straight segment stays on the
 *   surface (the shortest path in a plane is the segment, elementary); from
 *   outside a convex hole, the segment to its nearest point never enters the
 *   hole, and it stays inside the convex outer polygon. The exact method
 *   (window propagation, Mitchell, Mount & Papadimitriou 1987) is exact on
 *   flat meshes up to rounding.
 * - The boundary of a Möbius strip is one circle (standard topology), so
 *   `loop:0` and `boundary` name the same source there.
 */
import { describe, expect, it } from 'vitest';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { surfaceFromMeshData } from '../../src/mesh/surface.js';
import { isOrthodromeError } from '../../src/errors.js';
import { boundaryCurves } from '../../src/geodesic/shared/sources.js';
import { measureDistances, boundarySources } from '../../src/api/distance.js';
import { isLoopSpec, parseLoopSpec, resolveLoopSpec, loopCurves } from '../../src/query/loop-spec.js';
import { namedBoundaryLoops } from '../../src/mesh/boundary.js';
import { twoHolePlate, annulus } from '../fixtures/holed-plates.js';
import { icosphere } from '../fixtures/shapes.js';
import { runCli } from '../cli/run-cli.js';

const surf = (positions: Float64Array, triangles: ArrayLike<number>, name = 'plate.obj') => surfaceFromMeshData(meshFromTriangles(positions, triangles, name));

/** The code and message of what `fn` throws. */
function thrown(fn: () => unknown): { code: string; message: string } {
  try {
    fn();
  } catch (e) {
    if (isOrthodromeError(e)) return { code: e.code, message: e.message };
    throw e;
  }
  throw new Error('did not throw');
}

describe('parsing loop specs', () => {
  it('reads the three forms', () => {
    expect(parseLoopSpec('loop:2')).toEqual({ kind: 'loop-id', id: 2 });
    expect(parseLoopSpec(' loop@1.5,-2,3e2 ')).toEqual({ kind: 'loop-near', xyz: [1.5, -2, 300] });
    expect(parseLoopSpec('loop@612345.678,5413398.123')).toEqual({ kind: 'loop-near-plan', xy: [612345.678, 5413398.123] });
    expect(isLoopSpec('loop:0') && isLoopSpec('loop@0,0') && !isLoopSpec('v:3') && !isLoopSpec('boundary')).toBe(true);
  });
  it('malformed specs are USAGE errors naming the spec and the option', () => {
    for (const bad of ['loop:', 'loop:-1', 'loop:1.5', 'loop:x', 'loop@1', 'loop@1,2,3,4', 'loop@1,,2', 'loop@1e999,0']) {
      const e = thrown(() => parseLoopSpec(bad, '--from'));
      expect(e.code).toBe('USAGE');
      expect(e.message).toContain('--from');
      expect(e.message).toContain(bad);
      expect(e.message).not.toContain('\n');
    }
  });
});

describe('selecting a loop', () => {
  const plate = twoHolePlate(1, 0.1);
  const s = surf(plate.positions, plate.triangles);
  const on = { topology: s.topology, positions: s.positions };
  const pick = (text: string) => resolveLoopSpec(text, on, '--from', 'plate.obj').loop.id;

  it('by id, and nearest to a point in 3D or in plan (holes at (∓0.45, 0), radius 0.2; rim radius 1)', () => {
    expect(pick('loop:0')).toBe(0);
    expect(pick('loop:2')).toBe(2);
    expect(pick('loop@0.45,0,0')).toBe(2); // the right hole's centre
    expect(pick('loop@-0.45,0,5')).toBe(1); // above the left hole: √(0.2² + 25) < √(0.55² + 25)
    expect(pick('loop@0,0.9')).toBe(0); // 0.1 from the rim, ≈ 0.81 from either hole
    expect(pick('loop@3,0,0')).toBe(0); // off the plate: the rim is nearest
    expect(pick('loop@-0.45,0')).toBe(1);
  });

  it('a missing id or a closed surface is an INPUT error naming the file and the spec', () => {
    const e = thrown(() => pick('loop:3'));
    expect(e).toEqual({ code: 'INPUT', message: expect.stringContaining('plate.obj: --from loop:3: no boundary loop 3 (the mesh has 3: ids 0 to 2') });
    const ico = icosphere(1);
    const si = surf(ico.positions, ico.triangles, 'ball.obj');
    const e2 = thrown(() => resolveLoopSpec('loop@0,0,0', { topology: si.topology, positions: si.positions }, '--from', 'ball.obj'));
    expect(e2).toEqual({ code: 'INPUT', message: 'ball.obj: --from loop@0,0,0: the mesh has no boundary loop' });
  });
});

describe('distance from a loop', () => {
  it('every spelling of one loop gives the same field, equal to the boundary spelling restricted to that loop', () => {
    const plate = twoHolePlate(1, 0.1);
    const s = surf(plate.positions, plate.triangles);
    const on = { topology: s.topology, positions: s.positions };
    const byId = resolveLoopSpec('loop:1', on).curves;
    const near = resolveLoopSpec('loop@-0.45,0,0', on).curves;
    const plan = resolveLoopSpec('loop@-0.3,0.1', on).curves;
    expect(near).toEqual(byId);
    expect(plan).toEqual(byId);
    // the one curve of `boundary` whose vertices are those of loop 1
    const loop1 = new Set(namedBoundaryLoops(s.topology, s.positions)[1]!.vertices);
    const fromBoundary = boundaryCurves(s.topology).filter((c) => c.every((p) => p.kind === 'vertex' && loop1.has(p.vertex)));
    expect(fromBoundary.length).toBe(1);
    const d = (curves: typeof byId) => measureDistances(s, { points: [], curves }, { method: 'exact' }).field.distance;
    const a = d(byId), b = d(fromBoundary);
    expect(a.length).toBe(s.topology.nv);
    expect(Array.from(a)).toEqual(Array.from(b));
  });

  it('annulus, distance from the hole (loop:1) = straight-line distance to the hole polygon (flat, convex hole)', () => {
    const R = 1, r = 0.4, h = 0.08;
    const a = annulus(R, r, h);
    const s = surf(a.positions, a.triangles);
    const { loop, curves } = resolveLoopSpec('loop:1', { topology: s.topology, positions: s.positions });
    expect(curves.length).toBe(1);
    expect(curves[0]!.length).toBe(loop.vertices.length + 1); // closed: first vertex repeated
    const P = s.positions, V = loop.vertices;
    const toPolygon = (v: number) => {
      let best = Infinity;
      for (let i = 0; i < V.length; i++) {
        const p = V[i]!, q = V[(i + 1) % V.length]!;
        const ax = P[3 * p]!, ay = P[3 * p + 1]!, bx = P[3 * q]! - ax, by = P[3 * q + 1]! - ay;
        const t = Math.max(0, Math.min(1, ((P[3 * v]! - ax) * bx + (P[3 * v + 1]! - ay) * by) / (bx * bx + by * by)));
        best = Math.min(best, Math.hypot(P[3 * v]! - ax - t * bx, P[3 * v + 1]! - ay - t * by));
      }
      return best;
    };
    const field = measureDistances(s, { points: [], curves }, { method: 'exact' }).field.distance;
    let worst = 0;
    for (let v = 0; v < s.topology.nv; v++) worst = Math.max(worst, Math.abs(field[v]! - toPolygon(v)));
    expect(worst).toBeLessThan(1e-9 * R);
    // and the rim is about R − r away (polygon sagitta r(1 − cos(π/n)) at most)
    const rim = namedBoundaryLoops(s.topology, s.positions)[0]!.vertices;
    for (const v of rim) expect(Math.abs(field[v]! - (R - r))).toBeLessThan(r * (1 - Math.cos(Math.PI / V.length)) + 1e-12);
  });

  it('Möbius strip: loop:0 measures what boundary measures (one rim; crosses the seam)', () => {
    // three rows across (w = −0.5, 0, 0.5), so the middle row is half the width from the rim
    const n = 30, P = new Float64Array(9 * n), T: number[] = [];
    const id = (i: number, j: number) => 3 * i + j;
    for (let i = 0; i < n; i++) {
      const u = (2 * Math.PI * i) / n;
      for (let j = 0; j < 3; j++) {
        const w = 0.5 * (j - 1), rr = 3 + w * Math.cos(u / 2);
        P.set([rr * Math.cos(u), rr * Math.sin(u), w * Math.sin(u / 2)], 3 * id(i, j));
      }
    }
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < 2; j++) {
        const a = id(i, j), b = id(i, j + 1);
        const c = i < n - 1 ? id(i + 1, j) : id(0, 2 - j), d = i < n - 1 ? id(i + 1, j + 1) : id(0, 1 - j); // half twist
        T.push(a, c, b, b, c, d);
      }
    }
    const s = surf(P, T, 'strip.obj');
    const seams = s.report.orientationSeams;
    expect(seams.length).toBeGreaterThan(0);
    const { loop, curves } = resolveLoopSpec('loop:0', { topology: s.topology, positions: s.positions, seams });
    expect(loopCurves(s.topology, loop)).toEqual(curves);
    const segs = curves.reduce((k, c) => k + c.length - 1, 0);
    expect(segs).toBe(2 * n); // every rim edge once
    const f = (c: typeof curves) => Array.from(measureDistances(s, { points: [], curves: c }, { method: 'exact' }).field.distance);
    const a = f(curves), b = f(boundarySources(s));
    expect(Math.max(...a.map((x, i) => Math.abs(x - b[i]!)))).toBeLessThan(1e-12);
    const mid = Array.from({ length: n }, (_, i) => a[id(i, 1)]!);
    expect(Math.min(...mid)).toBeGreaterThan(0.45); // the centre line is ≈ 0.5 from the rim
    expect(Math.max(...mid)).toBeLessThan(0.55);
  });
});

describe('the command: distance --from loop:…', () => {
  it('PX-7 cup: loop:1, loop@0,0,0 and the hole rim typed as a --from-curve of its vertices give the same distance; a bad id is exit 2', () => {
    const mesh = 'meshes/px7-cup.ply';
    const ins = runCli(['inspect', mesh, '--json']);
    expect(ins.code).toBe(0);
    const loops = JSON.parse(ins.stdout).boundaryLoopList as { id: number; vertexList: number[]; point: { vertex: number; position: number[] } }[];
    expect(loops.length).toBe(2);
    const rim = loops[1]!.vertexList; // the hole: the shorter loop, round the origin
    expect(Math.hypot(loops[1]!.point.position[0]!, loops[1]!.point.position[1]!)).toBeLessThan(10);
    const target = `v:${loops[0]!.point.vertex}`; // a point on the outer rim
    const byLoop = runCli(['distance', mesh, '--from', 'loop:1', '--from', 'loop@0,0,0', '--each', '--to', target, '--json']);
    expect(byLoop.code).toBe(0);
    const sets = JSON.parse(byLoop.stdout).sets as { targets: { distance: number }[] }[];
    const curve = [...rim, rim[0]!].map((v) => `v:${v}`).join(';');
    const byCurve = runCli(['distance', mesh, '--from-curve', curve, '--to', target, '--json']);
    expect(byCurve.code).toBe(0);
    const d = JSON.parse(byCurve.stdout).targets[0].distance as number;
    expect(d).toBeGreaterThan(0);
    expect(sets.map((x) => x.targets[0]!.distance)).toEqual([d, d]);
    const bad = runCli(['distance', mesh, '--from', 'loop:2', '--to', target]);
    expect(bad.code).toBe(2);
    expect(bad.stderr.trim().split('\n')).toEqual([`orthodrome: ${mesh}: --from loop:2: no boundary loop 2 (the mesh has 2: ids 0 to 1; 'inspect' lists them)`]);
  });
});
