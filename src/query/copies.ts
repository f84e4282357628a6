/**
 * Split vertices (`--split-nonmanifold`: bow-ties, ends of cut edges) have
 * several topology copies of one file vertex (`Topology.vertexOrigin` maps
 * each copy back). These are the groups of copies, the one home of that
 * bookkeeping (the point resolver and the distance facade use it).
 */
import type { Topology } from '../mesh/topology.js';

/**
 * The topology copies of every split file vertex (`Topology.vertexOrigin`),
 * one list per file vertex with two or more copies, the file's own index
 * first; empty when nothing was split.
 */
export function splitGroups(t: Topology): number[][] {
  return [...vertexCopies(t).values()];
}

/** File vertex → its topology copies, for split vertices only (the file's own index first). */
export function vertexCopies(t: Topology): Map<number, number[]> {
  const o = t.vertexOrigin, map = new Map<number, number[]>();
  for (let v = 0; v < t.nv; v++) {
    if (o[v] === v) continue;
    const list = map.get(o[v]!) ?? [o[v]!];
    list.push(v);
    map.set(o[v]!, list);
  }
  return map;
}

