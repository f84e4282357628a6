/**
 * Half-edge connectivity in flat typed arrays.
 *
 * Face `f` owns the three half-edges `3f`, `3f+1`, `3f+2`. Half-edge `h = 3f+k`
 * runs from corner `k` to corner `k+1 (mod 3)` of the face, so the corner array
 * `tri` doubles as the tail-vertex array: `tail(h) = tri[h]`.
 *
 * ```
 *              tri[3f+2]
 *                 /\
 *       3f+2     /  \    3f+1
 *    (c2 → c0)  /    \  (c1 → c2)
 *              /  f   \
 *             /________\
 *       tri[3f]  3f     tri[3f+1]
 *              (c0 → c1)
 * ```
 *
 * Faces are counter-clockwise seen from the side their normal points to.
 * `next(h) = h % 3 === 2 ? h - 2 : h + 1`, `prev(h) = h % 3 === 0 ? h + 2 : h - 1`.
 * `twin[h]` is the opposite half-edge in the neighbouring face, or `-1` when
 * `h` lies on the boundary. Every edge has an id; `edgeOf[h]` maps a half-edge
 * to it and `edgeHalfedge[e]` maps back to one of its half-edges (the only one
 * on a boundary edge).
 *
 * Rotation about a vertex: for `h` leaving `v`, `twin[prev(h)]` is the next
 * half-edge leaving `v`, counter-clockwise. For a boundary vertex
 * `vertexHalfedge[v]` is the boundary half-edge leaving it, so the rotation
 * starting there sweeps the whole fan and stops at `twin === -1`. Every vertex
 * of a built topology has a single fan (non-manifold input is split first).
 * A non-orientable piece (Möbius strip) is cut along seams to get here; the
 * build lists them (`BuildReport.orientationSeams`, glued back by `seams.ts`).
 */

/** Half-edge connectivity of a triangle mesh (see the module comment). */
export interface Topology {
  /** Number of vertices (after any splitting of non-manifold vertices). */
  readonly nv: number;
  /** Number of triangles. */
  readonly nf: number;
  /** Number of edges. */
  readonly ne: number;
  /** Corner vertices, three per face; also the tail vertex of each half-edge. */
  readonly tri: Uint32Array;
  /** Opposite half-edge, or -1 on the boundary. */
  readonly twin: Int32Array;
  /** Edge id of each half-edge. */
  readonly edgeOf: Int32Array;
  /** One half-edge of each edge (for boundary edges, the only one). */
  readonly edgeHalfedge: Int32Array;
  /** One outgoing half-edge per vertex; the boundary one on the boundary; -1 if isolated. */
  readonly vertexHalfedge: Int32Array;
  /** For each vertex, the index of the vertex it came from in the input. */
  readonly vertexOrigin: Int32Array;
  /** For each face, the index of the input triangle it came from. */
  readonly faceOrigin: Int32Array;
}

/** The next half-edge in the same face. */
export function next(h: number): number {
  return h % 3 === 2 ? h - 2 : h + 1;
}

/** The previous half-edge in the same face. */
export function prev(h: number): number {
  return h % 3 === 0 ? h + 2 : h - 1;
}

/** The face owning half-edge `h`. */
export function faceOf(h: number): number {
  return (h / 3) | 0;
}

/** Tail vertex of half-edge `h`. */
export function tail(t: Topology, h: number): number {
  return t.tri[h]!;
}

/** Tip vertex of half-edge `h`. */
export function tip(t: Topology, h: number): number {
  return t.tri[next(h)]!;
}

/** True when vertex `v` lies on the boundary (its outgoing half-edge has no twin). */
export function isBoundaryVertex(t: Topology, v: number): boolean {
  const h = t.vertexHalfedge[v]!;
  return h >= 0 && t.twin[h] === -1;
}

/** True when edge `e` lies on the boundary. */
export function isBoundaryEdge(t: Topology, e: number): boolean {
  return t.twin[t.edgeHalfedge[e]!] === -1;
}

/**
 * The walk round a vertex, one step: the half-edge leaving tail(h) after `h`,
 * counter-clockwise (`twin[prev(h)]`), or −1 when the walk that began at
 * `start` is over (back at `start`, or past the last face of a boundary fan).
 * The one home of this walk; loops read
 * `for (let h = start; h >= 0; h = nextOutgoing(t, start, h))`, allocation
 * free, and end on every topology whose `twin` pairs half-edges (twin∘prev is
 * then one-to-one, so the walk cannot enter a cycle that skips `start`).
 * At a boundary vertex started from `vertexHalfedge[v]` the walk sweeps the
 * whole fan; its last half-edge h has `twin[prev(h)] === -1`, and prev(h) is
 * the incoming boundary edge.
 */
export function nextOutgoing(t: Topology, start: number, h: number): number {
  const o = t.twin[prev(h)]!;
  return o === start ? -1 : o;
}

/**
 * Calls `fn(h)` for every half-edge leaving `v`, counter-clockwise, starting at
 * `vertexHalfedge[v]` ({@link nextOutgoing}). Returns the number of half-edges
 * visited (the valence in faces).
 */
export function forEachOutgoing(t: Topology, v: number, fn: (h: number) => void): number {
  const start = t.vertexHalfedge[v]!;
  let n = 0;
  // the count bound only matters for a topology whose twins do not pair up (never a built one)
  for (let h = start; h >= 0 && n <= t.tri.length; h = nextOutgoing(t, start, h)) {
    fn(h);
    n++;
  }
  return n;
}

/** Number of boundary edges (half-edges without a twin). */
export function boundaryEdgeCount(t: Topology): number {
  let n = 0;
  for (let h = 0; h < t.twin.length; h++) if (t.twin[h] === -1) n++;
  return n;
}
