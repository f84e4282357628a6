/**
 * The TypeScript import graph of src/ and cli/, read from the sources: every
 * `import … from`, `export … from`, side-effect `import '…'` and dynamic
 * `import('…')` with a string literal. Relative specifiers are resolved to
 * repository paths (`.js` → `.ts`, as NodeNext resolution spells them);
 * others (npm packages, `node:` builtins) are kept as written.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The repository root. */
export const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');

/** One import of a file. */
export interface ImportEdge {
  /** The specifier as written. */
  spec: string;
  /** Repository path of the target for a relative specifier (e.g. `src/mesh/topology.ts`), else null. */
  target: string | null;
  /** `import type` / `export type` (erased at run time). */
  typeOnly: boolean;
  /** A dynamic `import()`. */
  dynamic: boolean;
  /** 1-based line of the import. */
  line: number;
}

const STATIC = /^\s*(import|export)\s+(type\s+)?(?:[\w*{}\s,$]+?\s+from\s+)?['"]([^'"]+)['"]/gm;
const MULTI = /^\s*(import|export)\s+(type\s+)?\{[^}]*\}\s*from\s+['"]([^'"]+)['"]/gm;
const DYNAMIC = /\bimport\(\s*['"]([^'"]+)['"]\s*\)/g;

/** Source text without comments (so examples in TSDoc are not read as imports). */
function stripComments(text: string): string {
  return text.replace(/\/\*[\s\S]*?\*\//g, (m) => m.replace(/[^\n]/g, ' ')).replace(/(^|[^:'"`])\/\/.*$/gm, '$1');
}

/** Every .ts file under `dir` (a repository path), sorted. */
export function tsFiles(dir: string): string[] {
  const out: string[] = [];
  const walk = (d: string): void => {
    for (const name of readdirSync(join(root, d)).sort()) {
      const p = join(d, name);
      if (statSync(join(root, p)).isDirectory()) walk(p);
      else if (name.endsWith('.ts') && !name.endsWith('.d.ts')) out.push(p);
    }
  };
  walk(dir);
  return out;
}

/** The imports of one file (repository path). */
export function importsOf(file: string): ImportEdge[] {
  const text = stripComments(readFileSync(join(root, file), 'utf8'));
  const lineAt = (i: number): number => text.slice(0, i).split('\n').length;
  const seen = new Set<number>();
  const edges: ImportEdge[] = [];
  const add = (spec: string, typeOnly: boolean, dynamic: boolean, at: number): void => {
    const target = spec.startsWith('.') ? relative(root, resolve(root, dirname(file), spec)).replace(/\.js$/, '.ts') : null;
    edges.push({ spec, target, typeOnly, dynamic, line: lineAt(at) });
  };
  for (const re of [MULTI, STATIC]) {
    for (const m of text.matchAll(re)) {
      if (seen.has(m.index!)) continue;
      seen.add(m.index!);
      add(m[3]!, Boolean(m[2]), false, m.index!);
    }
  }
  for (const m of text.matchAll(DYNAMIC)) add(m[1]!, false, true, m.index!);
  return edges;
}

/** The graph: file → its imports, for every .ts file under the given folders. */
export function importGraph(dirs: string[]): Map<string, ImportEdge[]> {
  const g = new Map<string, ImportEdge[]>();
  for (const d of dirs) for (const f of tsFiles(d)) g.set(f, importsOf(f));
  return g;
}

/**
 * The strongly connected components with more than one node (the cycles) of
 * a directed graph, by Tarjan's algorithm (Tarjan, "Depth-first search and
 * linear graph algorithms", SIAM J. Comput. 1(2), 1972), each sorted, the
 * list sorted by its first node.
 */
export function cycles(nodes: Iterable<string>, next: (n: string) => Iterable<string>): string[][] {
  const index = new Map<string, number>(), low = new Map<string, number>(), onStack = new Set<string>();
  const stack: string[] = [], out: string[][] = [];
  let counter = 0;
  const visit = (v: string): void => {
    index.set(v, counter);
    low.set(v, counter++);
    stack.push(v);
    onStack.add(v);
    for (const w of next(v)) {
      if (!index.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (onStack.has(w)) low.set(v, Math.min(low.get(v)!, index.get(w)!));
    }
    if (low.get(v) === index.get(v)) {
      const comp: string[] = [];
      let w: string;
      do {
        w = stack.pop()!;
        onStack.delete(w);
        comp.push(w);
      } while (w !== v);
      if (comp.length > 1) out.push(comp.sort());
    }
  };
  for (const v of nodes) if (!index.has(v)) visit(v);
  return out.sort((a, b) => a[0]!.localeCompare(b[0]!));
}
