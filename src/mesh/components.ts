/**
 * Connected components over faces (two faces are connected when they share an
 * edge with twins), with the Euler characteristic and genus of each.
 *
 * χ = V − E + F per component; for an orientable surface with b boundary
 * loops, χ = 2 − 2g − b, so g = (2 − χ − b) / 2.
 */
import type { Topology } from './topology.js';
import { boundaryLoops } from './boundary.js';

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

/** Labels the connected components of `t` and summarises each. */
export function components(t: Topology): Components {
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
  for (let v = 0; v < nv; v++) if (vertexComponent[v]! >= 0) info[vertexComponent[v]!]!.vertices++;
  for (let e = 0; e < t.ne; e++) info[faceComponent[(t.edgeHalfedge[e]! / 3) | 0]!]!.edges++;
  for (const loop of boundaryLoops(t)) info[faceComponent[(loop[0]! / 3) | 0]!]!.boundaryLoops++;
  for (const c of info) {
    c.eulerCharacteristic = c.vertices - c.edges + c.faces;
    c.genus = (2 - c.eulerCharacteristic - c.boundaryLoops) / 2;
  }
  return { count, faceComponent, vertexComponent, info };
}
