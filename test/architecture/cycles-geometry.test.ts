/**
 * The geometry's own shape (issue #10, "the same geometry in many places"):
 * each small piece of triangle geometry is written once, and the exact
 * solver's folder depends on nothing above it. Read from the sources with the
 * import-graph reader of imports.test.ts (the project-wide cycle checks are
 * there); these checks are the geometry-specific ones. The rules are the
 * project's layering (DEVELOPERS.md: data flows io → mesh → metric →
 * solvers), checked as common practice, not against an outside source.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { cycles, importsOf, root, tsFiles } from './import-graph.js';

/** Source text without comments, so prose that names a formula does not count as code. */
function code(file: string): string {
  const text = readFileSync(join(root, file), 'utf8');
  return text.replace(/\/\*[\s\S]*?\*\//g, '').replace(/(^|[^:'"`])\/\/.*$/gm, '$1');
}

const src = tsFiles('src');

describe('the exact solver depends only downwards', () => {
  it('nothing in src/geodesic/exact/ imports src/geodesic/ outside exact/ and shared/ (type-only imports count)', () => {
    const bad: string[] = [];
    for (const f of tsFiles('src/geodesic/exact')) {
      for (const e of importsOf(f)) {
        const t = e.target;
        if (t && t.startsWith('src/geodesic/') && !t.startsWith('src/geodesic/exact/') && !t.startsWith('src/geodesic/shared/')) bad.push(`${f}:${e.line} → ${t}`);
      }
    }
    expect(bad).toEqual([]);
  });

  it('src/geodesic/exact/, src/geodesic/shared/, src/metric/ and src/mesh/ have no file cycle among them (the add-window split ended propagate ↔ planar ↔ pseudo-wedge)', () => {
    const files = ['src/geodesic/exact', 'src/geodesic/shared', 'src/metric', 'src/mesh'].flatMap((d) => tsFiles(d));
    const inSet = new Set(files);
    const found = cycles(files, (f) => importsOf(f).map((e) => e.target).filter((t): t is string => t !== null && inSet.has(t)));
    expect(found).toEqual([]);
  });

  it('the reader sees the edge that used to close the cycle: planar.ts imports add-window.ts, and add-window.ts imports neither planar nor propagate', () => {
    expect(importsOf('src/geodesic/exact/planar.ts').some((e) => e.target === 'src/geodesic/exact/add-window.ts')).toBe(true);
    const out = importsOf('src/geodesic/exact/add-window.ts').map((e) => e.target);
    expect(out).not.toContain('src/geodesic/exact/planar.ts');
    expect(out).not.toContain('src/geodesic/exact/propagate.ts');
  });
});

describe('one home for each helper', () => {
  // each name is declared (function, const or class) in exactly this file of src/
  const homes: [string, string][] = [
    ['cotOpposite', 'src/metric/triangle.ts'],
    ['faceCotans', 'src/metric/triangle.ts'],
    ['placeThirdCorner', 'src/metric/triangle.ts'],
    ['barycentricVertexAreas', 'src/metric/vertex-areas.ts'],
    ['lumpedMass', 'src/metric/laplacian.ts'],
    ['planarLength', 'src/metric/layout.ts'],
    ['layoutAlong', 'src/metric/layout.ts'],
    ['pointSegmentDistance', 'src/metric/layout.ts'],
    ['baryInFace', 'src/metric/face-points.ts'],
    ['pointInLayout', 'src/metric/face-points.ts'],
    ['facesOfPoint', 'src/metric/face-points.ts'],
    ['commonFaces', 'src/metric/face-points.ts'],
    ['inFaceDistance', 'src/metric/face-points.ts'],
    ['chainLength', 'src/metric/face-points.ts'],
    ['nextOutgoing', 'src/mesh/topology.ts'],
    ['findRoot', 'src/mesh/build.ts'],
    ['windowCrossing', 'src/geodesic/exact/light.ts'],
    ['axisValue', 'src/geodesic/exact/light.ts'],
    ['intervalMin', 'src/geodesic/exact/light.ts'],
    ['addWindow', 'src/geodesic/exact/add-window.ts'],
    ['scanReal', 'src/io/decimal.ts'],
    ['runEdgeDijkstra', 'src/geodesic/shared/edge-dijkstra.ts'],
  ];
  for (const [name, home] of homes) {
    it(`${name} is declared once, in ${home}`, () => {
      const decl = new RegExp(`(function|const|let|class)\\s+${name}\\b`);
      expect(src.filter((f) => decl.test(code(f)))).toEqual([home]);
    });
  }

  // the metric homes and the solvers that read them (other folders have owners of their own)
  const geometryFiles = ['src/geodesic/exact', 'src/geodesic/shared', 'src/metric'].flatMap((d) => tsFiles(d))
    .concat(['src/geodesic/graph.ts', 'src/geodesic/path.ts', 'src/geodesic/waypoints.ts', 'src/mesh/topology.ts']);

  it('no local copy of √(x² + y²) under another name (the old len2) in the geometry files', () => {
    expect(src.filter((f) => /function\s+len2\b/.test(code(f)))).toEqual([]);
    expect(geometryFiles.filter((f) => /Math\.sqrt\((\w+) \* \1 \+ (\w+) \* \2\)/.test(code(f)))).toEqual(['src/metric/layout.ts']);
  });

  it('a triangle is laid out from its lengths ((l² + b² − c²) / 2l) and its cotangents taken (over 4·area) only in metric/triangle.ts', () => {
    const layout = /\((\w+) \* \1 \+ (\w+) \* \2 - (\w+) \* \3\) \/ \(2 \* \w+\)/;
    const cot = /4 \* triangleArea\(/;
    expect(src.filter((f) => layout.test(code(f)) || cot.test(code(f)))).toEqual(['src/metric/triangle.ts']);
  });

  it('the step of the walk round a vertex (h = twin[prev(h)]) is written only in mesh/topology.ts among the geometry files', () => {
    expect(geometryFiles.filter((f) => /=\s*(\w+\.)?twin\[prev\(/.test(code(f)))).toEqual(['src/mesh/topology.ts']);
  });

  it('the ray–axis crossing of a window (x = sx + (px − sx)·(−sy)/(py − sy)) is written only in exact/light.ts', () => {
    expect(tsFiles('src/geodesic/exact').filter((f) => /\* -sy\) \//.test(code(f)))).toEqual(['src/geodesic/exact/light.ts']);
  });
});
