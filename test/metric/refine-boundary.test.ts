/**
 * The boundary splits of the heat triangulation done incrementally
 * (src/metric/refine-boundary.ts) against the plain form they replace: each
 * round every boundary edge facing an obtuse corner bisected
 * (splitObtuseBoundary), then every edge of the whole mesh flipped to
 * Delaunay (intrinsicDelaunay). Lawson's flip algorithm only needs the edges
 * whose faces changed (an edge keeps the Delaunay property while both its
 * faces stay: common practice since Lawson 1977), so the two must give the
 * same triangulation to the bit (faces, twins, edge ids, lengths, vertex
 * anchors and origins; which half of an edge represents it may differ), on
 * meshes not made for this test: a
 * scan-like terrain (random points, Delaunay), a fan-triangulated strip, a
 * CAD-style part. Afterwards no boundary edge faces an obtuse corner and
 * every interior edge is Delaunay.
 */
import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { next, prev } from '../../src/mesh/topology.js';
import { intrinsicFromPositions, type IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { intrinsicDelaunay, edgeCotanSum } from '../../src/metric/delaunay.js';
import { mollify } from '../../src/metric/mollify.js';
import { splitObtuseBoundary, refineLongEdges, equilateralEdge } from '../../src/metric/refine.js';
import { splitBoundaryToDelaunay, refineToDelaunay } from '../../src/metric/refine-boundary.js';
import { cotOpposite } from '../../src/metric/triangle.js';
import { scanTerrain, cadPart } from '../bench/meshes.js';
import { fanStrip, type Shape } from '../fixtures/shapes.js';

function delaunayOf(s: Shape): IntrinsicMesh {
  const { topology } = buildTopology(s.triangles, s.positions.length / 3);
  return intrinsicDelaunay(mollify(intrinsicFromPositions(topology, s.positions)).mesh).mesh;
}

/** The plain rounds: split every obtuse-facing boundary edge, flip the whole mesh, again. */
function plainRounds(m: IntrinsicMesh, cap: number): { mesh: IntrinsicMesh; inserted: number; rounds: number } {
  let inserted = 0, rounds = 0;
  for (; rounds < 64; rounds++) {
    const b = splitObtuseBoundary(m, cap - inserted);
    inserted += b.inserted;
    if (b.inserted === 0) break;
    m = intrinsicDelaunay(b.mesh).mesh;
  }
  return { mesh: m, inserted, rounds };
}

function sameMesh(a: IntrinsicMesh, b: IntrinsicMesh): boolean {
  const ta = a.topology, tb = b.topology;
  if (ta.nv !== tb.nv || ta.nf !== tb.nf || ta.ne !== tb.ne) return false;
  for (let i = 0; i < ta.tri.length; i++) if (ta.tri[i] !== tb.tri[i] || ta.twin[i] !== tb.twin[i] || ta.edgeOf[i] !== tb.edgeOf[i]) return false;
  // an edge's half-edge may be either of its two (the flips ran in another order): a valid one of the same edge
  for (let e = 0; e < ta.ne; e++) if (!Object.is(a.edgeLength[e], b.edgeLength[e]) || tb.edgeOf[tb.edgeHalfedge[e]!] !== e) return false;
  for (let v = 0; v < ta.nv; v++) if (ta.vertexHalfedge[v] !== tb.vertexHalfedge[v] || ta.vertexOrigin[v] !== tb.vertexOrigin[v]) return false;
  for (let f = 0; f < ta.nf; f++) if (ta.faceOrigin[f] !== tb.faceOrigin[f]) return false;
  return true;
}

const cases: [string, () => Shape][] = [
  ['scan-like terrain, 20k faces', () => scanTerrain(20_000, 11)],
  ['scan-like terrain, 60k faces, another seed', () => scanTerrain(60_000, 4)],
  ['fan-triangulated strip', () => fanStrip()],
  ['CAD-style part', () => cadPart(20_000, 3)],
];

describe('splitBoundaryToDelaunay: incremental rounds', () => {
  for (const [name, make] of cases) {
    it(`gives the plain rounds' triangulation to the bit: ${name}`, () => {
      const m = delaunayOf(make());
      const cap = Math.max(1000, m.topology.nv);
      const plain = plainRounds(m, cap);
      const r = splitBoundaryToDelaunay(m, cap, 64);
      expect(r.inserted).toBe(plain.inserted);
      expect(r.rounds).toBe(plain.rounds);
      expect(r.capped || r.roundsCapped).toBe(false);
      expect(sameMesh(r.mesh, plain.mesh)).toBe(true);
      const t = r.mesh.topology, L = r.mesh.edgeLength;
      let obtuse = 0, notDelaunay = 0;
      for (let e = 0; e < t.ne; e++) {
        const h = t.edgeHalfedge[e]!;
        if (t.twin[h]! < 0) {
          if (cotOpposite(L[e]!, L[t.edgeOf[next(h)]!]!, L[t.edgeOf[prev(h)]!]!) < -1e-9) obtuse++;
        } else if (edgeCotanSum(t, L, h) < -1e-9) notDelaunay++;
      }
      expect(obtuse).toBe(0);
      expect(notDelaunay).toBe(0);
    });
  }

  for (const [name, make] of cases) {
    it(`refineToDelaunay gives the plain chain's triangulation (long edges, all flips, plain rounds): ${name}`, () => {
      const m = delaunayOf(make());
      const cap = Math.max(1000, m.topology.nv), maxLength = 3 * equilateralEdge(m);
      const ref = refineLongEdges(m, maxLength, cap);
      const plain = plainRounds(ref.inserted > 0 ? intrinsicDelaunay(ref.mesh).mesh : m, cap - ref.inserted);
      const r = refineToDelaunay(m, maxLength, cap, 64);
      expect(r.inserted).toBe(ref.inserted + plain.inserted);
      expect(sameMesh(r.mesh, plain.mesh)).toBe(true);
    });
  }

  it('long edges on a scan-like terrain (its hull has long edges) and a tighter cap: the same as the plain chain', () => {
    const m = delaunayOf(scanTerrain(40_000, 2));
    const maxLength = 1.5 * equilateralEdge(m);
    for (const cap of [50, 100_000]) {
      const ref = refineLongEdges(m, maxLength, cap);
      const plain = ref.capped ? { mesh: intrinsicDelaunay(ref.mesh).mesh, inserted: 0 } : plainRounds(intrinsicDelaunay(ref.mesh).mesh, cap - ref.inserted);
      const r = refineToDelaunay(m, maxLength, cap, 64);
      expect(ref.inserted).toBeGreaterThan(0);
      expect(r.capped).toBe(ref.capped);
      expect(r.inserted).toBe(ref.inserted + plain.inserted);
      expect(sameMesh(r.mesh, plain.mesh)).toBe(true);
    }
  });

  it('returns the input itself when no boundary edge faces an obtuse corner, and says when the caps stop it', () => {
    const m = delaunayOf(scanTerrain(20_000, 11));
    const done = splitBoundaryToDelaunay(m, 100_000, 64).mesh;
    expect(splitBoundaryToDelaunay(done, 100, 64)).toMatchObject({ mesh: done, inserted: 0, rounds: 0, capped: false, roundsCapped: false });
    expect(splitBoundaryToDelaunay(m, 5, 64)).toMatchObject({ inserted: 5, capped: true });
    expect(splitBoundaryToDelaunay(m, 100_000, 1)).toMatchObject({ rounds: 1, roundsCapped: true });
    expect(splitBoundaryToDelaunay(m, 0, 64)).toMatchObject({ mesh: m, inserted: 0, capped: true });
  });
});
