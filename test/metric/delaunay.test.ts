import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { buildTopology } from '../../src/mesh/build.js';
import { intrinsicFromLengths } from '../../src/metric/intrinsic.js';
import { intrinsicFromPositions, type IntrinsicMesh } from '../../src/metric/intrinsic.js';
import { intrinsicDelaunay, edgeCotanSum } from '../../src/metric/delaunay.js';
import { mollify } from '../../src/metric/mollify.js';
import { edgePattern, cotanLaplacian, patternMatrix } from '../../src/metric/laplacian.js';
import { symmetricSpmvLower } from '../../src/linalg/csc.js';
import { boundaryVertexMask } from '../../src/mesh/boundary.js';
import { cornerAngles, faceAreas } from '../../src/metric/triangle.js';
import { next, prev, type Topology } from '../../src/mesh/topology.js';
import { flatGrid, icosphere, terrain, rng, type Shape } from '../fixtures/shapes.js';

function meshOf(s: Shape): IntrinsicMesh {
  const { topology } = buildTopology(s.triangles, s.positions.length / 3);
  return intrinsicFromPositions(topology, s.positions);
}

/** A flat grid sheared so that half the cells are split along their long diagonal (obtuse fans), plus jitter. */
function shearedGrid(nx: number, ny: number, seed = 1): Shape {
  const s = flatGrid(nx, ny, nx, ny * 0.3, 0.25, seed);
  for (let i = 0; i < s.positions.length; i += 3) s.positions[i]! += 1.5 * s.positions[i + 1]!;
  return s;
}

/** Structural invariants of a half-edge topology (common practice for half-edge structures). */
function checkTopology(t: Topology): void {
  const nh = 3 * t.nf;
  const outCount = new Int32Array(t.nv);
  for (let h = 0; h < nh; h++) {
    outCount[t.tri[h]!]!++;
    const o = t.twin[h]!;
    if (o >= 0) {
      expect(t.twin[o]).toBe(h);
      expect(t.tri[o]).toBe(t.tri[next(h)]);
      expect(t.tri[next(o)]).toBe(t.tri[h]);
      expect(t.edgeOf[o]).toBe(t.edgeOf[h]);
    }
    const e = t.edgeOf[h]!;
    const g = t.edgeHalfedge[e]!;
    expect(g === h || g === o).toBe(true);
  }
  for (let v = 0; v < t.nv; v++) {
    const s = t.vertexHalfedge[v]!;
    if (s < 0) continue;
    expect(t.tri[s]).toBe(v);
    // the CCW rotation from the anchor sweeps every outgoing half-edge once
    let h = s, n = 0;
    do {
      n++;
      const p = t.twin[prev(h)]!;
      if (p < 0) break;
      h = p;
    } while (h !== s && n <= nh);
    expect(n).toBe(outCount[v]);
  }
}

function expectDelaunay(m: IntrinsicMesh, tol = 1e-9): void {
  const t = m.topology;
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!;
    if (t.twin[h]! >= 0) expect(edgeCotanSum(t, m.edgeLength, h)).toBeGreaterThanOrEqual(-tol);
  }
}

function angleSums(m: IntrinsicMesh): Float64Array {
  const a = cornerAngles(m), s = new Float64Array(m.topology.nv);
  for (let h = 0; h < a.length; h++) s[m.topology.tri[h]!]! += a[h]!;
  return s;
}

