/**
 * Curvature checks against closed forms and theorems.
 *
 * - Discrete Gauss–Bonnet / Descartes' theorem: on any closed polyhedral
 *   surface the angle defects sum to exactly 2π·χ (χ = 2 − 2g). Exact for
 *   polyhedra, so checked to 1e-9.
 * - Sphere of radius R: Gaussian curvature 1/R², mean curvature 1/R (do Carmo,
 *   Differential Geometry of Curves and Surfaces, 1976).
 * - Cylinder: intrinsically flat (developable), two boundary circles, χ = 0.
 */
import { describe, expect, it } from 'vitest';
import { icosphere, cylinder, torus, flatGrid, terrain, transform, gridTriangles } from '../fixtures/shapes.js';
import { genusTwoSlab } from '../fixtures/voxels.js';
import { buildTopology } from '../../src/mesh/build.js';
import { components } from '../../src/mesh/components.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { gaussianCurvature, meanCurvature, gaussBonnetResidual } from '../../src/metric/curvature.js';
import type { Shape } from '../fixtures/shapes.js';

function analyse(s: Shape) {
  const { topology: t } = buildTopology(s.triangles, s.positions.length / 3);
  const im = intrinsicFromPositions(t, s.positions);
  const c = gaussianCurvature(im);
  const comps = components(t);
  const chi = comps.info.reduce((a, x) => a + x.eulerCharacteristic, 0);
  const H = meanCurvature(im, s.positions, c.vertexArea, c.boundary);
  return { t, c, chi, H, comps };
}

describe('Gauss–Bonnet on closed meshes (Descartes / discrete Gauss–Bonnet, exact for polyhedra)', () => {
  it('sphere: total angle defect 4π, χ = 2', () => {
    const { c, chi } = analyse(icosphere(3, 2.5));
    expect(chi).toBe(2);
    expect(Math.abs(c.totalInteriorDefect - 4 * Math.PI)).toBeLessThan(1e-9);
  });
  it('torus: total angle defect 0, χ = 0, genus 1', () => {
    const { c, chi, comps } = analyse(torus(40, 16, 3, 1));
    expect(chi).toBe(0);
    expect(comps.info[0]!.genus).toBe(1);
    expect(Math.abs(c.totalInteriorDefect)).toBeLessThan(1e-9);
  });
  it('genus-2 voxel slab: total angle defect −4π, χ = −2', () => {
    const { c, chi, comps } = analyse(genusTwoSlab());
    expect(chi).toBe(-2);
    expect(comps.info[0]!.genus).toBe(2);
    expect(Math.abs(c.totalInteriorDefect + 4 * Math.PI)).toBeLessThan(1e-9);
  });
  it('the residual is zero after a rigid motion and scaling too', () => {
    const s = transform(icosphere(2), 0.7, [1e5, -2e5, 30], 1e-3);
    const { c, chi } = analyse(s);
    expect(Math.abs(gaussBonnetResidual(c, chi))).toBeLessThan(1e-9);
  });
});

describe('sphere of radius R (do Carmo 1976: K = 1/R², H = 1/R)', () => {
  for (const R of [1, 7.5]) {
    it(`R = ${R}: area-weighted mean Gaussian curvature ≈ 1/R², every H ≈ 1/R`, () => {
      const { c, H, t } = analyse(icosphere(4, R));
      // area-weighted mean of K = total defect / total area = 4π / area(mesh) → 1/R² as the mesh refines
      let area = 0, defect = 0;
      for (let v = 0; v < t.nv; v++) {
        area += c.vertexArea[v]!;
        defect += c.angleDefect[v]!;
      }
      expect(Math.abs(defect / area - 1 / R ** 2) * R ** 2).toBeLessThan(0.01);
      // pointwise mean curvature within 2% on a level-4 icosphere (refinement makes it tighter)
      let worst = 0;
      for (let v = 0; v < t.nv; v++) worst = Math.max(worst, Math.abs(H[v]! * R - 1));
      expect(worst).toBeLessThan(0.02);
    });
  }
});

