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
import { icosphere, cylinder, torus, flatGrid, terrain, transform } from '../fixtures/shapes.js';
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
