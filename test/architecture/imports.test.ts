/**
 * The shape of the code, checked on its import graph (import-graph.ts):
 * no import cycles between files or between folders of src/ and cli/, the
 * CLI imports only the public entry and the documented subpaths (the
 * package.json "exports"), and the browser entry reaches neither a `node:`
 * module nor three.js by a static import (three.js is loaded on use).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync, existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { cycles, importGraph, importsOf, root, type ImportEdge } from './import-graph.js';

const graph = importGraph(['src', 'cli']);
const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')) as {
  exports: Record<string, string | { types: string; default: string }>;
  dependencies: Record<string, string>;
};

/** The source file of each package.json export (`./dist/src/api/mesh.js` → `src/api/mesh.ts`). */
const exportSources = new Map(
  Object.entries(pkg.exports)
    .filter(([, v]) => typeof v !== 'string')
    .map(([k, v]) => [k, (v as { default: string }).default.replace(/^\.\/dist\//, '').replace(/\.js$/, '.ts')]),
);

/**
 * The entry files: the targets of the package.json exports (src/index.ts, src/core.ts, the subpath
 * indexes), except src/errors.ts, a leaf module that every layer uses and that is exported as it is.
 */
const entryFiles = new Set([...exportSources.values()].filter((f) => f !== 'src/errors.ts'));

/**
 * Folder of a source file as a node of the folder graph. A file directly in src/ and an entry file (a
 * subpath index such as src/api/mesh.ts or src/curves/index.ts) are nodes of their own: entries sit on
 * top of the graph and re-export from anywhere below.
 */
const folderOf = (f: string): string => (dirname(f) === 'src' || entryFiles.has(f) ? f : dirname(f));

const where = (f: string, e: ImportEdge) => `${f}:${e.line} imports '${e.spec}'`;

describe('the import graph reader', () => {
  it('finds static, type-only, multi-line and dynamic imports (checked against the file text)', () => {
    // cli/orthodrome.ts imports commander and its commands (its own text, read by eye: common practice)
    const specs = importsOf('cli/orthodrome.ts').map((e) => e.spec);
    expect(specs).toContain('commander');
    expect(specs).toContain('./commands/distance.js');
    // src/api/locate.ts imports the snapping resolver by a dynamic import, a type by a type-only import
    const locate = importsOf('src/api/locate.ts');
    expect(locate.some((e) => e.dynamic && e.target === 'src/query/resolve.ts')).toBe(true);
    expect(locate.some((e) => e.typeOnly && !e.dynamic && e.target === 'src/mesh/topology.ts')).toBe(true);
    expect(locate.some((e) => !e.typeOnly && !e.dynamic && e.target === 'src/query/resolver.ts')).toBe(true);
  });

  it("finds the cycles of a small graph (Tarjan 1972: strongly connected components)", () => {
    const g: Record<string, string[]> = { a: ['b'], b: ['c'], c: ['a', 'd'], d: [], e: ['e2'], e2: ['e'], f: ['a'] };
    expect(cycles(Object.keys(g), (n) => g[n]!)).toEqual([['a', 'b', 'c'], ['e', 'e2']]);
    expect(cycles(['x', 'y'], (n) => (n === 'x' ? ['y'] : []))).toEqual([]);
  });
});

describe('import cycles', () => {
  it('no two files of src/ and cli/ import each other, directly or through others (type-only imports count)', () => {
    const found = cycles(graph.keys(), (f) => graph.get(f)!.map((e) => e.target).filter((t): t is string => t !== null && graph.has(t)));
    expect(found, `file cycles:\n${found.map((c) => c.join(' → ')).join('\n')}`).toEqual([]);
  });

  it('the entries are on top: no file under src/ imports one, except an entry (src/index.ts re-exports src/core.ts)', () => {
    const bad: string[] = [];
    for (const [f, es] of graph) {
      if (!f.startsWith('src/') || entryFiles.has(f)) continue;
      for (const e of es) if (e.target && entryFiles.has(e.target)) bad.push(where(f, e));
    }
    expect(bad, bad.join('\n')).toEqual([]);
  });

  it('no two folders of src/ import each other (data flows one way: io → mesh → metric → solvers → reports → api)', () => {
    const edges = new Map<string, Set<string>>();
    for (const [f, es] of graph) {
      if (!f.startsWith('src/')) continue;
      const from = folderOf(f);
      if (!edges.has(from)) edges.set(from, new Set());
      for (const e of es) if (e.target?.startsWith('src/') && folderOf(e.target) !== from) edges.get(from)!.add(folderOf(e.target));
    }
    const found = cycles(edges.keys(), (n) => edges.get(n) ?? []);
    const why = found.map((c) => {
      const links = c.flatMap((a) => c.filter((b) => edges.get(a)?.has(b)).map((b) => {
        const f = [...graph].find(([file, es]) => folderOf(file) === a && es.some((e) => e.target && folderOf(e.target) === b))!;
        return `  ${a} → ${b} (e.g. ${f[0]})`;
      }));
      return `${c.join(' ⇄ ')}:\n${links.join('\n')}`;
    });
    expect(found, `folder cycles:\n${why.join('\n')}`).toEqual([]);
  });
});

describe('the CLI is a client of the public entry', () => {
  const allowed = new Set(exportSources.values());

  it('every package.json export names a source file that exists', () => {
    expect(exportSources.get('.')).toBe('src/index.ts');
    for (const [k, src] of exportSources) expect(existsSync(join(root, src)), `${k} → ${src}`).toBe(true);
  });

  it('cli/ imports only cli/, the public entry, the documented subpaths, Node builtins and declared dependencies', () => {
    const bad: string[] = [];
    for (const [f, es] of graph) {
      if (!f.startsWith('cli/')) continue;
      for (const e of es) {
        if (e.target === null) {
          if (!e.spec.startsWith('node:') && !(e.spec in pkg.dependencies)) bad.push(where(f, e));
        } else if (!e.target.startsWith('cli/') && !allowed.has(e.target)) bad.push(where(f, e));
      }
    }
    expect(bad, bad.join('\n')).toEqual([]);
  });
});

describe('the browser entry', () => {
  /** Files reached from `start` by static, non-type imports (what a bundler puts in the entry chunk). */
  function staticClosure(start: string): { files: Set<string>; packages: Map<string, string> } {
    const files = new Set<string>([start]), packages = new Map<string, string>();
    const todo = [start];
    while (todo.length) {
      const f = todo.pop()!;
      for (const e of graph.get(f) ?? importsOf(f)) {
        if (e.dynamic || e.typeOnly) continue;
        if (e.target === null) {
          if (!packages.has(e.spec)) packages.set(e.spec, f);
        } else if (!files.has(e.target)) {
          files.add(e.target);
          todo.push(e.target);
        }
      }
    }
    return { files, packages };
  }

  it('src/core.ts reaches no node: module and no three.js by a static import', () => {
    const { packages } = staticClosure('src/core.ts');
    const bad = [...packages].filter(([p]) => p.startsWith('node:') || p === 'three' || p.startsWith('three/') || p === 'three-mesh-bvh');
    expect(bad.map(([p, f]) => `${f} imports ${p}`)).toEqual([]);
  });

  it('snapping (three.js) is still reachable, through the dynamic import in src/api/locate.ts', () => {
    // guards the check above against passing because snapping was dropped
    const { packages } = staticClosure('src/query/resolve.ts');
    expect(packages.has('three')).toBe(true);
    expect(packages.has('three-mesh-bvh')).toBe(true);
  });
});

describe('the root export', () => {
  it('is the facade: the names the README lists in its library section (a new root name is a decision: add it there and here)', async () => {
    const root = await import('../../src/index.js');
    // common practice: a package's root names are its documented surface; internals go to subpaths
    expect(Object.keys(root).sort()).toEqual([
      'OrthodromeError', 'boundarySources', 'curvatureSummary', 'encodeRoute', 'encodeVertexColumns', 'fieldStats', 'formatSurfacePoint',
      'inspectProblems', 'inspectSurface', 'isManifold', 'isOrthodromeError', 'loadSurface', 'measureDistances', 'openSurface', 'openTerrain', 'pointLocator',
      'prepareDistances', 'scoreSurface', 'shortestPath', 'straightestLine', 'surfaceIsolines', 'surfaceOffset', 'travelField', 'travelRoute', 'writeCurves', 'writeFileAtomic',
    ]);
  });
});
