/**
 * Connected components over faces (two faces are connected when they share an
 * edge with twins), with the Euler characteristic and genus of each.
 *
 * χ = V − E + F per component; for an orientable surface with b boundary
 * loops, χ = 2 − 2g − b, so g = (2 − χ − b) / 2.
 *
 * Given the orientation seams of the build (edges cut so that a
 * non-orientable piece gets half-edges), the counts are those of the surface
 * as given: a seam is one edge, the copies of a vertex made by the cut are one
 * vertex, and boundary loops are the cycles of the remaining boundary edges.
 * A Möbius strip then has χ = 0 and one boundary loop, as it should.
 */
import type { Topology } from './topology.js';
import { next } from './topology.js';
import { findRoot, union } from './build.js';
import { boundaryLoops } from './boundary.js';
import { glueSeams } from './seams.js';

/** Summary of one connected component. */
export interface ComponentInfo {
  /** Number of faces. */
  faces: number;
  /** Number of vertices. */
  vertices: number;
  /** Number of edges. */
  edges: number;
  /** Number of boundary loops. */
  boundaryLoops: number;
  /** Euler characteristic V − E + F. */
  eulerCharacteristic: number;
  /** Genus from χ = 2 − 2g − b (may be fractional if the piece is not orientable). */
  genus: number;
}

/** Component labels and per-component summaries. */
export interface Components {
  /** Number of components. */
  count: number;
  /** Component of each face. */
  faceComponent: Int32Array;
  /** Component of each vertex; -1 for isolated vertices. */
  vertexComponent: Int32Array;
  /** One summary per component, largest first is not guaranteed: index = label. */
  info: ComponentInfo[];
}

/**
 * Labels the connected components of `t` and summarises each.
 *
 * @param seams - pairs of half-edges that are the two sides of one input edge
 *   (`BuildReport.orientationSeams`); omitted, the topology is counted as is
 */
export function components(t: Topology, seams?: Int32Array): Components {
  const { nf, nv } = t;
  const faceComponent = new Int32Array(nf).fill(-1);
  const stack = new Int32Array(nf);
  let count = 0;
  for (let seed = 0; seed < nf; seed++) {
    if (faceComponent[seed] !== -1) continue;
    let sp = 0;
    stack[sp++] = seed;
    faceComponent[seed] = count;
    while (sp > 0) {
      const f = stack[--sp]!;
      for (let k = 0; k < 3; k++) {
        const o = t.twin[3 * f + k]!;
        if (o < 0) continue;
        const g = (o / 3) | 0;
        if (faceComponent[g] === -1) {
          faceComponent[g] = count;
          stack[sp++] = g;
        }
      }
    }
    count++;
  }
  const vertexComponent = new Int32Array(nv).fill(-1);
  for (let v = 0; v < nv; v++) {
    const h = t.vertexHalfedge[v]!;
    if (h >= 0) vertexComponent[v] = faceComponent[(h / 3) | 0]!;
  }
  const info: ComponentInfo[] = [];
  for (let c = 0; c < count; c++) {
    info.push({ faces: 0, vertices: 0, edges: 0, boundaryLoops: 0, eulerCharacteristic: 0, genus: 0 });
  }
  for (let f = 0; f < nf; f++) info[faceComponent[f]!]!.faces++;
  for (let e = 0; e < t.ne; e++) info[faceComponent[(t.edgeHalfedge[e]! / 3) | 0]!]!.edges++;
  if (seams && seams.length > 0) {
    countAsGiven(t, seams, faceComponent, vertexComponent, info);
  } else {
    for (let v = 0; v < nv; v++) if (vertexComponent[v]! >= 0) info[vertexComponent[v]!]!.vertices++;
    for (const loop of boundaryLoops(t)) info[faceComponent[(loop[0]! / 3) | 0]!]!.boundaryLoops++;
  }
  for (const c of info) {
    c.eulerCharacteristic = c.vertices - c.edges + c.faces;
    c.genus = (2 - c.eulerCharacteristic - c.boundaryLoops) / 2;
  }
  return { count, faceComponent, vertexComponent, info };
}

/**
 * Vertices, edges and boundary loops of each component on the surface as
 * given: seam copies of a vertex are merged, each seam pair is one edge, and
 * loops are the connected pieces of the graph of the other boundary edges (on
 * a manifold surface every boundary vertex has two boundary edges, so each
 * piece is one cycle).
 */
function countAsGiven(t: Topology, seams: Int32Array, faceComponent: Int32Array, vertexComponent: Int32Array, info: ComponentInfo[]): void {
  const { nv } = t;
  const { rep, seamHalfedge } = glueSeams(t, seams);
  for (let i = 0; i + 1 < seams.length; i += 2) info[faceComponent[(seams[i]! / 3) | 0]!]!.edges--;
  for (let v = 0; v < nv; v++) if (vertexComponent[v]! >= 0 && rep[v] === v) info[vertexComponent[v]!]!.vertices++;
  // boundary loops: union–find over class representatives along non-seam boundary edges
  const parent = Int32Array.from(rep);
  const onBoundary = new Uint8Array(nv);
  for (let h = 0; h < t.twin.length; h++) {
    if (t.twin[h] !== -1 || seamHalfedge[h]) continue;
    onBoundary[t.tri[h]!] = 1;
    union(parent, t.tri[h]!, t.tri[next(h)]!);
  }
  const counted = new Uint8Array(nv);
  for (let v = 0; v < nv; v++) {
    if (!onBoundary[v] || vertexComponent[v]! < 0) continue;
    const r = findRoot(parent, v);
    if (counted[r]) continue;
    counted[r] = 1;
    info[vertexComponent[v]!]!.boundaryLoops++;
  }
}