describe('intrinsic Delaunay flips', () => {
  it('turns a planar triangulation into the planar Delaunay one (empty circumcircles, Euclidean lengths)', () => {
    // On a planar convex domain intrinsic flips are ordinary flips, so the
    // result is the Delaunay triangulation of the points: no vertex strictly
    // inside any face's circumcircle, and every new edge length equals the
    // distance of its endpoints (Bobenko & Springborn 2007; Delaunay's empty-circle criterion).
    const s = shearedGrid(10, 8, 4);
    const m = meshOf(s);
    const input = m.edgeLength.slice(), inputTri = m.topology.tri.slice();
    const r = intrinsicDelaunay(m);
    expect(r.flips).toBeGreaterThan(20);
    expect(r.capped).toBe(false);
    expect(r.skipped).toBe(0);
    expect(m.edgeLength).toEqual(input);
    expect(m.topology.tri).toEqual(inputTri);
    const t = r.mesh.topology, P = s.positions;
    checkTopology(t);
    expectDelaunay(r.mesh);
    const scale = 10;
    for (let e = 0; e < t.ne; e++) {
      const h = t.edgeHalfedge[e]!, a = t.tri[h]!, b = t.tri[next(h)]!;
      const d = Math.hypot(P[3 * a]! - P[3 * b]!, P[3 * a + 1]! - P[3 * b + 1]!);
      expect(Math.abs(r.mesh.edgeLength[e]! - d)).toBeLessThan(1e-12 * scale);
    }
    for (let f = 0; f < t.nf; f++) {
      const [ax, ay, bx, by, cx, cy] = [0, 1, 2].flatMap((k) => [P[3 * t.tri[3 * f + k]!]!, P[3 * t.tri[3 * f + k]! + 1]!]) as number[];
      const D = 2 * (ax! * (by! - cy!) + bx! * (cy! - ay!) + cx! * (ay! - by!));
      const ux = ((ax! ** 2 + ay! ** 2) * (by! - cy!) + (bx! ** 2 + by! ** 2) * (cy! - ay!) + (cx! ** 2 + cy! ** 2) * (ay! - by!)) / D;
      const uy = ((ax! ** 2 + ay! ** 2) * (cx! - bx!) + (bx! ** 2 + by! ** 2) * (ax! - cx!) + (cx! ** 2 + cy! ** 2) * (bx! - ax!)) / D;
      const R = Math.hypot(ax! - ux, ay! - uy);
      for (let v = 0; v < t.nv; v++) {
        expect(Math.hypot(P[3 * v]! - ux, P[3 * v + 1]! - uy)).toBeGreaterThan(R * (1 - 1e-7));
      }
    }
  });

  it('gives a cotan Laplacian with non-negative weights and linear precision after flipping', () => {
    // Delaunay ⇒ all interior cotan weights ≥ 0 (Bobenko & Springborn 2007); the cotan
    // Laplacian of any planar triangulation annihilates linear functions at
    // interior vertices (common practice), flipped or not.
    const s = shearedGrid(9, 9, 6);
    const r = intrinsicDelaunay(meshOf(s));
    const p = edgePattern(r.mesh.topology);
    const Lv = cotanLaplacian(r.mesh, p);
    const t = r.mesh.topology;
    // interior edges only: a boundary edge has one opposite angle and is never flipped
    for (let e = 0; e < t.ne; e++) if (t.twin[t.edgeHalfedge[e]!]! >= 0) expect(Lv[p.edgeSlot[e]!]).toBeLessThanOrEqual(1e-12);
    const x = Float64Array.from({ length: p.n }, (_, v) => 2 * s.positions[3 * v]! - s.positions[3 * v + 1]!);
    const out = new Float64Array(p.n);
    symmetricSpmvLower(patternMatrix(p, Lv), x, out);
    const onB = boundaryVertexMask(r.mesh.topology);
    for (let v = 0; v < p.n; v++) if (!onB[v]) expect(Math.abs(out[v]!)).toBeLessThan(1e-10);
  });

  it('preserves total area and every vertex angle sum on curved surfaces', () => {
    // Flips re-triangulate the same piecewise-flat metric, so areas and cone
    // angles are unchanged (Bobenko & Springborn 2007).
    const r0 = rng(7);
    const sph = icosphere(3);
    for (let i = 0; i < sph.positions.length; i += 3) {
      const k = 1 + 0.25 * (r0() - 0.5);
      for (let d = 0; d < 3; d++) sph.positions[i + d]! *= k;
    }
    const hills = terrain(14, 12, 3, 2, (x, y) => 0.4 * Math.sin(3 * x) * Math.cos(2 * y));
    for (let i = 0; i < hills.positions.length; i += 3) hills.positions[i]! += 0.8 * hills.positions[i + 1]!;
    for (const s of [sph, hills]) {
      const m = meshOf(s);
      const r = intrinsicDelaunay(m);
      expect(r.flips).toBeGreaterThan(0);
      checkTopology(r.mesh.topology);
      expectDelaunay(r.mesh);
      const a0 = faceAreas(m).reduce((x, y) => x + y, 0), a1 = faceAreas(r.mesh).reduce((x, y) => x + y, 0);
      expect(Math.abs(a1 - a0)).toBeLessThan(1e-12 * a0);
      const s0 = angleSums(m), s1 = angleSums(r.mesh);
      for (let v = 0; v < s0.length; v++) expect(Math.abs(s1[v]! - s0[v]!)).toBeLessThan(1e-10);
      // idempotent: a Delaunay mesh needs no further flips
      expect(intrinsicDelaunay(r.mesh).flips).toBe(0);
    }
  });

  it('stops at the flip cap and reports it', () => {
    const m = meshOf(shearedGrid(6, 6, 2));
    const r = intrinsicDelaunay(m, { maxFlips: 3 });
    expect(r.flips).toBe(3);
    expect(r.capped).toBe(true);
    checkTopology(r.mesh.topology);
  });

  it('handles needle triangles after mollification without NaN', () => {
    // Collapse some interior vertices onto an edge midpoint: zero-area faces
    // that mollification (Sharp & Crane 2020) makes strictly valid.
    const s = flatGrid(6, 6, 1, 1);
    const P = s.positions;
    for (const v of [8, 17, 26]) { P[3 * v] = P[3 * (v + 1)]!; P[3 * v + 1] = P[3 * (v + 1) + 1]! - 1e-14; }
    const m = mollify(meshOf(s)).mesh;
    const r = intrinsicDelaunay(m);
    checkTopology(r.mesh.topology);
    for (const l of r.mesh.edgeLength) expect(Number.isFinite(l) && l > 0).toBe(true);
    expectDelaunay(r.mesh, 1e-6);
  });
});

