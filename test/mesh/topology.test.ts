/**
 * Half-edge construction: invariants and repairs.
 * Euler characteristic χ = V − E + F and χ = 2 − 2g − b are standard
 * (Gauss–Bonnet / Euler's polyhedron formula); the rest is common practice for
 * half-edge structures.
 */
import { describe, expect, it } from 'vitest';
import { fc, test } from '@fast-check/vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { components } from '../../src/mesh/components.js';
import { boundaryLoops } from '../../src/mesh/boundary.js';
import { forEachOutgoing, next, prev, type Topology } from '../../src/mesh/topology.js';
import { icosphere, cylinder, torus, flatGrid, fanDisc, rng } from '../fixtures/shapes.js';
import { groupHalfedges } from '../../src/mesh/edge-groups.js';
import { voxelSurface, genusTwoSlab } from '../fixtures/voxels.js';

function checkInvariants(t: Topology) {
  const nh = 3 * t.nf;
  for (let h = 0; h < nh; h++) {
    const o = t.twin[h]!;
    if (o >= 0) {
      expect(t.twin[o]).toBe(h); // twin symmetry
      expect(t.tri[o]).toBe(t.tri[next(h)]); // twin runs the other way
      expect(t.edgeOf[o]).toBe(t.edgeOf[h]);
    }
    expect(next(prev(h))).toBe(h);
  }
  // every half-edge leaving v is reached by the rotation from vertexHalfedge[v]
  const count = new Int32Array(t.nv);
  for (let h = 0; h < nh; h++) count[t.tri[h]!]!++;
  for (let v = 0; v < t.nv; v++) {
    let n = 0;
    forEachOutgoing(t, v, (h) => {
      expect(t.tri[h]).toBe(v);
      n++;
    });
    expect(n).toBe(count[v]);
  }
}

describe('closed and open surfaces', () => {
  const cases: [string, ReturnType<typeof icosphere>, number, number, number][] = [
    ['icosphere', icosphere(2), 2, 0, 0],
    ['torus', torus(24, 12), 0, 1, 0],
    ['genus-2 slab', genusTwoSlab(), -2, 2, 0],
    ['cylinder', cylinder(12, 3), 0, 0, 2],
    ['flat grid', flatGrid(6, 4), 1, 0, 1],
  ];
  for (const [name, s, chi, genus, loops] of cases) {
    it(`${name}: χ = ${chi}, genus ${genus}, ${loops} boundary loop(s), half-edge invariants`, () => {
      const { topology: t, report } = buildTopology(s.triangles, s.positions.length / 3);
      checkInvariants(t);
      const c = components(t);
      expect(c.count).toBe(1);
      expect(c.info[0]!.eulerCharacteristic).toBe(chi);
      expect(c.info[0]!.genus).toBe(genus);
      expect(boundaryLoops(t).length).toBe(loops);
      expect(report.splitVertices).toBe(0);
      expect(report.flippedFaces).toBe(0);
    });
  }
});

