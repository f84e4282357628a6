/**
 * The `inspect` report on degenerate and non-orientable meshes: each case was
 * once reported healthy or miscounted. Outside facts: χ(Möbius strip) = 0 with
 * one boundary circle (standard topology); Descartes / discrete Gauss–Bonnet,
 * Σ defects + Σ turning = 2πχ on any triangulated surface; a fan of n
 * triangles about one vertex is a disc (χ = 1, elementary). Triangle quality
 * classes (zero-area, cap, needle) follow the thresholds documented in
 * src/report/inspect.ts (common practice: caps have an angle near 180°,
 * needles one near 0°).
 */
import { describe, expect, it } from 'vitest';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { surfaceFromMeshData } from '../../src/mesh/surface.js';
import { inspectSurface, inspectProblems } from '../../src/report/inspect.js';
import { icosphere, flatGrid, fanDisc } from '../fixtures/shapes.js';

function inspect(positions: Float64Array, triangles: ArrayLike<number>) {
  const r = inspectSurface(surfaceFromMeshData(meshFromTriangles(positions, triangles, 'case.obj')));
  return { r, problems: inspectProblems(r) };
}

/** Paths of every number in `x` that is NaN or infinite. */
function nonFinite(x: unknown, path = ''): string[] {
  if (typeof x === 'number') return Number.isFinite(x) ? [] : [path];
  if (x && typeof x === 'object') return Object.entries(x).flatMap(([k, v]) => nonFinite(v, `${path}.${k}`));
  return [];
}