describe('cylinder (developable: intrinsically flat)', () => {
  it('two boundary loops, χ = 0, interior defects 0, Gauss–Bonnet with boundary turning', () => {
    const { c, chi, comps } = analyse(cylinder(32, 10, 2, 5));
    expect(comps.info[0]!.boundaryLoops).toBe(2);
    expect(chi).toBe(0);
    for (let v = 0; v < c.angleDefect.length; v++) if (!c.boundary[v]) expect(Math.abs(c.angleDefect[v]!)).toBeLessThan(1e-12);
    // discrete Gauss–Bonnet with boundary: Σ defects + Σ turning = 2πχ = 0
    expect(Math.abs(gaussBonnetResidual(c, chi))).toBeLessThan(1e-9);
  });
});

describe('flat meshes (common practice: a planar triangulation has zero interior defect)', () => {
  it('jittered flat grid: interior defects 0, boundary turning sums to 2π (disc, χ = 1)', () => {
    const { c, chi, H } = analyse(flatGrid(20, 15, 3, 2, 0.2, 4));
    expect(chi).toBe(1);
    for (let v = 0; v < c.angleDefect.length; v++) {
      if (!c.boundary[v]) {
        expect(Math.abs(c.angleDefect[v]!)).toBeLessThan(1e-12);
        expect(Math.abs(H[v]!)).toBeLessThan(1e-9);
      }
    }
    expect(Math.abs(c.totalBoundaryTurning - 2 * Math.PI)).toBeLessThan(1e-9);
  });
  it('terrain is a disc: Gauss–Bonnet residual vanishes although the surface is curved', () => {
    const { c, chi } = analyse(terrain(30, 30, 10, 10, (x, y) => Math.sin(x) * Math.cos(y)));
    expect(chi).toBe(1);
    expect(Math.abs(gaussBonnetResidual(c, chi))).toBeLessThan(1e-9);
    expect(c.totalInteriorDefect).not.toBe(0);
  });
});

