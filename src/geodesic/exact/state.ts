/**
 * Shared state of one exact run: per-vertex distance bounds and how each
 * bound was reached, the window store, the event queue and the roots.
 */
import type { IntrinsicMesh } from '../../metric/intrinsic.js';
import type { Topology } from '../../mesh/topology.js';
import type { ExactGeometry } from './geometry.js';
import { prepareExactGeometry } from './geometry.js';
import { WindowStore } from './windows.js';
import { EventQueue } from './queue.js';
import { BucketQueue } from './bucket-queue.js';
import { RunBudget } from './budget.js';
import { maxPerHalfEdge } from './guard.js';
import { TrimWork } from './trim.js';
import type { Via } from './codes.js';

/** Working space of one run, so that the solver keeps no module state (runs may interleave). */
export interface ExactScratch {
  /** Intervals written by trimBoth: N's [b0, b1], then O's. */
  readonly pair: Float64Array;
  /** trimBoth's break points and piece sides. */
  readonly trim: TrimWork;
  /** A pseudo-source's fan (pseudo-wedge.ts): its half-edges, grown on demand. */
  fanH: Int32Array;
  /** The angle before each of them, from the first. */
  fanT: Float64Array;
  /** A point in a face frame (evaluate.ts). */
  readonly point: number[];
}

/** A point source off the vertices, or a segment of a curve source: the faces holding it and its coordinates in each. */
export interface PointRoot {
  /** Root id. */
  root: number;
  /** Index of the point in the run's source list. */
  source: number;
  /** Faces whose closure holds the point. */
  faces: number[];
  /** Barycentric coordinates in each face, three per face. */
  bary: number[];
  /** For a segment of a curve source: its other end, three per face. */
  bary2?: number[];
}

/** Everything a run reads and writes. */
export interface ExactState {
  /** The mesh being solved. */
  readonly mesh: IntrinsicMesh;
  /** Its topology. */
  readonly t: Topology;
  /** The mesh's source-independent data (geometry.ts), shared with other runs: read only. */
  readonly geometry: ExactGeometry;
  /** Length of each half-edge. */
  readonly hl: Float64Array;
  /** Third corner (cx, cy) of the face of each half-edge laid out along it (see layout.ts). */
  readonly hc: Float64Array;
  /** Upper bound on the distance of each vertex; exact once settled. */
  readonly dist: Float64Array;
  /** How each bound was reached (VIA_* constants, codes.ts). */
  readonly viaType: Uint8Array;
  /** Window, root or vertex id for `viaType`. */
  readonly viaId: Int32Array;
  /** 1 once a vertex's event was processed (its bound is final). */
  readonly settled: Uint8Array;
  /** 1 for vertices that emit windows when settled (sources, saddles, boundary vertices). */
  readonly pseudo: Uint8Array;
  /** Corner angle at the tail of each half-edge (set by markPseudoSources; empty until then). */
  angle: Float64Array;
  /** All windows. */
  readonly win: WindowStore;
  /** Vertex events (−1 − v) by key, in exact order. */
  readonly queue: EventQueue;
  /** Windows by key, in buckets (bucket-queue.ts). */
  readonly wq: BucketQueue;
  /** Vertex of root r (−1 for a point source or curve segment). */
  rootVertex: Int32Array;
  /** Distance σ of root r. */
  rootSigma: Float64Array;
  /** Number of roots. */
  nRoots: number;
  /** Point sources off the vertices. */
  pointRoots: PointRoot[];
  /** Windows beyond this key are not stored. */
  readonly maxDistance: number;
  /** Explicit window cap (Infinity when none; the memory budget is in `win.budget`). */
  readonly maxWindows: number;
  /** Set when the store had no more room (why: `win.budget.tripped`). */
  overflow: boolean;
  /** Set when something was left out for lying beyond maxDistance. */
  capped: boolean;
  /** Set when the run was stopped as not converging (guard.ts): which bound it passed. */
  diverged: '' | 'edge' | 'events';
  /** The half-edge that passed its window cap (diverged 'edge'). */
  divergedAt: number;
  /** Events processed so far (guard.ts). */
  events: number;
  /** Windows one half-edge may receive before the run is stopped as diverging (guard.ts; tests lower it). */
  maxPerEdge: number;
  /**
   * Pruning on (default): vertex filter, trimming and merging. Off, every
   * window propagates unpruned (plain window propagation, for reference
   * checks on small meshes only: the window count grows very fast).
   */
  prune: boolean;
  /** Saddles emit windows only into their shadow wedge (pseudo-wedge.ts; default on, needs `prune`). */
  wedge: boolean;
  /** The run's working space. */
  readonly scratch: ExactScratch;
}

