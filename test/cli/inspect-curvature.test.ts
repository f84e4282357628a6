/**
 * End-to-end checks of `inspect` and `curvature` on files, including exit
 * codes and error lines. Known answers: a closed sphere has χ = 2 and total
 * angle defect 4π (Descartes' theorem); a cylinder has two boundary loops and
 * χ = 0 (elementary topology).
 */
import { describe, expect, it, beforeAll } from 'vitest';
import { mkdtempSync, writeFileSync, readFileSync, readdirSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli, repoPath } from './run-cli.js';
import { icosphere, cylinder, objText } from '../fixtures/shapes.js';

let dir = '';

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'orthodrome-cli-'));
  writeFileSync(join(dir, 'ball.obj'), objText(icosphere(2, 3)));
  writeFileSync(join(dir, 'tube.obj'), objText(cylinder(24, 6, 1, 4)));
  writeFileSync(join(dir, 'bowtie.obj'), 'v 0 0 0\nv 1 0 0\nv 0 1 0\nv -1 0 0\nv 0 -1 0\nf 1 2 3\nf 1 4 5\n');
  writeFileSync(join(dir, 'bad-index.obj'), 'v 0 0 0\nv 1 0 0\nv 0 1 0\nf 1 2 9\n');
});

describe('inspect', () => {
  it('--json has the documented keys and the sphere’s known values', () => {
    const r = runCli(['inspect', join(dir, 'ball.obj'), '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    for (const k of ['vertices', 'faces', 'edges', 'components', 'boundaryLoops', 'eulerCharacteristic', 'genus', 'nonManifoldEdges', 'nonManifoldVertices', 'area', 'totalAngleDefect', 'gaussBonnetResidual', 'minAngleDeg']) {
      expect(j).toHaveProperty(k);
    }
    expect(j.eulerCharacteristic).toBe(2);
    expect(j.genus).toBe(0);
    expect(Math.abs(j.totalAngleDefect - 4 * Math.PI)).toBeLessThan(1e-9);
    expect(Math.abs(j.gaussBonnetResidual)).toBeLessThan(1e-9);
  });
  it('cylinder: two boundary loops, χ = 0', () => {
    const j = JSON.parse(runCli(['inspect', join(dir, 'tube.obj'), '--json']).stdout);
    expect(j.boundaryLoops).toBe(2);
    expect(j.eulerCharacteristic).toBe(0);
  });
  it('reports a bow-tie vertex with its location and still exits 0', () => {
    const r = runCli(['inspect', join(dir, 'bowtie.obj')]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/1 non-manifold vertex\(es\) \(first: vertex 0\)/);
  });
  it('bad input: one line naming file and line, exit 2, no stack trace', () => {
    const r = runCli(['inspect', join(dir, 'bad-index.obj')]);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/bad-index\.obj:4/);
    expect(r.stderr).not.toMatch(/\bat \w+ \(/);
  });
  it('unknown option is a usage error (exit 2)', () => {
    expect(runCli(['inspect', '--frobnicate']).code).toBe(2);
  });
});

describe('curvature', () => {
  it('writes the CSV with the documented header; boundary curvature left empty', () => {
    const out = join(dir, 'tube-curv.csv');
    const r = runCli(['curvature', join(dir, 'tube.obj'), '-o', out]);
    expect(r.code).toBe(0);
    const lines = readFileSync(out, 'utf8').trim().split('\n');
    expect(lines[0]).toBe('vertex,x,y,z,angleDefect,gaussianCurvature,meanCurvature,boundary');
    expect(lines).toHaveLength(24 * 7 + 1);
    // first vertex is on the bottom boundary circle: K and H are not defined there
    expect(lines[1]!.split(',')[5]).toBe('');
    // an interior vertex of a cylinder: defect 0, H = 1/(2R) = 0.5 (do Carmo 1976)
    const mid = lines[1 + 24 * 3]!.split(',').map(Number);
    expect(Math.abs(mid[4]!)).toBeLessThan(1e-12);
    expect(mid[6]).toBeCloseTo(0.5, 1);
  });
  it('refuses a non-manifold mesh unless --split-nonmanifold is given', () => {
    const r = runCli(['curvature', join(dir, 'bowtie.obj'), '--json']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/bowtie\.obj: 1 non-manifold vertex\(es\), first vertex 0; .*--split-nonmanifold/);
    expect(runCli(['curvature', join(dir, 'bowtie.obj'), '--json', '--split-nonmanifold']).code).toBe(0);
  });
  it('an unwritable output fails with exit 2 and leaves no partial or temporary file', () => {
    const out = join(dir, 'no-such-folder', 'x.ply');
    const r = runCli(['curvature', join(dir, 'ball.obj'), '-o', out]);
    expect(r.code).toBe(2);
    expect(existsSync(out)).toBe(false);
    expect(readdirSync(dir).filter((f) => f.includes('.tmp'))).toEqual([]);
  });
  it('an unsupported output extension is refused before any work', () => {
    const r = runCli(['curvature', join(dir, 'ball.obj'), '-o', join(dir, 'x.docx')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/unsupported output format '\.docx'/);
  });
});

describe('demo meshes', () => {
  it('the bundled meshes load cleanly', () => {
    for (const m of ['meshes/ostrel-knoll.obj', 'meshes/px7-cup.ply']) {
      const j = JSON.parse(runCli(['inspect', repoPath(m), '--json']).stdout);
      expect(j.nonManifoldEdges + j.nonManifoldVertices + j.degenerateFacesDropped).toBe(0);
    }
  });
});