describe('inspect: degenerate meshes are not healthy', () => {
  it('clean sphere: no problems, residual 0 (Descartes: total defect 4π)', () => {
    const s = icosphere(2);
    const { r, problems } = inspect(s.positions, s.triangles);
    expect(problems).toEqual([]);
    expect(r.zeroAreaTriangles + r.capTriangles + r.needleTriangles + r.duplicateFacesDropped).toBe(0);
    expect(Math.abs(r.gaussBonnetResidual)).toBeLessThan(1e-9);
  });
  it('every vertex identical: every triangle zero-area, flagged; Gauss–Bonnet residual 0, no NaN', () => {
    const s = icosphere(2);
    const { r, problems } = inspect(new Float64Array(s.positions.length).fill(3), s.triangles);
    expect(r.zeroAreaTriangles).toBe(r.triangles);
    expect(r.zeroLengthEdges).toBe(r.edges);
    expect(problems.join('; ')).toMatch(/every triangle has zero area/);
    expect(Math.abs(r.gaussBonnetResidual)).toBeLessThan(1e-9); // was 2π·(V − 2) ≈ 1005 rad for this sphere
    expect(nonFinite(r)).toEqual([]);
    expect(r.area).toBe(0);
  });
  it('collinear, cap and needle triangles are counted and located (file faces)', () => {
    // unit grid 2×1 (4 triangles, faces 0..3) plus three loose triangles far away:
    // face 4 collinear (0° / 180°), face 5 a cap (170°), face 6 a needle (apex 2·atan(0.5/20) ≈ 2.86°)
    const g = flatGrid(2, 1);
    const pos = [...g.positions];
    const add = (x: number, y: number) => (pos.push(x, y, 0), pos.length / 3 - 1);
    const tri = [...g.triangles];
    const c0 = add(10, 0), c1 = add(11, 0), c2 = add(12, 0);
    tri.push(c0, c1, c2);
    const k0 = add(20, 0), k1 = add(22, 0), k2 = add(21, Math.tan((5 * Math.PI) / 180)); // base angles 5°: apex 170°
    tri.push(k0, k1, k2);
    const n0 = add(30, 0), n1 = add(31, 0), n2 = add(30.5, 20);
    tri.push(n0, n1, n2);
    const { r, problems } = inspect(Float64Array.from(pos), tri);
    expect(r.zeroAreaTriangles).toBe(1);
    expect(r.locations.zeroAreaTriangles).toEqual([4]);
    expect(r.capTriangles).toBe(1);
    expect(r.locations.capTriangles).toEqual([5]);
    expect(r.needleTriangles).toBe(1);
    expect(r.locations.needleTriangles).toEqual([6]);
    const text = problems.join('; ');
    expect(text).toMatch(/1 zero-area triangle\(s\) \(first: face 4\)/);
    expect(text).toMatch(/1 cap triangle\(s\) \(an angle ≥ 160°\) \(first: face 5\)/);
    expect(text).toMatch(/1 needle triangle\(s\) \(an angle ≤ 5°\) \(first: face 6\)/);
    expect(r.minAngleDeg).toBe(0);
    expect(r.maxAngleDeg).toBeCloseTo(180, 10);
  });
  it('duplicate faces are reported as duplicates, not as non-manifold edges, flips or extra pieces', () => {
    const s = icosphere(1);
    const nf = s.triangles.length / 3;
    const tri = [...s.triangles, s.triangles[0]!, s.triangles[2]!, s.triangles[1]!, ...s.triangles.subarray(30, 33)];
    const { r, problems } = inspect(s.positions, tri);
    expect(r.duplicateFacesDropped).toBe(2);
    expect(r.locations.duplicateFaces).toEqual([
      { face: nf, of: 0 },
      { face: nf + 1, of: 10 },
    ]);
    expect(r.nonManifoldEdges).toBe(0);
    expect(r.nonManifoldVertices).toBe(0);
    expect(r.flippedFaces).toBe(0);
    expect(r.components).toBe(1);
    expect(r.eulerCharacteristic).toBe(2);
    expect(r.triangles).toBe(nf);
    expect(problems).toEqual([`2 duplicate face(s) dropped (first: face ${nf} repeats face 0)`]);
  });
  it('a quad repeated from another corner (so cut along the other diagonal) is found as a duplicate face', () => {
    // two unit quads side by side (faces 0, 1) and face 0 again as face 2, listed from another corner
    const positions = Float64Array.from([0, 0, 0, 1, 0, 0, 2, 0, 0, 0, 1, 0, 1, 1, 0, 2, 1, 0]);
    const data = {
      ...meshFromTriangles(positions, [], 'quads.obj'),
      faceOffsets: Uint32Array.from([0, 4, 8, 12]),
      faceIndices: Uint32Array.from([0, 1, 4, 3, 1, 2, 5, 4, 1, 4, 3, 0]),
    };
    const r = inspectSurface(surfaceFromMeshData(data));
    expect(r.faces).toBe(3);
    expect(r.triangles).toBe(4);
    expect(r.duplicateFacesDropped).toBe(1);
    expect(r.locations.duplicateFaces).toEqual([{ face: 2, of: 0 }]);
    expect(r.eulerCharacteristic).toBe(1); // a disc (rectangle)
    expect(r.nonManifoldEdges).toBe(0);
  });
  it('Möbius strip of 60 quads: not orientable, χ = 0, 240 edges, 1 boundary loop, no non-manifold vertex', () => {
    const n = 60, positions = new Float64Array(3 * 2 * n), tri: number[] = [];
    for (let i = 0; i < n; i++) {
      const u = (2 * Math.PI * i) / n;
      for (let j = 0; j < 2; j++) {
        const s = j - 0.5, r = 3 + s * Math.cos(u / 2);
        positions.set([r * Math.cos(u), r * Math.sin(u), s * Math.sin(u / 2)], 3 * (2 * i + j));
      }
    }
    for (let i = 0; i < n; i++) {
      const a = 2 * i, b = 2 * i + 1;
      const c = i < n - 1 ? 2 * i + 2 : 1, d = i < n - 1 ? 2 * i + 3 : 0; // half twist at the seam
      tri.push(a, c, b, b, c, d);
    }
    const { r, problems } = inspect(positions, tri);
    expect(r.orientable).toBe(false);
    expect(r.genus).toBe(null);
    expect(r.edges).toBe(240);
    expect(r.eulerCharacteristic).toBe(0);
    expect(r.boundaryLoops).toBe(1);
    expect(r.nonManifoldVertices).toBe(0);
    expect(r.components).toBe(1);
    expect(Math.abs(r.gaussBonnetResidual)).toBeLessThan(1e-9);
    expect(problems).toEqual(['not orientable']);
    expect(r.problems).toEqual(problems); // the same list in --json
  });
  it('a 40 000-triangle fan is a disc and healthy apart from its needles (valence 40 000 at the centre)', () => {
    const s = fanDisc(40000);
    const { r } = inspect(s.positions, s.triangles);
    expect(r.eulerCharacteristic).toBe(1);
    expect(r.boundaryLoops).toBe(1);
    expect(r.needleTriangles).toBe(40000); // apex angle 2π/40000 ≈ 0.009°
    expect(Math.abs(r.gaussBonnetResidual)).toBeLessThan(1e-8);
  });
});
