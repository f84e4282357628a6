/**
 * `distance --each --jobs N`: source sets solved in parallel worker threads
 * (node:worker_threads; Node-only, so it lives in cli/, not src/).
 *
 * The main thread loads the mesh once and copies its topology arrays,
 * positions and edge lengths into shared memory (SharedArrayBuffer) once; for
 * the exact method it also prepares the source-independent geometry
 * (`prepareExactGeometry`) once, in shared memory. Workers get views of
 * those buffers, not copies, and rebuild only small objects around them. The
 * heat method's factorization is made by each worker (it is not shared:
 * N workers prepare N times, at the same time, and hold N factors).
 *
 * Work is handed out one source set at a time to whichever worker is free;
 * each solve is the same deterministic computation as with `--jobs 1`, so
 * results are identical, in the order of the sets. The memory budget is the
 * total for the run: each of the N concurrent solves gets 1/N of it.
 */
import { Worker } from 'node:worker_threads';
import { statSync } from 'node:fs';
import {
  OrthodromeError, isOrthodromeError, prepareDistances,
  type DistanceMethod, type DistanceResult, type DistanceSolver, type PrepareOptions, type SolvableSurface, type SolveOptions, type SourceSet, type SurfacePoint,
} from '../src/index.js';
import { limitError } from '../src/errors.js';
import { surfaceIntrinsic, type IntrinsicMesh } from '../src/api/metric.js';
import type { Topology } from '../src/api/mesh.js';
import { prepareExactGeometry, type ExactGeometry } from '../src/api/geodesic.js';
import { NodeFactorExecutor, NodeOrderingExecutor } from '../src/api/node.js';
import type { ProgressLine } from './progress.js';

let factorExecutor: NodeFactorExecutor | null = null;

/**
 * The process's one executor for the heat method's factorizations (worker
 * threads from FACTOR_THREADS_MIN_SIZE unknowns; bit-identical results).
 * Test-only: ORTHODROME_TEST_FACTOR_MIN_SIZE=N lowers that threshold to N and
 * turns off taking jobs back, so a small test mesh is factored on a thread.
 */
export function factorThreads(): NodeFactorExecutor {
  if (!factorExecutor) {
    const test = process.env.ORTHODROME_TEST_FACTOR_MIN_SIZE;
    const n = test ? Number(test) : NaN;
    // one thread: the heat method sends at most one factorization away (the rest, or the pair, is factored here)
    factorExecutor = Number.isInteger(n) && n >= 0 ? new NodeFactorExecutor({ threads: 1, minSize: n, steal: false }) : new NodeFactorExecutor({ threads: 1 });
  }
  return factorExecutor;
}

let orderingExecutor: NodeOrderingExecutor | null = null;

/**
 * Mesh files from this size up start the heat method's worker threads before
 * they are read: a 200k-vertex OBJ (FACTOR_THREADS_MIN_SIZE) is about 14 MB,
 * so from 8 MB the threads most likely take part, and they load their
 * modules while this thread parses the mesh instead of during the
 * preparation. Below it they start, if at all, when the preparation needs
 * them (unref'd threads cost nothing more than their memory either way).
 */
export const EARLY_THREADS_BYTES = 8 * 2 ** 20;

/** Starts the heat method's worker threads now when `meshPath` is a large file (see {@link EARLY_THREADS_BYTES}). */
export function warmHeatThreads(meshPath: string): void {
  let size = 0;
  try {
    size = statSync(meshPath).size;
  } catch {
    return; // the loader reports an unreadable file
  }
  if (size < EARLY_THREADS_BYTES) return;
  factorThreads().warm();
  orderingThreads().warm();
}

/**
 * The process's one executor for the heat method's nested dissection (one
 * worker thread from ORDERING_THREADS_MIN_SIZE = 200k vertices; the same ordering
 * as on one thread). Test-only: ORTHODROME_TEST_ORDERING_MIN_SIZE=N lowers
 * that threshold to N and leaves every part to the worker.
 */
export function orderingThreads(): NodeOrderingExecutor {
  if (!orderingExecutor) {
    const n = Number(process.env.ORTHODROME_TEST_ORDERING_MIN_SIZE ?? NaN);
    orderingExecutor = Number.isInteger(n) && n >= 0 ? new NodeOrderingExecutor({ threads: 1, minSize: n, callerOrders: false }) : new NodeOrderingExecutor({ threads: 1 });
  }
  return orderingExecutor;
}

/** Everything needed to prepare the same solver in any thread. */
export interface SolverSpec {
  /** The surface (on a worker: its topology, positions and orientation seams only). */
  surface: SolvableSurface;
  method: DistanceMethod;
  /** The solver's options (`mesh`: the intrinsic mesh, when already made). */
  opts: PrepareOptions;
}

/** Prepares the solver of `distance` for a spec (the library's `prepareDistances`: double cover, pinch points). */
export function prepareSolver(spec: SolverSpec): DistanceSolver {
  return prepareDistances(spec.surface, spec.method, spec.opts);
}

