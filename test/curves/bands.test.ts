/**
 * Bands between levels: areas against closed forms, the tiling of the
 * surface, and the rings (outer and holes). Sources beside each check.
 */
import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions, type IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { faceAreas } from '../../src/metric/triangle.js';
import { bands, bandLevels, planArea } from '../../src/curves/bands.js';
import { isolines } from '../../src/curves/isolines.js';
import { distanceScalarField } from '../../src/curves/offset.js';
import { prepareDistance } from '../../src/geodesic/solver.js';
import { isOrthodromeError } from '../../src/errors.js';
import { terrain, type Shape } from '../fixtures/shapes.js';
import { holedPlate } from '../fixtures/holed-plates.js';

const meshOf = (s: Shape): IntrinsicMesh => intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);
const total = (m: IntrinsicMesh) => faceAreas(m).reduce((a, b) => a + b, 0);

/** Distance field from the vertex nearest the origin of a flat disc, exact method, and that vertex's offset from the origin. */
function discField(h: number) {
  const s = holedPlate(1, [], h);
  const m = meshOf(s);
  let c = 0;
  for (let v = 1; v < s.positions.length / 3; v++) if (Math.hypot(s.positions[3 * v]!, s.positions[3 * v + 1]!) < Math.hypot(s.positions[3 * c]!, s.positions[3 * c + 1]!)) c = v;
  const r = prepareDistance(m, 'exact').solve({ points: [{ kind: 'vertex', vertex: c }], curves: [] });
  return { s, m, field: distanceScalarField(r) };
}

describe('bands', () => {
  it('flat disc, distance from the centre: band area = π(r2² − r1²), error falling under refinement', () => {
    // closed form: in the plane the points at distance r1 ≤ d < r2 from a point form an annulus of
    // area π(r2² − r1²) (elementary plane geometry); the disc of radius 1 holds the annuli up to 0.6
    const levels = [0, 0.2, 0.4, 0.6];
    const errs = [0.08, 0.04].map((h) => {
      const { s, m, field } = discField(h);
      const B = bands(m.topology, s.positions, field, levels);
      let worst = 0;
      for (const b of B) {
        const want = Math.PI * (b.upper ** 2 - b.lower ** 2);
        worst = Math.max(worst, Math.abs(b.area - want) / want);
        expect(b.planArea).toBeCloseTo(b.area, 12); // flat in the xy-plane: plan view = surface (identity projection)
      }
      return worst;
    });
    expect(errs[0]!).toBeLessThan(0.02);
    expect(errs[1]!).toBeLessThan(errs[0]!);
  });

  it('the bands tile the surface: their areas add up to the total area', () => {
    // band edges from bandLevels cover the whole range, and the pieces partition each face
    // (common practice for a partition: areas are additive)
    const { s, m, field } = discField(0.1);
    const B = bands(m.topology, s.positions, field, bandLevels(field.values, 0.15), { rings: false });
    const sum = B.reduce((a, b) => a + b.area, 0);
    expect(Math.abs(sum - total(m))).toBeLessThan(1e-12 * total(m));
  });

  it('terrain: surface areas add up to the surface, plan areas to the rectangle below', () => {
    // closed form: a heightfield over [0, 3] × [0, 2] projects onto that rectangle, area 6
    // (the projection of a graph is its domain)
    const s = terrain(30, 20, 3, 2, (x, y) => Math.sin(x) * Math.cos(1.3 * y) + 0.2 * x);
    const m = meshOf(s);
    const z = new Float64Array(m.topology.nv);
    for (let v = 0; v < z.length; v++) z[v] = s.positions[3 * v + 2]!;
    const B = bands(m.topology, s.positions, { values: z }, bandLevels(z, 0.1));
    expect(Math.abs(B.reduce((a, b) => a + b.planArea, 0) - 6)).toBeLessThan(1e-12 * 6);
    expect(Math.abs(B.reduce((a, b) => a + b.area, 0) - total(m))).toBeLessThan(1e-12 * total(m));
    // each polygon's outer ring minus its holes has the band's plan area (the rings bound the band)
    for (const b of B) {
      const fromRings = b.polygons.reduce((a, p) => a + planArea(p.outer) + p.holes.reduce((x, h) => x + planArea(h), 0), 0);
      expect(Math.abs(fromRings - b.planArea)).toBeLessThan(1e-9 * 6);
    }
  });

  it('a mesh facing down (faces clockwise from +z) gives the same outer rings and holes in plan view', () => {
    // the plan view is the map seen from +z whichever way the faces point (bands.ts): reversing
    // every face changes no ring's plan-view orientation (shoelace formula)
    const { s, field } = discField(0.1);
    const down = s.triangles.slice();
    for (let k = 0; k < down.length; k += 3) { const a = down[k + 1]!; down[k + 1] = down[k + 2]!; down[k + 2] = a; }
    const md = meshOf({ positions: s.positions, triangles: down });
    const [, ring] = bands(md.topology, s.positions, field, [0, 0.25, 0.5]);
    expect(ring!.polygons.length).toBe(1);
    expect(ring!.polygons[0]!.holes.length).toBe(1);
    expect(planArea(ring!.polygons[0]!.outer)).toBeGreaterThan(0);
    expect(planArea(ring!.polygons[0]!.holes[0]!)).toBeLessThan(0);
  });

  it('an annulus band is one polygon with one hole; its rings are the isolines at its levels', () => {
    // the region r1 ≤ d < r2 about a point of a disc is an annulus: one outer ring, one hole
    // (elementary topology); the rings and the isolines share their points (one crossing rule)
    const { s, m, field } = discField(0.08);
    const [inner, ring] = bands(m.topology, s.positions, field, [0, 0.25, 0.5]);
    expect(inner!.polygons.length).toBe(1);
    expect(inner!.polygons[0]!.holes.length).toBe(0);
    expect(ring!.polygons.length).toBe(1);
    expect(ring!.polygons[0]!.holes.length).toBe(1);
    const iso = isolines(m.topology, s.positions, field, [0.25, 0.5]);
    const hole = ring!.polygons[0]!.holes[0]!, outer = ring!.polygons[0]!.outer;
    expect(planArea(outer)).toBeGreaterThan(0);
    expect(planArea(hole)).toBeLessThan(0);
    const key = (p: number[]) => p.join(',');
    expect(new Set(hole.map(key))).toEqual(new Set(iso[0]!.points.map(key)));
    expect(new Set(outer.map(key))).toEqual(new Set(iso[1]!.points.map(key)));
  });

  it('refuses levels that do not increase, and a spacing that is not positive (USAGE)', () => {
    const { s, m, field } = discField(0.2);
    const code = (f: () => unknown) => { try { f(); } catch (e) { return isOrthodromeError(e) ? e.code : 'other'; } return 'none'; };
    expect(code(() => bands(m.topology, s.positions, field, [0, 0.5, 0.5]))).toBe('USAGE');
    expect(code(() => bandLevels(field.values, 0))).toBe('USAGE');
    expect(code(() => bandLevels(field.values, 1e-9))).toBe('LIMIT');
  });
});

