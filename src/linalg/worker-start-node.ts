/**
 * How the linear-algebra executors start their worker threads (Node only):
 * one home for running a sibling worker module from source or from the build,
 * detaching it from the process's lifetime, forgetting it when it fails or
 * exits, and knowing when its module has loaded.
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
