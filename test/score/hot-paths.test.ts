/**
 * The shortcuts `score` takes on its hot path give the numbers of the plain
 * calls, bit for bit (scores must not change when the code gets faster):
 * - `hypot3` against V8's `Math.hypot`, the builtin it replaces (the
 *   reference: the same function the lengths were computed with before);
 * - `inspectSurface` and `curvatureSummary` handed the parts `score` shares
 *   (the intrinsic mesh, the angle-defect totals) against the same calls
 *   making them themselves (common practice: a regression check).
 */
import { describe, expect, it } from 'vitest';
import { hypot3, intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { inspectSurface } from '../../src/report/inspect.js';
import { curvatureSummary } from '../../src/report/curvature.js';
import { surfaceFromMeshData } from '../../src/mesh/surface.js';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { selectInPlace } from '../../src/score/select.js';
import { triangleQuality, nearestRank } from '../../src/score/quality.js';
import { radiusRatio, cornerAngles, halfedgeCotans, faceAreas } from '../../src/metric/triangle.js';
import { mixedVoronoiVertexAreas } from '../../src/metric/vertex-areas.js';
import { rng, terrain, torus } from '../fixtures/shapes.js';

describe('hypot3', () => {
  it('equals Math.hypot bit for bit (V8 builtin as reference), special values included', () => {
    const special = [0, -0, 1, -1, 3, 4, 5e-324, 2.2250738585072014e-308, 1.7976931348623157e308, Infinity, -Infinity, NaN, 1e-300, 1e300];
    const same = (x: number, y: number, z: number) => Object.is(hypot3(x, y, z), Math.hypot(x, y, z));
    for (const x of special) for (const y of special) for (const z of special) expect(same(x, y, z), `${x}, ${y}, ${z}`).toBe(true);
    const r = rng(7);
    const bits = new Float64Array(1), words = new Uint32Array(bits.buffer);
    let bad = 0;
    for (let i = 0; i < 200_000; i++) {
      const v: number[] = [];
      for (let k = 0; k < 3; k++) {
        if (i % 3 === 0) {
          // any bit pattern: every exponent, subnormals, NaN payloads
          words[0] = Math.floor(r() * 2 ** 32);
          words[1] = Math.floor(r() * 2 ** 32);
          v.push(bits[0]!);
        } else {
          v.push((r() - 0.5) * 10 ** Math.floor(r() * 24 - 12) + (i % 3 === 1 ? 1e6 * r() : 0));
        }
      }
      if (!same(v[0]!, v[1]!, v[2]!)) bad++;
    }
    expect(bad).toBe(0);
    expect(hypot3(3, 4, 12)).toBe(13); // the Pythagorean quadruple 3² + 4² + 12² = 13² (closed form)
  });
});

describe('reports given the parts score shares', () => {
  const r = rng(3);
  const shapes = [
    terrain(14, 11, 40, 30, (x, y) => Math.sin(x / 5) * Math.cos(y / 7) + 0.2 * r()),
    torus(24, 9, 2, 0.7),
  ];
  // a Möbius strip too: non-orientable, so the seam copies are glued in the curvature
  const mobius = (() => {
    const n = 30, positions: number[] = [], triangles: number[] = [];
    for (let i = 0; i < n; i++) {
      const a = (2 * Math.PI * i) / n;
      for (const w of [-0.3, 0.3]) positions.push((1 + w * Math.cos(a / 2)) * Math.cos(a), (1 + w * Math.cos(a / 2)) * Math.sin(a), w * Math.sin(a / 2));
    }
    for (let i = 0; i < n; i++) {
      const j = (i + 1) % n;
      const [b0, b1] = j === 0 ? [1, 0] : [2 * j, 2 * j + 1];
      triangles.push(2 * i, b0, 2 * i + 1, 2 * i + 1, b0, b1);
    }
    return { positions: Float64Array.from(positions), triangles: Uint32Array.from(triangles) };
  })();
  shapes.push(mobius);
  for (const [i, shape] of shapes.entries()) {
    it(`inspect and curvature: the same report, bit for bit (shape ${i})`, () => {
      const s = surfaceFromMeshData(meshFromTriangles(shape.positions, shape.triangles, 'case.obj'));
      if (i === 2) expect(s.report.orientationSeams.length).toBeGreaterThan(0); // the strip is cut to be oriented
      const im = intrinsicFromPositions(s.topology, s.positions);
      const faces = { angles: cornerAngles(im), cotans: halfedgeCotans(im), areas: faceAreas(im) };
      const plainCurv = curvatureSummary(s);
      const sharedCurv = curvatureSummary(s, im, faces);
      expect(sharedCurv.summary).toStrictEqual(plainCurv.summary);
      expect(sharedCurv.meanCurvature).toStrictEqual(plainCurv.meanCurvature);
      expect(sharedCurv.gaussianCurvature).toStrictEqual(plainCurv.gaussianCurvature);
      const c = sharedCurv.summary;
      const shared = inspectSurface(s, {
        intrinsic: im,
        angles: faces.angles,
        areas: faces.areas,
        curvature: { totalInteriorDefect: c.totalAngleDefect, totalBoundaryTurning: c.totalBoundaryTurning, zeroAreaVertices: c.zeroAreaVertices },
      });
      expect(shared).toStrictEqual(inspectSurface(s));
      expect(mixedVoronoiVertexAreas(im, undefined, faces)).toStrictEqual(mixedVoronoiVertexAreas(im));
    });
  }
});

describe('selectInPlace (Hoare 1961, FIND)', () => {
  it('gives the k-th value of the sorted array (the definition of the order statistic), ties and sizes 1…300', () => {
    const r = rng(11);
    for (let n = 1; n <= 300; n++) {
      // few distinct values half the time (ties), otherwise spread; one sorted and one reversed input per size
      const a = Float64Array.from({ length: n }, (_, i) =>
        n % 5 === 0 ? i : n % 5 === 1 ? n - i : n % 2 ? Math.floor(r() * 4) : r() * 1e3 - 500);
      const sorted = a.slice().sort();
      for (const k of [0, n - 1, Math.floor(n / 2), Math.floor(r() * n)]) {
        const b = a.slice();
        expect(selectInPlace(b, k)).toBe(sorted[k]);
        for (let i = 0; i < k; i++) expect(b[i]!).toBeLessThanOrEqual(b[k]!);
        for (let i = k + 1; i < n; i++) expect(b[i]!).toBeGreaterThanOrEqual(b[k]!);
      }
    }
  });

  it('triangleQuality quantiles equal the nearest-rank values of the sorted ratios (Hyndman & Fan 1996, definition 1)', () => {
    const r = rng(5);
    const shape = terrain(30, 25, 40, 30, () => 3 * r());
    const s = surfaceFromMeshData(meshFromTriangles(shape.positions, shape.triangles, 'case.obj'));
    const im = intrinsicFromPositions(s.topology, s.positions);
    const t = im.topology, L = im.edgeLength;
    const ratios = Float64Array.from({ length: t.nf }, (_, f) => radiusRatio(L[t.edgeOf[3 * f]!]!, L[t.edgeOf[3 * f + 1]!]!, L[t.edgeOf[3 * f + 2]!]!)).sort();
    const q = triangleQuality(im);
    expect([q.aspectRatioP50, q.aspectRatioP90, q.aspectRatioP99, q.aspectRatioMax]).toEqual([
      nearestRank(ratios, 0.5), nearestRank(ratios, 0.9), nearestRank(ratios, 0.99), ratios[ratios.length - 1],
    ]);
  });
});
