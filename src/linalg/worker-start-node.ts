/**
 * How the linear-algebra executors keep their worker threads (Node only):
 * one home for running a sibling worker module from source or from the build,
 * detaching it from the process's lifetime, forgetting it when it fails or
 * exits, knowing when its module has loaded, and stopping the lot.
 *
 * From source (tsx), a Node 20 worker does not inherit the TypeScript loader,
 * so the worker first registers it and then imports the module; built, the
 * worker runs the compiled JavaScript module directly.
 */
import { Worker } from 'node:worker_threads';

/** A started worker and the promise that its module has loaded. */
export interface StartedWorker {
  readonly worker: Worker;
  /** Resolves when the worker posts its first message (its module loaded) or exits. */
  readonly ready: Promise<void>;
}

/**
 * Starts the worker module `name` (e.g. `'factor-worker'`), a sibling of the
 * module at `here` (its `import.meta.url`), unref'd so that it never keeps
 * the process alive; `gone` runs when it fails or exits.
 */
export function startWorker(here: string, name: string, gone: (w: Worker) => void): StartedWorker {
  const fromSource = here.endsWith('.ts');
  const url = new URL(`./${name}${fromSource ? '.ts' : '.js'}`, here);
  const w = fromSource
    ? new Worker(`import(${JSON.stringify(import.meta.resolve('tsx/esm/api'))}).then((m) => { m.register(); return import(${JSON.stringify(url.href)}); })`, { eval: true })
    : new Worker(url);
  w.unref();
  w.on('error', () => gone(w));
  w.on('exit', () => gone(w));
  const ready = new Promise<void>((resolve) => {
    w.once('message', () => resolve());
    w.once('exit', () => resolve());
  });
  return { worker: w, ready };
}

/**
 * The worker threads of one executor, all running the sibling module `name`
 * of `here`: `list` holds the live ones (a worker that fails or exits leaves it).
 */
export class WorkerSet {
  /** The live workers, in the order they were started. */
  readonly list: Worker[] = [];
  readonly #ready: Promise<void>[] = [];

  constructor(private readonly here: string, private readonly name: string) {}

  /** Starts one more worker (it loads while the caller works). */
  spawn(): Worker {
    const { worker, ready } = startWorker(this.here, this.name, (w) => this.drop(w));
    this.#ready.push(ready);
    this.list.push(worker);
    return worker;
  }

  /** Forgets `w` (it failed, exited, or is being given up). */
  drop(w: Worker): void {
    const i = this.list.indexOf(w);
    if (i >= 0) this.list.splice(i, 1);
  }

  /** Resolves when every started worker has loaded its module (or exited). */
  async ready(): Promise<void> {
    await Promise.all(this.#ready);
  }

  /** Stops every worker (they are unref'd, so a process may also just exit). */
  async close(): Promise<void> {
    const ws = this.list.splice(0);
    await Promise.all(ws.map((w) => w.terminate()));
  }
}