describe('degenerate and sliver meshes (flat ⇒ K = 0; Gauss–Bonnet: Σ defects + Σ turning = 2πχ on any polyhedral surface)', () => {
  it('flat strip of caps and needles (height 2e-9 over unit cells): every interior K and defect exactly 0', () => {
    // the planar surface is flat, K = 0 (common practice); lengths of such caps cannot resolve their
    // small angles, so the defect noise (~1e-8 rad over areas ~1e-9 gave |K| ≈ 13 before) is below the bound
    for (const d of [1e-3, 1e-6, 1e-9]) {
      const nx = 20, ny = 2;
      const positions = new Float64Array(3 * (nx + 1) * (ny + 1));
      for (let j = 0; j <= ny; j++) {
        for (let i = 0; i <= nx; i++) {
          const v = j * (nx + 1) + i;
          positions[3 * v] = i + 0.37 * j; // sheared: every triangle is a needle or a cap
          positions[3 * v + 1] = j * d;
        }
      }
      const { c, chi } = analyse({ positions, triangles: gridTriangles(nx, ny) });
      expect(chi).toBe(1);
      let interior = 0;
      for (let v = 0; v < c.angleDefect.length; v++) {
        expect(Number.isFinite(c.gaussian[v]!)).toBe(true);
        if (c.boundary[v]) continue;
        interior++;
        expect(c.gaussian[v]).toBe(0);
        expect(c.angleDefect[v]).toBe(0);
      }
      expect(interior).toBe(nx - 1);
      expect(Math.abs(gaussBonnetResidual(c, chi))).toBeLessThan(1e-9);
    }
  });
  it('tilted flat sliver strip: H = 0 (flat); thin-ring cylinder keeps H = 1/(2R) (do Carmo 1976)', () => {
    // a plane has H = 0; the normal of a sliver rounds badly, and the in-plane Laplacian then had a
    // normal part of pure noise (|H| ≈ 2e8 at height 2e-9): within its rounding bound H is 0
    for (const d of [1e-3, 1e-6, 1e-9]) {
      const nx = 20, ny = 2, positions = new Float64Array(3 * (nx + 1) * (ny + 1));
      for (let j = 0; j <= ny; j++) {
        for (let i = 0; i <= nx; i++) positions.set([i + 0.37 * j, j * d, 0], 3 * (j * (nx + 1) + i));
      }
      const { c, H } = analyse(transform({ positions, triangles: gridTriangles(nx, ny) }, 0.7, [3, -2, 5]));
      for (let v = 0; v < H.length; v++) if (!c.boundary[v]) expect(H[v]).toBe(0);
    }
    // rings 2.5e-4 tall and 0.2 wide (aspect ≈ 800) at an offset: still resolved, |H| = 1/(2R) = 0.25
    const { c, H } = analyse(transform(cylinder(64, 4, 2, 1e-3), 0.3, [1000, 2000, -500]));
    for (let v = 0; v < H.length; v++) if (!c.boundary[v]) expect(Math.abs(Math.abs(H[v]!) - 0.25)).toBeLessThan(1e-5);
  });
  it('flat mesh with a collinear (zero-area) triangle under a T-junction: raw interior defects 0, Gauss–Bonnet exact', () => {
    // square 0..2 × 0..1 fanned from (1, 0.5); the bottom side carries the midpoint 1 = (1, 0) and the
    // collinear triangle 1-0-2 closes it, so vertex 1 is interior with angles θ + θ' + π = 2π (flat: defect 0)
    const positions = Float64Array.from([0, 0, 0, 1, 0, 0, 2, 0, 0, 0, 1, 0, 2, 1, 0, 1, 0.5, 0]);
    const triangles = Uint32Array.from([0, 1, 5, 1, 2, 5, 2, 4, 5, 4, 3, 5, 3, 0, 5, 1, 0, 2]);
    const { c, chi } = analyse({ positions, triangles });
    expect(chi).toBe(1);
    expect(c.boundary[1]).toBe(0);
    expect(c.boundary[5]).toBe(0);
    expect(Math.abs(c.totalInteriorDefect)).toBeLessThan(1e-15); // unrounded defects of vertices 1 and 5
    expect(c.gaussian[1]).toBe(0);
    expect(c.gaussian[5]).toBe(0);
    expect(Math.abs(c.totalBoundaryTurning - 2 * Math.PI)).toBeLessThan(1e-12); // a disc: 2πχ = 2π
  });
  it('every vertex at one point: no NaN, K = 0 with every interior vertex counted as zero-area, Gauss–Bonnet residual 0', () => {
    // a collapsed sphere keeps χ = 2; with angles of π/3 (the documented convention) Σ defects =
    // 2πV − πF = 2πχ exactly (Descartes), where the old angles (all 0) left a residual of 2π·(V − 2)
    const s = icosphere(1);
    const positions = new Float64Array(s.positions.length).fill(0.25);
    const { c, chi, t } = analyse({ positions, triangles: s.triangles });
    expect(chi).toBe(2);
    expect(c.zeroAreaVertices).toBe(t.nv);
    for (let v = 0; v < t.nv; v++) expect(c.gaussian[v]).toBe(0);
    expect(Math.abs(gaussBonnetResidual(c, chi))).toBeLessThan(1e-12);
  });
  it('Möbius strip in space: defects and turning sum to 2πχ = 0 on the surface as given (seams glued)', () => {
    // χ(Möbius strip) = 0 (standard topology); the combinatorial Gauss–Bonnet identity holds on any
    // triangulated surface, orientable or not
    const n = 48, w = 3, R = 3, positions = new Float64Array(3 * n * (w + 1)), tri: number[] = [];
    const id = (i: number, j: number) => (i % n) * (w + 1) + j;
    for (let i = 0; i < n; i++) {
      const u = (2 * Math.PI * i) / n;
      for (let j = 0; j <= w; j++) {
        const s = j / w - 0.5; // across the band; half a turn of the band per loop
        const r = R + s * Math.cos(u / 2);
        positions.set([r * Math.cos(u), r * Math.sin(u), s * Math.sin(u / 2)], 3 * id(i, j));
      }
    }
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < w; j++) {
        const a = id(i, j), b = id(i, j + 1);
        const c = i < n - 1 ? id(i + 1, j) : id(0, w - j), d = i < n - 1 ? id(i + 1, j + 1) : id(0, w - j - 1);
        tri.push(a, c, b, b, c, d);
      }
    }
    const { topology: t, report } = buildTopology(tri, n * (w + 1));
    expect(report.nonOrientableComponents).toBe(1);
    const im = intrinsicFromPositions(t, new Float64Array(Array.from(t.vertexOrigin).flatMap((o) => [positions[3 * o]!, positions[3 * o + 1]!, positions[3 * o + 2]!])));
    const c = gaussianCurvature(im, report.orientationSeams);
    const chi = components(t, report.orientationSeams).info.reduce((a, x) => a + x.eulerCharacteristic, 0);
    expect(chi).toBe(0);
    expect(Math.abs(gaussBonnetResidual(c, chi))).toBeLessThan(1e-9);
    // counted on the cut topology instead (a disc, χ = 1) the identity holds too, with 2π more:
    // the seam's copies of interior vertices become boundary vertices there
    const cut = gaussianCurvature(im);
    const chiCut = components(t).info.reduce((a, x) => a + x.eulerCharacteristic, 0);
    expect(chiCut).toBe(1);
    expect(Math.abs(gaussBonnetResidual(cut, chiCut))).toBeLessThan(1e-9);
  });
  it('Möbius strip: |H| and K at each vertex do not depend on where the orientation seam falls', () => {
    // curvature is a property of the surface (do Carmo 1976), not of the cut that gives it half-edges:
    // listing the faces from another start moves the breadth-first seam elsewhere
    const n = 40, w = 2, positions = new Float64Array(3 * n * (w + 1)), tri: number[] = [];
    const id = (i: number, j: number) => (i % n) * (w + 1) + j;
    for (let i = 0; i < n; i++) {
      const u = (2 * Math.PI * i) / n;
      for (let j = 0; j <= w; j++) {
        const s = j / w - 0.5, r = 3 + s * Math.cos(u / 2);
        positions.set([r * Math.cos(u), r * Math.sin(u), s * Math.sin(u / 2)], 3 * id(i, j));
      }
    }
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < w; j++) {
        const a = id(i, j), b = id(i, j + 1);
        const c = i < n - 1 ? id(i + 1, j) : id(0, w - j), d = i < n - 1 ? id(i + 1, j + 1) : id(0, w - j - 1);
        tri.push(a, c, b, b, c, d);
      }
    }
    const nf = tri.length / 3;
    const perVertex = (faces: number[], firstFace: number) => {
      const { topology: t, report } = buildTopology(faces, n * (w + 1));
      const pos = new Float64Array(Array.from(t.vertexOrigin).flatMap((o) => [positions[3 * o]!, positions[3 * o + 1]!, positions[3 * o + 2]!]));
      const im = intrinsicFromPositions(t, pos);
      const c = gaussianCurvature(im, report.orientationSeams);
      const H = meanCurvature(im, pos, c.vertexArea, c.boundary, report.orientationSeams);
      const K = new Float64Array(n * (w + 1)), absH = new Float64Array(n * (w + 1));
      for (let v = 0; v < t.nv; v++) {
        K[t.vertexOrigin[v]!] = c.gaussian[v]!;
        absH[t.vertexOrigin[v]!] = Math.abs(H[v]!);
      }
      const original = (h: number) => (t.faceOrigin[(h / 3) | 0]! + firstFace) % nf; // face index in `tri`
      return { K, absH, seamFaces: new Set(Array.from(report.orientationSeams, original)) };
    };
    const a = perVertex(tri, 0);
    const shift = 3 * w * 2 * (n / 2); // start the list half-way round the band
    const b = perVertex([...tri.slice(shift), ...tri.slice(0, shift)], shift / 3);
    expect(a.seamFaces.size).toBeGreaterThan(0);
    expect([...a.seamFaces].some((f) => b.seamFaces.has(f))).toBe(false); // the seams lie apart
    for (let v = 0; v < n * (w + 1); v++) {
      expect(Math.abs(a.K[v]! - b.K[v]!)).toBeLessThan(1e-9);
      expect(Math.abs(a.absH[v]! - b.absH[v]!)).toBeLessThan(1e-9);
    }
  });
});