type Shareable = Uint32Array | Int32Array | Float64Array | Uint8Array;

const isTyped = (x: unknown): x is Shareable =>
  x instanceof Uint32Array || x instanceof Int32Array || x instanceof Float64Array || x instanceof Uint8Array;

/** A copy of `a` in a SharedArrayBuffer (or `a` itself when it already is in one). */
export function toShared<T extends Shareable>(a: T): T {
  if (a.buffer instanceof SharedArrayBuffer) return a;
  const C = a.constructor as new (b: SharedArrayBuffer) => T;
  const out = new C(new SharedArrayBuffer(a.byteLength));
  (out as Float64Array).set(a as Float64Array);
  return out;
}

/** Every typed-array field of `o` moved to shared memory; other fields kept. */
function sharedFields<T extends object>(o: T): T {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(o)) out[k] = isTyped(v) ? toShared(v) : v;
  return out as T;
}

/** What a worker receives once (shared buffers inside). */
export interface WorkerInit {
  topology: Topology;
  positions: Float64Array;
  edgeLength: Float64Array;
  seams: Int32Array;
  method: DistanceMethod;
  opts: PrepareOptions;
  /** ExactGeometry without its mesh, arrays shared (exact method on an orientable surface). */
  geometry: Omit<ExactGeometry, 'mesh'> | null;
}

/** One task: a source set, and the points whose values are wanted. */
export interface WorkerTask { id: number; set: SourceSet; solve: SolveOptions; atPoints: SurfacePoint[] }

/** A worker's answer: a solved set, or an error. */
export type WorkerReply =
  | { kind: 'ready'; prepareMs: number; prepareDetails: Record<string, number | boolean | string> }
  | { kind: 'done'; id: number; distance: Float64Array; at: number[]; solveMs: number; complete: boolean; stoppedBy: DistanceResult['stoppedBy']; details: DistanceResult['details'] }
  | { kind: 'error'; id: number; error: ErrorData };

/** Rebuilds the solver spec in a worker from its init message (views of the shared buffers). */
export function specFromInit(w: WorkerInit): SolverSpec {
  const mesh: IntrinsicMesh = { topology: w.topology, edgeLength: w.edgeLength };
  const opts: PrepareOptions = { ...w.opts, mesh };
  if (w.geometry) opts.exactGeometry = { ...w.geometry, mesh } as ExactGeometry;
  return { surface: { topology: w.topology, positions: w.positions, report: { orientationSeams: w.seams } }, method: w.method, opts };
}

/** An error sent across threads, as plain data. */
export function errorData(e: unknown): ErrorData {
  if (isOrthodromeError(e)) return { name: e.name, message: e.message, code: e.code, detail: e.detail, ...(e.location !== undefined ? { location: e.location } : {}) };
  if (e instanceof Error) {
    const nodeCode = (e as { code?: unknown }).code;
    return { name: e.name, message: e.message, ...(typeof nodeCode === 'string' ? { nodeCode } : {}) };
  }
  return { name: 'Error', message: String(e) };
}

/** An error as plain data: an OrthodromeError's code, detail and location, or a runtime error's name, message and Node code. */
export interface ErrorData { name: string; message: string; code?: string; detail?: string; location?: string; nodeCode?: string }

function revive(d: ErrorData, jobs: number): Error {
  if (d.code) {
    const detail = d.code === 'LIMIT' ? `${d.detail}; with --jobs ${jobs} each of the ${jobs} solves at once gets 1/${jobs} of the memory budget` : d.detail!;
    return new OrthodromeError(d.code as OrthodromeError['code'], detail, d.location);
  }
  const E = d.name === 'RangeError' ? RangeError : Error;
  const e = new E(d.message);
  if (d.nodeCode) Object.assign(e, { code: d.nodeCode }); // run.ts maps Node's size errors by code
  return e;
}

/** A result that holds only its field and its values at `points` (`at` answers only those). */
function light(field: DistanceResult['field'], points: SurfacePoint[], values: number[], r: Pick<DistanceResult, 'solveMs' | 'complete' | 'stoppedBy' | 'details'>): DistanceResult {
  const key = (p: SurfacePoint): string => JSON.stringify(p);
  const byKey = new Map(points.map((p, i) => [key(p), values[i]!]));
  return {
    field,
    at: (p) => {
      const v = byKey.get(key(p));
      if (v === undefined) throw new Error('internal: a point whose value was not kept');
      return v;
    },
    solveMs: r.solveMs, complete: r.complete, stoppedBy: r.stoppedBy ?? null, details: r.details,
  };
}

/** The outcome of {@link solveSets}. */
export interface SolvedSets {
  prepareMs: number;
  prepareDetails: Record<string, number | boolean | string>;
  results: DistanceResult[];
}

/**
 * Solves every source set, in `jobs` worker threads when jobs > 1 and there
 * is more than one set (else here, one after another). `atPoints` are the
 * points whose values `at` must give: every result answers only those, and
 * keeps nothing else of its solve.
 */
