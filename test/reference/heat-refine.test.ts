import { describe, it, expect } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromPositions, type IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { HeatSolver, type HeatOptions } from '../../src/geodesic/heat.js';
import { refineLongEdges } from '../../src/metric/refine.js';
import { faceGeometry } from '../../src/metric/laplacian.js';
import { boundaryLoops } from '../../src/mesh/boundary.js';
import { terrainBlock } from '../fixtures/blocks.js';
import { fanDisc, type Shape } from '../fixtures/shapes.js';

function meshOf(s: Shape): IntrinsicMesh {
  const { topology } = buildTopology(s.triangles, s.positions.length / 3);
  return intrinsicFromPositions(topology, s.positions);
}

/** Mean relative heat error against the straight-line distance from `src`, over `vs` at least `minTruth` away. */
function planarError(s: Shape, src: number, vs: number[], minTruth: number, opts: HeatOptions = {}): number {
  const d = HeatSolver.prepare(meshOf(s), opts).distance({ points: [{ kind: 'vertex', vertex: src }], curves: [] }).distance;
  const P = s.positions;
  let sum = 0, n = 0;
  for (const v of vs) {
    const g = Math.hypot(P[3 * v]! - P[3 * src]!, P[3 * v + 1]! - P[3 * src + 1]!, P[3 * v + 2]! - P[3 * src + 2]!);
    if (g < minTruth) continue;
    sum += Math.abs(d[v]! - g) / g;
    n++;
  }
  return sum / n;
}

describe('intrinsic refinement of long edges (heat method on meshes with huge faces)', () => {
  it('keeps the surface: total area, vertex count bookkeeping and boundary loops unchanged', () => {
    // bisecting an edge at its midpoint only re-triangulates the same flat faces (common practice)
    const m = meshOf(fanDisc(64));
    const r = refineLongEdges(m, 0.3, 10_000);
    expect(r.inserted).toBeGreaterThan(0);
    expect(r.mesh.topology.nv).toBe(m.topology.nv + r.inserted);
    const area = (x: IntrinsicMesh) => faceGeometry(x).area.reduce((a, b) => a + b, 0);
    expect(Math.abs(area(r.mesh) - area(m))).toBeLessThan(1e-12 * area(m));
    // Euler characteristic of a disc is 1 before and after
    const t = r.mesh.topology;
    expect(t.nv - t.ne + t.nf).toBe(1);
    expect(boundaryLoops(t).length).toBe(1);
    for (let h = 0; h < t.tri.length; h++) if (t.twin[h]! >= 0) expect(t.twin[t.twin[h]!]).toBe(h);
    for (let e = 0; e < t.ne; e++) expect(r.mesh.edgeLength[e]!).toBeLessThanOrEqual(0.3 + 1e-12);
  });

  it('flat-topped block with long-edge sides: top distances are straight lines, within 3%', () => {
    // the top of a box is a convex flat face: geodesics between its points are straight segments (elementary)
    const n = 40;
    const s = terrainBlock(n, () => 0);
    const top = Array.from({ length: (n + 1) * (n + 1) }, (_, v) => v);
    const src = 10 * (n + 1) + 10;
    const refined = planarError(s, src, top, 0.5);
    const plain = planarError(s, src, top, 0.5, { refine: false });
    expect(refined).toBeLessThan(0.03);
    // measured before the refinement existed: about 20% on this mesh
    expect(plain).toBeGreaterThan(3 * refined);
  });

  it('high-valence fan (400 thin triangles): distances from a rim vertex within 6%, better than without refinement', () => {
    // a flat disc is convex: geodesic distance = straight-line distance (elementary)
    const s = fanDisc(400);
    const all = Array.from({ length: 401 }, (_, v) => v);
    const refined = planarError(s, 1, all, 0.1);
    const plain = planarError(s, 1, all, 0.1, { refine: false });
    expect(refined).toBeLessThan(0.06);
    expect(refined).toBeLessThan(0.8 * plain);
  });
});