describe('repairs and reports', () => {
  it('re-orients faces flipped at random and keeps the majority orientation', () => {
    const s = icosphere(2);
    const tri = s.triangles.slice();
    const r = rng(3);
    let flipped = 0;
    for (let f = 0; f < tri.length / 3; f++) {
      if (r() < 0.3) {
        const x = tri[3 * f + 1]!;
        tri[3 * f + 1] = tri[3 * f + 2]!;
        tri[3 * f + 2] = x;
        flipped++;
      }
    }
    const { topology: t, report } = buildTopology(tri, s.positions.length / 3);
    expect(report.flippedFaces).toBe(flipped);
    expect(report.orientationCuts).toBe(0);
    checkInvariants(t);
    expect(components(t).info[0]!.eulerCharacteristic).toBe(2);
  });
  it('drops faces with a repeated vertex and lists them', () => {
    const s = flatGrid(2, 2);
    const tri = [...s.triangles, 0, 0, 1, 4, 5, 4];
    const { topology: t, report } = buildTopology(tri, 9);
    expect(report.degenerateFaces).toEqual([8, 9]);
    expect(t.nf).toBe(8);
  });
  it('bow-tie vertex: reported and split, each fan gets its own vertex', () => {
    const { topology: t, report } = buildTopology([0, 1, 2, 0, 3, 4], 5);
    expect(report.nonManifoldVertices).toEqual([0]);
    expect(report.splitVertices).toBe(1);
    expect(t.nv).toBe(6);
    expect(Array.from(t.vertexOrigin)).toEqual([0, 1, 2, 3, 4, 0]);
    checkInvariants(t);
    expect(components(t).count).toBe(2);
  });
  it('two cubes sharing one edge: a non-manifold edge with its four faces, cut so algorithms can run', () => {
    const s = voxelSurface([
      [0, 0, 0],
      [1, 1, 0],
    ]);
    const { topology: t, report } = buildTopology(s.triangles, s.positions.length / 3);
    expect(report.nonManifoldEdgeCount).toBe(1);
    expect(report.nonManifoldEdges[0]!.faces.length).toBe(4);
    checkInvariants(t);
  });
  it('a Möbius strip is reported as not orientable', () => {
    // strip of n quads whose ends are glued with a half twist
    const n = 8, tri: number[] = [];
    for (let i = 0; i < n; i++) {
      const a = i, b = i + n, c = (i + 1) % n, d = ((i + 1) % n) + n;
      if (i < n - 1) tri.push(a, c, b, b, c, d);
      else tri.push(a, d, b, b, d, c); // half twist: top and bottom swap
    }
    const { topology: t, report } = buildTopology(tri, 2 * n);
    expect(report.nonOrientableComponents).toBe(1);
    expect(report.orientationCuts).toBeGreaterThan(0);
    checkInvariants(t);
  });
  it('vertices used by no face are counted', () => {
    const { report } = buildTopology([0, 1, 2], 5);
    expect(report.isolatedVertices).toBe(2);
  });
});

describe('property: random triangle soups never break the invariants', () => {
  test.prop([fc.array(fc.tuple(fc.nat(11), fc.nat(11), fc.nat(11)), { minLength: 1, maxLength: 60 })])('invariants hold', (faces) => {
    const tri = faces.flat();
    const { topology: t, report } = buildTopology(tri, 12);
    checkInvariants(t);
    expect(t.nf + report.degenerateFaces.length + report.duplicateFaceCount).toBe(faces.length);
  });
});

describe('high-valence fan (a disc fanned from one centre vertex, as CAD exports fan caps)', () => {
  it('40 000 triangles listed in random order: χ = 1, one boundary loop, centre valence 40 000', () => {
    // a fan of n triangles about one vertex is a disc: V = n + 1, E = 2n, F = n, so
    // χ = 1 (Euler's formula), one boundary loop through the n rim vertices (elementary)
    const n = 40000;
    const s = fanDisc(n);
    const tri = s.triangles.slice();
    const r = rng(11);
    for (let f = n - 1; f > 0; f--) {
      // Fisher–Yates shuffle of whole faces: no order for the grouping to exploit
      const g = Math.floor(r() * (f + 1));
      const a = tri.slice(3 * f, 3 * f + 3);
      tri.copyWithin(3 * f, 3 * g, 3 * g + 3);
      tri.set(a, 3 * g);
    }
    const { topology: t, report } = buildTopology(tri, n + 1);
    expect(report.flippedFaces).toBe(0);
    expect(report.splitVertices).toBe(0);
    const c = components(t);
    expect(c.count).toBe(1);
    expect(c.info[0]!.eulerCharacteristic).toBe(1);
    expect(t.ne).toBe(2 * n);
    const loops = boundaryLoops(t);
    expect(loops.length).toBe(1);
    expect(loops[0]!.length).toBe(n);
    expect(forEachOutgoing(t, 0, () => {})).toBe(n); // the centre sees every face
    for (const v of [1, 2, n / 2, n]) expect(forEachOutgoing(t, v, () => {})).toBe(2); // a rim vertex sees two faces
  });
});

