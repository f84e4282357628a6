/**
 * Size of the browser bundle of the core (`src/core.ts`, the `orthodrome/browser` entry):
 * esbuild, minified, ES modules for the browser. `splitting` puts what is loaded by a dynamic
 * import (three.js and three-mesh-bvh, for snapping `p:` points: src/api/locate.ts) in chunks of
 * their own, so `entry` is what a page that never snaps points downloads; `all` adds every chunk.
 * `single` is one file with the lazy parts inlined (a bundler without code splitting).
 * Bytes, and gzip bytes (level 9) beside them. `npm run size` runs only this benchmark.
 */
import { build, type OutputFile } from 'esbuild';
import { gzipSync } from 'node:zlib';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { emit } from './harness.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '../..');

async function bundle(splitting: boolean): Promise<OutputFile[]> {
  const r = await build({
    entryPoints: { core: join(root, 'src/core.ts') },
    bundle: true,
    minify: true,
    format: 'esm',
    platform: 'browser',
    target: 'es2022',
    splitting,
    outdir: join(root, 'out/bundle-size'),
    write: false,
    logLevel: 'silent',
  });
  return r.outputFiles.filter((f) => f.path.endsWith('.js'));
}

const gz = (files: OutputFile[]) => files.reduce((a, f) => a + gzipSync(f.contents, { level: 9 }).length, 0);
const bytes = (files: OutputFile[]) => files.reduce((a, f) => a + f.contents.length, 0);

const split = await bundle(true);
const entry = split.filter((f) => f.path.endsWith('/core.js'));
const single = await bundle(false);
for (const [name, files] of [['entry', entry], ['all', split], ['single', single]] as const) {
  emit({ bench: 'bundle-size', case: name, metric: 'bytes', value: bytes(files), unit: 'B', files: files.length });
  emit({ bench: 'bundle-size', case: name, metric: 'gzip_bytes', value: gz(files), unit: 'B' });
}