/**
 * Allocates the state of one run; `capacity` is the initial window
 * capacity reserved, `maxWindows` an explicit window cap (Infinity for
 * none). `geometry` must have been made for `mesh` (made here when absent).
 * `memoryBudget` (bytes, default none) bounds the run's arrays (budget.ts);
 * `estimate` lets the budget refuse early a run projected not to fit (only
 * for runs that cover every reachable face).
 */
export function createState(
  mesh: IntrinsicMesh, maxDistance: number, maxWindows: number, capacity: number,
  geometry = prepareExactGeometry(mesh), memoryBudget = Infinity, estimate = false,
): ExactState {
  const t = mesh.topology;
  const { hl, hc } = geometry;
  const budget = new RunBudget(memoryBudget, maxWindows, estimate);
  const s: ExactState = {
    mesh, t, geometry, hl, hc,
    dist: new Float64Array(t.nv).fill(Infinity),
    viaType: new Uint8Array(t.nv),
    viaId: new Int32Array(t.nv).fill(-1),
    settled: new Uint8Array(t.nv),
    pseudo: new Uint8Array(t.nv),
    angle: new Float64Array(0),
    win: new WindowStore(t, capacity, budget),
    queue: new EventQueue(Math.min(capacity, t.nv + 1024)),
    wq: new BucketQueue(geometry.bucketWidth, capacity),
    rootVertex: new Int32Array(64),
    rootSigma: new Float64Array(64),
    nRoots: 0,
    pointRoots: [],
    maxDistance,
    maxWindows,
    overflow: false,
    capped: false,
    diverged: '',
    divergedAt: -1,
    events: 0,
    maxPerEdge: maxPerHalfEdge(t.nv),
    prune: true,
    wedge: true,
    scratch: {
      pair: new Float64Array(4), trim: new TrimWork(), fanH: new Int32Array(64), fanT: new Float64Array(64), point: [0, 0],
    },
  };
  // per-vertex arrays of this run (dist, viaType, viaId, settled, pseudo) and the shared geometry
  const g = geometry;
  budget.fixedBytes = 15 * t.nv + s.win.fixedBytes + g.hl.byteLength + g.hc.byteLength + g.angle.byteLength + g.saddle.byteLength + g.sharp.byteLength;
  budget.queueBytes = () => s.queue.bytes + s.wq.touchedBytes;
  return s;
}

/** Registers a root and returns its id. */
export function addRoot(s: ExactState, vertex: number, sigma: number): number {
  if (s.nRoots === s.rootVertex.length) {
    const v = new Int32Array(2 * s.nRoots), g = new Float64Array(2 * s.nRoots);
    v.set(s.rootVertex); g.set(s.rootSigma);
    s.rootVertex = v; s.rootSigma = g;
  }
  s.rootVertex[s.nRoots] = vertex;
  s.rootSigma[s.nRoots] = sigma;
  return s.nRoots++;
}

/** Lowers vertex v's bound to d (recording how) and queues it; ignores settled vertices. */
export function relaxVertex(s: ExactState, v: number, d: number, type: Via, id: number): void {
  if (s.settled[v] || !(d < s.dist[v]!)) return;
  s.dist[v] = d;
  s.viaType[v] = type;
  s.viaId[v] = id;
  if (d <= s.maxDistance) s.queue.push(d, -1 - v);
  else s.capped = true;
}