describe('property: edge grouping matches a comparison sort of (min, max) keys (common practice)', () => {
  test.prop([fc.array(fc.tuple(fc.nat(9), fc.nat(9), fc.nat(9)), { minLength: 1, maxLength: 40 })])('same groups, in order', (faces) => {
    const tri = Uint32Array.from(faces.flat());
    const key = (h: number) => {
      const a = tri[h]!, b = tri[next(h)]!;
      return Math.min(a, b) * 16 + Math.max(a, b);
    };
    const ref = Array.from(tri.keys()).sort((x, y) => key(x) - key(y) || x - y);
    const g = groupHalfedges(tri, 10);
    expect(Array.from(g.order)).toEqual(ref);
    const starts = ref.flatMap((h, i) => (i === 0 || key(h) !== key(ref[i - 1]!) ? [i] : []));
    expect(Array.from(g.start)).toEqual([...starts, tri.length]);
  });
});

/** Möbius strip: a band of n × w quads (two triangles each) whose ends are glued with a half twist. */
function moebius(n: number, w = 1): number[] {
  const tri: number[] = [];
  const id = (i: number, j: number) => (i % n) * (w + 1) + j;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < w; j++) {
      // the last column of quads meets the first one upside down (j → w − j)
      const a = id(i, j), b = id(i, j + 1);
      const c = i < n - 1 ? id(i + 1, j) : id(0, w - j), d = i < n - 1 ? id(i + 1, j + 1) : id(0, w - j - 1);
      tri.push(a, c, b, b, c, d);
    }
  }
  return tri;
}

describe('non-orientable surfaces are counted as given (Euler characteristic of a Möbius strip 0, Klein bottle 0)', () => {
  it('Möbius strip of 60 quads: not orientable, χ = 0 with V 120, E 240, F 120, one boundary loop, no non-manifold vertex', () => {
    // χ(Möbius strip) = 0 and its boundary is one circle (standard topology, e.g. Massey,
    // Algebraic Topology: An Introduction, ch. 1); E = V + F − χ = 240 for this band
    const { topology: t, report } = buildTopology(moebius(60), 120);
    expect(report.nonOrientableComponents).toBe(1);
    expect(report.nonManifoldVertexCount).toBe(0);
    expect(report.nonManifoldVertices).toEqual([]);
    expect(report.flippedFaces).toBe(0);
    expect(report.orientationSeams.length).toBe(2 * report.orientationCuts);
    checkInvariants(t);
    const c = components(t, report.orientationSeams);
    expect(c.count).toBe(1);
    expect(c.info[0]).toMatchObject({ vertices: 120, edges: 240, faces: 120, eulerCharacteristic: 0, boundaryLoops: 1 });
  });
  it('a wider Möbius band listed with random face orientations: same counts, one cut across the band', () => {
    const tri = moebius(40, 4);
    const r = rng(17);
    for (let f = 0; f < tri.length / 3; f++) {
      if (r() < 0.5) {
        const x = tri[3 * f + 1]!;
        tri[3 * f + 1] = tri[3 * f + 2]!;
        tri[3 * f + 2] = x;
      }
    }
    const { topology: t, report } = buildTopology(tri, 40 * 5);
    expect(report.nonOrientableComponents).toBe(1);
    expect(report.nonManifoldVertexCount).toBe(0);
    // the breadth-first orientation disagrees only where its fronts meet: at most a few
    // edges per row of the band (4 quads wide here), not at every randomly flipped face
    expect(report.orientationCuts).toBeLessThanOrEqual(3 * 4 * 2);
    checkInvariants(t);
    const c = components(t, report.orientationSeams);
    // V = 40·5 = 200, F = 2·40·4 = 320, E = V + F − χ = 520 (χ = 0: a Möbius strip)
    expect(c.info[0]).toMatchObject({ vertices: 200, edges: 520, faces: 320, eulerCharacteristic: 0, boundaryLoops: 1 });
  });
  it('Klein bottle (closed, not orientable): χ = 0, no boundary loop', () => {
    // χ(Klein bottle) = 0 (standard topology, e.g. Massey ch. 1)
    const nu = 12, nv = 6, tri: number[] = [];
    const id = (i: number, j: number) => i * nv + (((j % nv) + nv) % nv);
    for (let i = 0; i < nu; i++) {
      for (let j = 0; j < nv; j++) {
        const a = id(i, j), b = id(i, j + 1);
        const c = i < nu - 1 ? id(i + 1, j) : id(0, -j), d = i < nu - 1 ? id(i + 1, j + 1) : id(0, -j - 1);
        tri.push(a, c, d, a, d, b);
      }
    }
    const { topology: t, report } = buildTopology(tri, nu * nv);
    expect(report.nonOrientableComponents).toBe(1);
    expect(report.nonManifoldVertexCount).toBe(0);
    checkInvariants(t);
    const c = components(t, report.orientationSeams);
    expect(c.info[0]).toMatchObject({ vertices: nu * nv, faces: 2 * nu * nv, edges: 3 * nu * nv, eulerCharacteristic: 0, boundaryLoops: 0 });
  });
});

