/**
 * Decrease-only repair of edge lengths: every edge set to the shortest-path
 * distance between its ends over the edge graph weighted by the given
 * lengths (Gilbert & Jain, "If it ain't broke, don't fix it: Sparse metric
 * repair", 55th Allerton Conference on Communication, Control, and
 * Computing, 2017; arXiv:1710.10655). The paper repairs a distance matrix
 * by changing as few entries as possible; when entries may only decrease,
 * the shortest-path metric is the repair (that this is the variant it solves
 * exactly is from memory).
 *
 * Why it is the right decrease-only repair for a mesh (elementary, proved
 * here): let d(a, b) be the edge-graph distance under the lengths ℓ.
 * - It repairs: for a face (a, b, c), d(a, c) ≤ d(a, b) + d(b, c), since a
 *   path a → b followed by one b → c is a path a → c. So every face
 *   satisfies the triangle inequality (possibly with equality).
 * - It changes the least: any lengths ℓ′ ≤ ℓ under which no edge is longer
 *   than a chain of edges between its ends have ℓ′(ab) ≤ Σ ℓ′ ≤ Σ ℓ along
 *   every chain from a to b, so ℓ′(ab) ≤ d(a, b): edge by edge, no
 *   decrease-only repair keeps more of the lengths given.
 * - It keeps every distance along edges: d is the same under ℓ and under
 *   the repaired lengths, so a distance measured on the repaired mesh is at
 *   most the user's own cost of any chain of edges.
 *
 * Each edge needs only d between its two ends: one Dijkstra search
 * (Dijkstra, Numer. Math. 1, 1959) per vertex u towards its neighbours w > u,
 * stopped when they are all settled and never past the longest of their
 * edges (d(u, w) ≤ ℓ(uw)), so the cost grows with the mesh times the size
 * of a ball about as wide as the repaired edges: near linear.
 */
import type { Topology } from '../../mesh/topology.js';
import { next } from '../../mesh/topology.js';
import { IndexedMinHeap } from '../../geodesic/shared/edge-dijkstra.js';

/** Result of {@link shortenToEdgePaths}. */
export interface Shortened {
  /** One length per edge: min(ℓ, d) (a new array; the input is not changed). */
  lengths: Float64Array;
  /** Edges made shorter. */
  edgesShortened: number;
  /** Largest (ℓ − d) / ℓ over the edges (0: nothing shortened). */
  largestShortening: number;
}

/** Vertex → (neighbour, edge) lists in compressed rows, both directions of every edge. */
function adjacency(t: Topology): { start: Int32Array; nbr: Int32Array; edge: Int32Array } {
  const start = new Int32Array(t.nv + 1);
  const ends = new Int32Array(2 * t.ne);
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!;
    const a = t.tri[h]!, b = t.tri[next(h)]!;
    ends[2 * e] = a;
    ends[2 * e + 1] = b;
    start[a + 1]!++;
    start[b + 1]!++;
  }
  for (let v = 0; v < t.nv; v++) start[v + 1]! += start[v]!;
  const fill = start.slice(0, t.nv);
  const nbr = new Int32Array(2 * t.ne), edge = new Int32Array(2 * t.ne);
  for (let e = 0; e < t.ne; e++) {
    const a = ends[2 * e]!, b = ends[2 * e + 1]!;
    nbr[fill[a]!] = b; edge[fill[a]!++] = e;
    nbr[fill[b]!] = a; edge[fill[b]!++] = e;
  }
  return { start, nbr, edge };
}

/**
 * The decrease-only repair of `lengths` (one per edge of `t`, all > 0): each
 * edge set to the shortest distance between its ends along edges (see the
 * module comment). An edge with both ends on one vertex keeps its length.
 */
export function shortenToEdgePaths(t: Topology, lengths: Float64Array): Shortened {
  const { start, nbr, edge } = adjacency(t);
  const out = Float64Array.from(lengths);
  const dist = new Float64Array(t.nv).fill(Infinity);
  const settled = new Uint8Array(t.nv);
  const wanted = new Uint8Array(t.nv);
  const touched = new Int32Array(t.nv);
  const heap = new IndexedMinHeap(t.nv, dist);
  let edgesShortened = 0, largestShortening = 0;
  for (let u = 0; u < t.nv; u++) {
    // the targets: neighbours w > u (each edge once, from its lower end); the search never needs to pass the longest of their edges
    let targets = 0, radius = 0;
    for (let k = start[u]!; k < start[u + 1]!; k++) {
      const w = nbr[k]!;
      if (w <= u) continue;
      if (lengths[edge[k]!]! > radius) radius = lengths[edge[k]!]!;
      if (!wanted[w]) { wanted[w] = 1; targets++; }
    }
    if (targets === 0) continue;
    let nt = 0;
    dist[u] = 0;
    touched[nt++] = u;
    heap.push(u);
    while (heap.size > 0 && targets > 0) {
      const v = heap.pop();
      settled[v] = 1;
      if (wanted[v]) { wanted[v] = 0; targets--; }
      const dv = dist[v]!;
      for (let k = start[v]!; k < start[v + 1]!; k++) {
        const w = nbr[k]!;
        if (settled[w]) continue;
        const nd = dv + lengths[edge[k]!]!;
        if (nd < dist[w]! && nd <= radius) {
          if (dist[w] === Infinity) touched[nt++] = w;
          dist[w] = nd;
          heap.push(w);
        }
      }
    }
    // every neighbour w > u is settled now (d(u, w) ≤ ℓ(uw) ≤ radius): shorten its edges
    for (let k = start[u]!; k < start[u + 1]!; k++) {
      const w = nbr[k]!, e = edge[k]!;
      if (w <= u) continue;
      wanted[w] = 0;
      const d = dist[w]!, l = lengths[e]!;
      if (d < l) {
        out[e] = d;
        edgesShortened++;
        const s = (l - d) / l;
        if (s > largestShortening) largestShortening = s;
      }
    }
    while (heap.size > 0) heap.pop();
    for (let i = 0; i < nt; i++) { const v = touched[i]!; dist[v] = Infinity; settled[v] = 0; wanted[v] = 0; }
  }
  return { lengths: out, edgesShortened, largestShortening };
}