describe('intrinsic mollification (Sharp & Crane 2020)', () => {
  it('adds exactly the closed-form ε = max(0, δ − (l_j + l_k − l_i)) and leaves valid meshes alone', () => {
    // one face with lengths 1, 1, 2.5 breaks the triangle inequality by 0.5
    const { topology } = buildTopology([0, 1, 2], 3);
    const m = intrinsicFromLengths(topology, Float64Array.from([1, 1, 2.5]));
    const r = mollify(m, 1e-3);
    const h = 4.5 / 3;
    expect(r.delta).toBeCloseTo(1e-3 * h, 15);
    expect(r.epsilon).toBeCloseTo(0.5 + 1e-3 * h, 14);
    const L = r.mesh.edgeLength;
    expect(L[0]! + L[1]! - L[2]!).toBeCloseTo(r.delta, 12);
    expect(m.edgeLength[2]).toBe(2.5); // input untouched
    const ok = meshOf(flatGrid(4, 4, 1, 1, 0.2, 3));
    const r2 = mollify(ok);
    expect(r2.epsilon).toBe(0);
    expect(r2.mesh).toBe(ok);
  });

  it('property: after mollification and flips every face has margin ≥ δ, the topology is valid and Delaunay', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1 << 30 }), fc.double({ min: 0, max: 0.49, noNaN: true }), (seed, jitter) => {
        const s = flatGrid(6, 5, 1.5, 1, jitter, seed);
        const r0 = rng(seed);
        // random heights and a few collapsed vertices make needles and caps
        for (let i = 0; i < s.positions.length; i += 3) s.positions[i + 2] = 0.3 * r0();
        for (const v of [8, 15, 22]) if (r0() < 0.5) for (let d = 0; d < 3; d++) s.positions[3 * v + d] = s.positions[3 * (v + 1) + d]!;
        const mo = mollify(meshOf(s));
        const t = mo.mesh.topology, L = mo.mesh.edgeLength;
        for (let f = 0; f < t.nf; f++) {
          const a = L[t.edgeOf[3 * f]!]!, b = L[t.edgeOf[3 * f + 1]!]!, c = L[t.edgeOf[3 * f + 2]!]!;
          expect(Math.min(b + c - a, a + c - b, a + b - c)).toBeGreaterThanOrEqual(mo.delta * (1 - 1e-6));
        }
        const r = intrinsicDelaunay(mo.mesh);
        checkTopology(r.mesh.topology);
        expectDelaunay(r.mesh, 1e-6);
        const a0 = faceAreas(mo.mesh).reduce((x, y) => x + y, 0), a1 = faceAreas(r.mesh).reduce((x, y) => x + y, 0);
        expect(Math.abs(a1 - a0)).toBeLessThan(1e-9 * a0);
      }),
      { numRuns: 40 },
    );
  });
});
