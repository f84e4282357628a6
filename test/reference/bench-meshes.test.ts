/**
 * The benchmark meshes users bring (test/bench/meshes.ts) are what they say,
 * at small sizes:
 * - topology by Euler's polyhedron formula V − E + F = χ: 1 for the terrains
 *   and the scan (discs), 2 for the closed part (a sphere), and a clean build
 *   (no repairs: manifold, consistently oriented);
 * - the scan is a Delaunay triangulation of its points in the plane: every
 *   interior edge is locally Delaunay (the two angles facing it sum to at most
 *   π), which for a triangulation is equivalent to the empty-circumcircle
 *   property (Delaunay 1934; the local test: Lawson 1977);
 * - the part's area tends to the surface of revolution's, given by Pappus's
 *   centroid theorem A = 2π Σ r̄ᵢ Lᵢ over the profile segments, with an error
 *   O((π/m)²) for m segments around (chord against arc);
 * - fractal noise stays within its bound Σ gainᵏ (each octave in [−1, 1]);
 * - the benchmarks' Dijkstra yardstick (harness.ts) gives the same distances
 *   as the library's edge-graph Dijkstra;
 * - every generator is deterministic for a seed and changes with it.
 */
import { describe, expect, it } from 'vitest';
import { USER_MESHES, cadPart, fractalNoise, partProfile, scanTerrain } from '../bench/meshes.js';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions } from '../../src/metric/intrinsic.js';
import { faceAreas } from '../../src/metric/triangle.js';
import { graphDistance } from '../../src/geodesic/graph.js';
import { edgeDijkstra, meshEdgeList } from '../bench/harness.js';

const FACES = 6000;

describe('benchmark meshes of the kinds users bring', () => {
  for (const [kind, make] of Object.entries(USER_MESHES)) {
    it(`${kind}: about the faces asked for, Euler characteristic, clean build, deterministic per seed`, () => {
      const s = make(FACES, 1);
      const nf = s.triangles.length / 3, nv = s.positions.length / 3;
      expect(Math.abs(nf - FACES) / FACES).toBeLessThan(0.03);
      const { topology: t, report } = buildTopology(s.triangles, nv);
      expect(t.nf).toBe(nf);
      expect(report.degenerateFaces).toHaveLength(0);
      expect(report.nonManifoldEdgeCount + report.nonManifoldVertexCount + report.flippedFaces + report.orientationCuts).toBe(0);
      expect(t.nv - t.ne + t.nf).toBe(kind === 'cad' ? 2 : 1); // Euler: sphere 2, disc 1
      for (const x of s.positions) expect(Number.isFinite(x)).toBe(true);
      const again = make(FACES, 1), other = make(FACES, 2);
      expect(again.positions).toEqual(s.positions);
      expect(again.triangles).toEqual(s.triangles);
      expect(other.positions).not.toEqual(s.positions);
    });
  }

  it('scan: every interior edge is locally Delaunay in the plane', () => {
    const s = scanTerrain(FACES, 3);
    const P = s.positions, T = s.triangles;
    const { topology: t } = buildTopology(T, P.length / 3);
    // angle at corner c facing edge (a, b), in the xy plane
    const angle = (c: number, a: number, b: number): number => {
      const ux = P[3 * a]! - P[3 * c]!, uy = P[3 * a + 1]! - P[3 * c + 1]!, vx = P[3 * b]! - P[3 * c]!, vy = P[3 * b + 1]! - P[3 * c + 1]!;
      return Math.atan2(Math.abs(ux * vy - uy * vx), ux * vx + uy * vy);
    };
    let worst = -Infinity, interior = 0;
    for (let h = 0; h < 3 * t.nf; h++) {
      const g = t.twin[h]!;
      if (g < h) continue; // boundary (−1) or counted from its twin
      interior++;
      const a = t.tri[h]!, b = t.tri[h % 3 === 2 ? h - 2 : h + 1]!;
      const c = t.tri[h % 3 === 0 ? h + 2 : h - 1]!, d = t.tri[g % 3 === 0 ? g + 2 : g - 1]!;
      worst = Math.max(worst, angle(c, a, b) + angle(d, a, b) - Math.PI);
    }
    expect(interior).toBeGreaterThan(8000);
    expect(worst).toBeLessThan(1e-9);
  });

  it('cad: area within O((π/m)²) of the revolved profile (Pappus), long thin triangles and a fan at each end', () => {
    const s = cadPart(20_000, 1);
    const { topology: t } = buildTopology(s.triangles, s.positions.length / 3);
    const m = intrinsicFromPositions(t, s.positions);
    let area = 0;
    for (const a of faceAreas(m)) area += a;
    const prof = partProfile(1);
    let pappus = 0;
    for (let i = 1; i < prof.length; i++) {
      const [r0, z0] = prof[i - 1]!, [r1, z1] = prof[i]!;
      pappus += 2 * Math.PI * ((r0 + r1) / 2) * Math.hypot(r1 - r0, z1 - z0);
    }
    const segments = Math.round(20_000 / (2 * (prof.length - 3) + 2));
    expect(Math.abs(area - pappus) / pappus).toBeLessThan(2 * (Math.PI / segments) ** 2);
    expect(area).toBeLessThan(pappus); // chords are shorter than arcs
    // fans: the two axis vertices have valence m; thin triangles: some edge ratio above 100
    let maxValence = 0;
    const valence = new Int32Array(t.nv);
    for (const v of t.tri) maxValence = Math.max(maxValence, ++valence[v]!);
    expect(maxValence).toBe(segments);
    let maxRatio = 0;
    for (let f = 0; f < t.nf; f++) {
      const l = [0, 1, 2].map((k) => m.edgeLength[t.edgeOf[3 * f + k]!]!);
      maxRatio = Math.max(maxRatio, Math.max(...l) / Math.min(...l));
    }
    expect(maxRatio).toBeGreaterThan(100);
  });

  it('the benchmarks\' one yardstick (edgeDijkstra) gives the edge-graph distances of graphDistance', () => {
    // common practice: two implementations of Dijkstra's algorithm (Numer. Math. 1, 1959) agree exactly
    const s = USER_MESHES.scan(FACES, 2);
    const m = intrinsicFromPositions(buildTopology(s.triangles, s.positions.length / 3).topology, s.positions);
    const { n, ea, eb, elen } = meshEdgeList(m);
    const a = edgeDijkstra(n, ea, eb, elen, 77);
    const b = graphDistance(m, { points: [{ kind: 'vertex', vertex: 77 }], curves: [] }).distance;
    expect(Array.from(a)).toEqual(Array.from(b));
    expect(a[77]).toBe(0);
  });

  it('fractal noise stays within Σ gain^k and is not flat', () => {
    const noise = fractalNoise(5, 6, 100, 0.5);
    const bound = (1 - 0.5 ** 6) / (1 - 0.5);
    let lo = Infinity, hi = -Infinity;
    for (let i = 0; i < 200; i++) for (let j = 0; j < 200; j++) {
      const z = noise(i * 3.7, j * 2.9);
      lo = Math.min(lo, z); hi = Math.max(hi, z);
    }
    expect(hi).toBeLessThanOrEqual(bound);
    expect(lo).toBeGreaterThanOrEqual(-bound);
    expect(hi - lo).toBeGreaterThan(0.5);
  });
});
