/**
 * The combinatorial edge flip (src/mesh/edge-flip.ts). The flip replaces the
 * diagonal ab of the quad acbd by cd and keeps every other edge (Bobenko &
 * Springborn, Discrete Comput. Geom. 38, 2007, §2); the half-edge
 * invariants checked after it (twins pair up and run the other way, every
 * half-edge leaving v is reached by the walk round v) are common practice
 * for half-edge structures.
 */
import { describe, expect, it } from 'vitest';
import { buildTopology } from '../../src/mesh/build.js';
import { FlipQuad } from '../../src/mesh/edge-flip.js';
import { forEachOutgoing, next, type Topology } from '../../src/mesh/topology.js';
import { flatGrid, icosphere, rng } from '../fixtures/shapes.js';

function topologyOf(s: { positions: Float64Array; triangles: Uint32Array }): Topology {
  return buildTopology(s.triangles, s.positions.length / 3).topology;
}

/** The undirected edge set {min,max} of a topology, edge id → pair. */
function edgeSet(t: Topology): Map<number, string> {
  const m = new Map<number, string>();
  for (let h = 0; h < 3 * t.nf; h++) {
    const a = t.tri[h]!, b = t.tri[next(h)]!;
    m.set(t.edgeOf[h]!, `${Math.min(a, b)}-${Math.max(a, b)}`);
  }
  return m;
}

function checkInvariants(t: Topology): void {
  const nh = 3 * t.nf;
  const count = new Int32Array(t.nv);
  for (let h = 0; h < nh; h++) {
    const o = t.twin[h]!;
    if (o >= 0) {
      expect(t.twin[o]).toBe(h);
      expect(t.tri[o]).toBe(t.tri[next(h)]);
      expect(t.edgeOf[o]).toBe(t.edgeOf[h]);
    }
    expect(t.edgeOf[t.edgeHalfedge[t.edgeOf[h]!]!]).toBe(t.edgeOf[h]);
    count[t.tri[h]!]!++;
  }
  for (let v = 0; v < t.nv; v++) {
    expect(t.tri[t.vertexHalfedge[v]!]).toBe(v);
    expect(forEachOutgoing(t, v, (h) => expect(t.tri[h]).toBe(v))).toBe(count[v]);
  }
}

describe('FlipQuad', () => {
  it('two triangles (a, b, c) + (b, a, d): the diagonal a–b becomes d–c, the four sides keep their edge ids', () => {
    // a=0, b=1, c=2, d=3; faces (0,1,2) and (1,0,3)
    const t = topologyOf({ positions: new Float64Array(12), triangles: new Uint32Array([0, 1, 2, 1, 0, 3]) });
    const before = edgeSet(t);
    const q = new FlipQuad();
    const h = 0; // a→b in face 0
    expect(q.read(t, h)).toBe(true);
    expect([q.a, q.b, q.c, q.d]).toEqual([0, 1, 2, 3]);
    q.rewire(t, t.vertexHalfedge);
    // the module comment's layout: face of h = (d, c, a), face of o = (c, d, b)
    expect([...t.tri.subarray(0, 3)]).toEqual([3, 2, 0]);
    expect([t.tri[q.o], t.tri[next(q.o)], t.tri[next(next(q.o))]]).toEqual([2, 3, 1]);
    const after = edgeSet(t);
    expect(after.get(t.edgeOf[h]!)).toBe('2-3');
    for (const [e, pair] of before) if (e !== t.edgeOf[h]) expect(after.get(e)).toBe(pair);
    checkInvariants(t);
  });

  it('refuses a boundary edge and an edge whose flip would be a loop (c = d)', () => {
    const open = topologyOf({ positions: new Float64Array(9), triangles: new Uint32Array([0, 1, 2]) });
    expect(new FlipQuad().read(open, 0)).toBe(false);
    // a pillow: two faces glued along all three sides; the far corners of edge 0–1 are both 2
    const pillow: Topology = {
      nv: 3, nf: 2, ne: 3, tri: new Uint32Array([0, 1, 2, 1, 0, 2]), twin: new Int32Array([3, 5, 4, 0, 2, 1]),
      edgeOf: new Int32Array([0, 1, 2, 0, 2, 1]), edgeHalfedge: new Int32Array([0, 1, 2]),
      vertexHalfedge: new Int32Array([0, 1, 2]), vertexOrigin: new Int32Array([0, 1, 2]), faceOrigin: new Int32Array([0, 1]),
    };
    checkInvariants(pillow);
    expect(new FlipQuad().read(pillow, 0)).toBe(false);
  });

  it('random flips on an icosphere and a grid keep every half-edge invariant and the edge count', () => {
    for (const s of [icosphere(2), flatGrid(6, 5)]) {
      const t = topologyOf(s);
      const q = new FlipQuad(), rand = rng(7);
      let flips = 0;
      for (let i = 0; i < 300; i++) {
        const h = Math.floor(rand() * 3 * t.nf);
        if (!q.read(t, h)) continue;
        q.rewire(t, t.vertexHalfedge);
        flips++;
      }
      expect(flips).toBeGreaterThan(100);
      expect(edgeSet(t).size).toBe(t.ne);
      checkInvariants(t);
    }
  });
});
