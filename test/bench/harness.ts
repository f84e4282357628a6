/**
 * Benchmark harness: medians of repeated runs, JSON lines on stdout, ratios
 * against a baseline measured in the same run (the machine is noisy, so only
 * ratios from one run are compared).
 *
 * Each record: {"bench", "case", "metric", "value", "unit", ...extra}.
 */
import { performance } from 'node:perf_hooks';
import type { IntrinsicMesh } from '../../src/metric/intrinsic.js';

/** One JSON-lines record. */
export interface BenchRecord {
  bench: string;
  case: string;
  metric: string;
  value: number;
  unit: string;
  [extra: string]: unknown;
}

/** Prints one record as a JSON line. */
export function emit(r: BenchRecord): void {
  process.stdout.write(JSON.stringify(r) + '\n');
}

/** Median of a list of numbers. */
export function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : 0.5 * (s[m - 1]! + s[m]!);
}

/**
 * Runs `fn` `runs` times (after `warmup` unrecorded runs) and returns the
 * median wall time in milliseconds and the last result.
 */
export async function timeMedian<T>(
  fn: () => T | Promise<T>,
  runs = 5,
  warmup = 1,
): Promise<{ ms: number; all: number[]; result: T }> {
  let result!: T;
  for (let i = 0; i < warmup; i++) result = await fn();
  const all: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    result = await fn();
    all.push(performance.now() - t0);
  }
  return { ms: median(all), all, result };
}

/** Peak resident set size so far, in MB (process-wide high-water mark). */
export function peakRssMB(): number {
  return process.resourceUsage().maxRSS / 1024;
}

/** Current heap + external + array buffers, in MB. */
export function memoryMB(): number {
  const m = process.memoryUsage();
  return (m.heapUsed + m.external + m.arrayBuffers) / (1024 * 1024);
}

/** `--quick` on the command line (or BENCH_QUICK=1) selects the small sizes only. */
export function quick(): boolean {
  return process.argv.includes('--quick') || process.env.BENCH_QUICK === '1';
}

/**
 * The one yardstick of every "× Dijkstra" ratio in the benchmarks (issue 9): Dijkstra (Numer.
 * Math. 1, 1959) from `source` over an edge list of n vertices (edge e joins ea[e] and eb[e],
 * length elen[e]), with a binary heap with decrease-key on typed arrays. Its time includes
 * building the adjacency (CSR) from the list, as it always has: keep it so, so ratios from
 * different runs stay comparable. Use {@link meshEdgeList} for a mesh's list (untimed).
 */
export function edgeDijkstra(n: number, ea: Int32Array, eb: Int32Array, elen: Float64Array, source = 0): Float64Array {
  const deg = new Int32Array(n + 1);
  for (let e = 0; e < ea.length; e++) {
    deg[ea[e]! + 1]!++;
    deg[eb[e]! + 1]!++;
  }
  for (let v = 0; v < n; v++) deg[v + 1]! += deg[v]!;
  const nbr = new Int32Array(deg[n]!), wt = new Float64Array(deg[n]!);
  const fill = deg.slice(0, n);
  for (let e = 0; e < ea.length; e++) {
    let q = fill[ea[e]!]!++;
    nbr[q] = eb[e]!;
    wt[q] = elen[e]!;
    q = fill[eb[e]!]!++;
    nbr[q] = ea[e]!;
    wt[q] = elen[e]!;
  }
  const dist = new Float64Array(n).fill(Infinity);
  const heap = new Int32Array(n);
  const pos = new Int32Array(n).fill(-1); // −1 never queued, −2 settled
  let size = 0;
  const up = (k: number) => {
    const v = heap[k]!, d = dist[v]!;
    while (k > 0) {
      const pk = (k - 1) >> 1, pv = heap[pk]!;
      if (dist[pv]! <= d) break;
      heap[k] = pv;
      pos[pv] = k;
      k = pk;
    }
    heap[k] = v;
    pos[v] = k;
  };
  const down = (k: number) => {
    const v = heap[k]!, d = dist[v]!;
    for (;;) {
      let c = 2 * k + 1;
      if (c >= size) break;
      if (c + 1 < size && dist[heap[c + 1]!]! < dist[heap[c]!]!) c++;
      if (dist[heap[c]!]! >= d) break;
      heap[k] = heap[c]!;
      pos[heap[k]!] = k;
      k = c;
    }
    heap[k] = v;
    pos[v] = k;
  };
  dist[source] = 0;
  heap[size++] = source;
  pos[source] = 0;
  while (size > 0) {
    const u = heap[0]!;
    pos[u] = -2;
    const last = heap[--size]!;
    if (size > 0) {
      heap[0] = last;
      pos[last] = 0;
      down(0);
    }
    const du = dist[u]!;
    for (let q = deg[u]!; q < deg[u + 1]!; q++) {
      const v = nbr[q]!;
      if (pos[v] === -2) continue;
      const nd = du + wt[q]!;
      if (nd < dist[v]!) {
        dist[v] = nd;
        if (pos[v] === -1) {
          heap[size] = v;
          pos[v] = size++;
        }
        up(pos[v]!);
      }
    }
  }
  return dist;
}

/** The edge list of an intrinsic mesh for {@link edgeDijkstra}: endpoints and lengths per edge. */
export function meshEdgeList(mesh: IntrinsicMesh): { n: number; ea: Int32Array; eb: Int32Array; elen: Float64Array } {
  const t = mesh.topology;
  const ea = new Int32Array(t.ne), eb = new Int32Array(t.ne);
  for (let e = 0; e < t.ne; e++) {
    const h = t.edgeHalfedge[e]!;
    ea[e] = t.tri[h]!;
    eb[e] = t.tri[h % 3 === 2 ? h - 2 : h + 1]!;
  }
  return { n: t.nv, ea, eb, elen: mesh.edgeLength };
}

/** Median time of {@link edgeDijkstra} on a mesh from `source`, ms, and its distances. */
export async function timeEdgeDijkstra(mesh: IntrinsicMesh, source: number, runs = 5): Promise<{ ms: number; distance: Float64Array }> {
  const { n, ea, eb, elen } = meshEdgeList(mesh);
  const r = await timeMedian(() => edgeDijkstra(n, ea, eb, elen, source), runs, 1);
  return { ms: r.ms, distance: r.result };
}