export async function solveSets(
  spec: SolverSpec, sets: SourceSet[], so: SolveOptions, atPoints: SurfacePoint[], jobs: number, line?: ProgressLine,
): Promise<SolvedSets> {
  const t0 = performance.now();
  const label = `${spec.method} distance`;
  if (jobs <= 1 || sets.length <= 1) {
    const solver = prepareSolver(spec);
    const prepareMs = performance.now() - t0;
    // keep only the field and the values at `atPoints` of each solve: a result's `at` holds the whole solver
    // state (an exact run's windows), and keeping every set's would add a run's memory per set
    const results = sets.map((s, i) => {
      line?.update({ label, set: [i + 1, sets.length], share: undefined });
      const r = solver.solve(s, so);
      return light(r.field, atPoints, atPoints.map((p) => r.at(p)), r);
    });
    return { prepareMs, prepareDetails: solver.prepareDetails, results };
  }
  const n = Math.min(jobs, sets.length);
  const { surface } = spec;
  const seams = surface.report.orientationSeams;
  const mesh = spec.opts.mesh ?? surfaceIntrinsic(surface); // a --metric's lengths when one is attached
  const topology = sharedFields(surface.topology);
  const edgeLength = toShared(mesh.edgeLength);
  const opts: PrepareOptions = { ...spec.opts };
  delete opts.mesh;
  delete opts.exactGeometry;
  delete opts.progress; // a function cannot cross to a worker; the line counts finished sets instead
  if (opts.heat?.factorExecutor) opts.heat = { ...opts.heat, factorExecutor: null }; // nor can an executor: each worker factors on its own thread
  if (opts.heat?.orderingExecutor) opts.heat = { ...opts.heat, orderingExecutor: null }; // nor orders on other threads
  if (opts.memoryBudget !== undefined) opts.memoryBudget = Math.floor(opts.memoryBudget / n);
  let geometry: WorkerInit['geometry'] = null;
  if (spec.method === 'exact' && seams.length === 0) {
    const { mesh: _m, ...rest } = prepareExactGeometry(mesh);
    geometry = sharedFields(rest);
  }
  const init: WorkerInit = { topology, positions: toShared(surface.positions), edgeLength, seams, method: spec.method, opts, geometry };
  const here = import.meta.url;
  const url = new URL(here.endsWith('.ts') ? './solve-worker.ts' : './solve-worker.js', here);
  // run from source (tsx): a worker does not inherit the TypeScript loader's hooks on Node 20, so it
  // registers them itself before importing the worker module (built: plain JavaScript, no loader)
  const boot = here.endsWith('.ts')
    ? `import(${JSON.stringify(import.meta.resolve('tsx/esm/api'))}).then((m) => { m.register(); return import(${JSON.stringify(url.href)}); })`
    : null;
  const workers = Array.from({ length: n }, () => (boot ? new Worker(boot, { eval: true, workerData: init }) : new Worker(url, { workerData: init })));
  const results: DistanceResult[] = new Array(sets.length);
  let prepareMs = 0, prepareDetails: SolvedSets['prepareDetails'] = {};
  let done = 0;
  const tick = (): void => line?.update({ label: `${label}, ${done} of ${sets.length} sets done`, share: done / sets.length });
  const timer = line?.enabled ? setInterval(tick, 200) : undefined;
  try {
    await new Promise<void>((resolve, reject) => {
      let next = 0, failed = false;
      const give = (w: Worker): void => {
        if (next < sets.length) {
          const id = next++;
          const task: WorkerTask = { id, set: sets[id]!, solve: so, atPoints };
          w.postMessage(task);
        }
      };
      const fail = (e: Error): void => { if (!failed) { failed = true; reject(e); } };
      for (const w of workers) {
        w.on('error', (e) => {
          const oom = (e as { code?: unknown }).code === 'ERR_WORKER_OUT_OF_MEMORY';
          fail(oom ? limitError(`a worker thread ran out of memory (${n} at once); use fewer --jobs or --method heat`) : e instanceof Error ? e : new Error(String(e)));
        });
        w.on('exit', (code) => { if (done < sets.length) fail(new Error(`a worker thread stopped early (exit code ${code})`)); });
        w.on('message', (m: WorkerReply) => {
          if (m.kind === 'error') return fail(revive(m.error, n));
          if (m.kind === 'ready') {
            prepareMs = Math.max(prepareMs, performance.now() - t0);
            prepareDetails = m.prepareDetails;
            return give(w);
          }
          const field = { method: spec.method, distance: m.distance, sources: [...sets[m.id]!.points, ...sets[m.id]!.curves.flat()] };
          results[m.id] = light(field, atPoints, m.at, m);
          done++;
          tick();
          if (done === sets.length) resolve();
          else give(w);
        });
      }
    });
  } finally {
    if (timer) clearInterval(timer);
    await Promise.all(workers.map((w) => w.terminate()));
  }
  return { prepareMs, prepareDetails, results };
}