describe('duplicate faces are found first and dropped (common practice: a repeated vertex set is one face listed twice)', () => {
  it('a grid with three faces repeated (one reversed, one rotated): duplicates listed, the rest reads as the clean grid', () => {
    const s = flatGrid(4, 3);
    const nv = s.positions.length / 3;
    const base = Array.from(s.triangles);
    const nf = base.length / 3;
    const tri = [...base, base[3]!, base[4]!, base[5]!, base[8]!, base[7]!, base[6]!, base[13]!, base[14]!, base[12]!];
    const { topology: t, report } = buildTopology(tri, nv);
    expect(report.duplicateFaceCount).toBe(3);
    expect(report.duplicateFaces).toEqual([
      { face: nf, of: 1 },
      { face: nf + 1, of: 2 },
      { face: nf + 2, of: 4 },
    ]);
    expect(t.nf).toBe(nf);
    expect(report.nonManifoldEdgeCount).toBe(0);
    expect(report.nonManifoldVertexCount).toBe(0);
    expect(report.flippedFaces).toBe(0);
    expect(report.orientationCuts).toBe(0);
    const c = components(t);
    expect(c.count).toBe(1);
    expect(c.info[0]!.eulerCharacteristic).toBe(1); // a disc
  });
  test.prop([fc.array(fc.tuple(fc.nat(7), fc.nat(7), fc.nat(7)), { minLength: 1, maxLength: 40 })])(
    'property: every kept face has a vertex set of its own, and every dropped one repeats a kept one',
    (faces) => {
      const { topology: t, report } = buildTopology(faces.flat(), 8);
      const key = (f: number[]) => [...f].sort((x, y) => x - y).join(',');
      const keptKeys = new Set<string>();
      for (let f = 0; f < t.nf; f++) keptKeys.add(key([t.vertexOrigin[t.tri[3 * f]!]!, t.vertexOrigin[t.tri[3 * f + 1]!]!, t.vertexOrigin[t.tri[3 * f + 2]!]!]));
      expect(keptKeys.size).toBe(t.nf);
      for (const d of report.duplicateFaces) {
        expect(key(faces[d.face]!)).toBe(key(faces[d.of]!));
        expect(d.of).toBeLessThan(d.face);
      }
      expect(t.nf + report.degenerateFaces.length + report.duplicateFaceCount).toBe(faces.length);
    },
  );
});
