/**
 * The package as installed resolves every documented entry: the sources are
 * compiled (tsconfig.build.json, into a temporary folder with a copy of
 * package.json and a link to node_modules), and a Node process importing
 * `orthodrome`, `orthodrome/mesh`, … by the package name (Node resolves a
 * package's own name through its "exports" map: the Node.js manual,
 * "Self-referencing a package using its name") must load each one, with its
 * declaration file beside it.
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { cpSync, existsSync, mkdtempSync, readFileSync, rmSync, symlinkSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { root } from './import-graph.js';

const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')) as { name: string; exports: Record<string, string | { types: string; default: string }> };
const entries = Object.entries(pkg.exports).filter(([k, v]) => typeof v !== 'string' && k !== './package.json') as [string, { types: string; default: string }][];

describe('package exports', () => {
  it('every export of the built package loads by its name, with its declarations', () => {
    const dir = mkdtempSync(join(tmpdir(), 'orthodrome-exports-'));
    try {
      const tsc = spawnSync(process.execPath, [join(root, 'node_modules/typescript/bin/tsc'), '-p', join(root, 'tsconfig.build.json'), '--outDir', join(dir, 'dist')], { encoding: 'utf8' });
      // type errors elsewhere in the tree do not stop the emit; a missing output file below would
      expect(tsc.error).toBeUndefined();
      cpSync(join(root, 'package.json'), join(dir, 'package.json'));
      symlinkSync(join(root, 'node_modules'), join(dir, 'node_modules'), 'dir');
      for (const [k, v] of entries) {
        expect(existsSync(join(dir, v.default)), `${k}: ${v.default}`).toBe(true);
        expect(existsSync(join(dir, v.types)), `${k}: ${v.types}`).toBe(true);
      }
      const names = entries.map(([k]) => (k === '.' ? pkg.name : `${pkg.name}/${k.slice(2)}`));
      const script = `const out = {}; for (const n of ${JSON.stringify(names)}) out[n] = Object.keys(await import(n)).length; console.log(JSON.stringify(out));`;
      const r = spawnSync(process.execPath, ['--input-type=module', '-e', script], { cwd: dir, encoding: 'utf8' });
      expect(r.stderr).toBe('');
      const counts = JSON.parse(r.stdout) as Record<string, number>;
      for (const n of names) expect(counts[n], n).toBeGreaterThan(0);
      // the root is the facade: its first names (README's library section)
      const root0 = spawnSync(process.execPath, ['--input-type=module', '-e', `const m = await import('${pkg.name}'); console.log(typeof m.loadSurface, typeof m.measureDistances, typeof m.shortestPath)`], { cwd: dir, encoding: 'utf8' });
      expect(root0.stdout.trim()).toBe('function function function');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 60_000);
});
