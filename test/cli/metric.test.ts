/**
 * End-to-end checks of `--metric`: every measuring command takes it, says
 * which metric measured its lengths (JSON `metric`, a comment line in CSV
 * files, a GeoJSON property), and refuses what it cannot do, on one line
 * with exit code 2. Closed forms: the hyperbolic half-plane (ln(y₂/y₁) on a
 * vertical: Beardon, The Geometry of Discrete Groups, §7.2 — from memory),
 * a constant tensor on a plane (√(Δᵀ G Δ): a linear change of coordinates).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './run-cli.js';
import { flatGrid, objText, rng } from '../fixtures/shapes.js';

let dir = '';
const n = 8; // grid over [−1, 1] × [0.5, 2.5], vertex (i, j) = j·(n+1) + i
const v = (i: number, j: number) => `v:${j * (n + 1) + i}`;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'orthodrome-metric-'));
  const g = flatGrid(n, n, 2, 2);
  for (let k = 0; k < g.positions.length; k += 3) {
    g.positions[k] -= 1;
    g.positions[k + 1] += 0.5;
  }
  writeFileSync(join(dir, 'hp.obj'), objText(g));
  writeFileSync(join(dir, 'g.json'), JSON.stringify({ tensor: [[2, 0.7, 0], [0.7, 1, 0], [0, 0, 4]] }));
  // lengths: twice the Euclidean length of every edge, except one diagonal made far too long (breaks its two triangles)
  const rows = ['a,b,length'];
  const seen = new Set<string>();
  for (let k = 0; k < g.triangles.length; k += 3) {
    for (let c = 0; c < 3; c++) {
      const a = g.triangles[k + c]!, b = g.triangles[k + ((c + 1) % 3)]!;
      const key = a < b ? `${a},${b}` : `${b},${a}`;
      if (seen.has(key)) continue;
      seen.add(key);
      const d = Math.hypot(g.positions[3 * a]! - g.positions[3 * b]!, g.positions[3 * a + 1]! - g.positions[3 * b + 1]!);
      rows.push(`${key},${key === '40,50' ? 10 : 2 * d}`);
    }
  }
  writeFileSync(join(dir, 'len.csv'), rows.join('\n') + '\n');
});

describe('--metric', () => {
  it('distance: conformal:1/y gives ln(y₂/y₁) on a vertical; JSON and the CSV file name the metric', () => {
    const out = join(dir, 'd.csv');
    const r = runCli(['distance', join(dir, 'hp.obj'), '--from', v(4, 0), '--to', v(4, n), '--metric', 'conformal:1/y', '--json', '-o', out]);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.metric).toBe('conformal:1/y');
    expect(j.metricReport.triangleInequalityViolations).toBe(0);
    expect(Object.keys(j.metricReport)).toEqual([
      'metric', 'kind', 'edges', 'toleranceAsked', 'toleranceReached', 'edgesAboveTolerance', 'evaluations', 'largestSpeedRatio', 'roughEdgeShare',
      'triangleInequalityViolations', 'mollifyEpsilon', 'mollifyDelta', 'largestRelativeChange', 'meanEdgeLength',
      'repair', 'edgesShortened', 'largestShortening', 'meanEdgeLengthBeforeRepair',
    ]); // the documented keys (README), no per-edge arrays
    expect(j.metricReport.toleranceReached).toBeLessThan(1e-10);
    expect(Math.abs(j.targets[0].distance - Math.log(5))).toBeLessThan(1e-9);
    expect(readFileSync(out, 'utf8').split('\n')[0]).toBe('# metric: conformal:1/y');
    expect(r.stderr).toBe(''); // a smooth metric, the exact method: no caution
    expect(j.metricCautions).toEqual([]);
  });
  it('path: a constant tensor from a JSON file gives √(Δᵀ G Δ); the GeoJSON says which metric', () => {
    const out = join(dir, 'p.geojson');
    const r = runCli(['path', join(dir, 'hp.obj'), '--from', v(0, 0), '--to', v(n, 5), '--metric', `tensor:${join(dir, 'g.json')}`, '--json', '-o', out]);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    const d = [2, (2 * 5) / n];
    expect(Math.abs(j.length - Math.sqrt(2 * d[0]! ** 2 + 2 * 0.7 * d[0]! * d[1]! + d[1]! ** 2))).toBeLessThan(1e-9);
    expect(j.metric).toBe(`tensor:${join(dir, 'g.json')}`);
    expect(JSON.parse(readFileSync(out, 'utf8')).properties.metric).toBe(j.metric);
  });
  it('inspect: a lengths file is used as given (edges ×2 → area ×4), its broken triangles counted and repaired', () => {
    const r = runCli(['inspect', join(dir, 'hp.obj'), '--metric', `lengths:${join(dir, 'len.csv')}`, '--metric-repair', 'mollify', '--json']); // ε 14.8× the mean edge: auto would refuse
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.metricReport.triangleInequalityViolations).toBe(2); // the two triangles on edge 40–50
    expect(j.metricReport.mollifyEpsilon).toBeGreaterThan(0);
    // the plane is 2 × 2; doubled lengths give 4× the area, less the two broken triangles, plus the repair's share (loose bound)
    expect(j.area).toBeGreaterThan(4 * 4 * 0.9);
    expect(j.metric).toBe(`lengths:${join(dir, 'len.csv')}`);
    // the repair changed an edge by far more than 1%: results are not those of the lengths given (src/metric/user/roughness.ts)
    // ε ≈ 9 against a mean edge of about 0.6: the caution says distances are mostly a count of edges
    expect(r.stderr).toMatch(/^orthodrome: caution: the repair of the metric lengths:.* changed edge lengths by up to [\d.]+% \(it added [\d.]+ to every edge, [\d.]+× the mean edge length: distances are mostly a count of the edges crossed\): results are those of the repaired lengths, not of the metric; smooth the metric or refine the mesh \(lengths that break the inequality at every scale, such as walking times on steep ground, do not improve: --metric-repair shorten\)\n$/);
  });
  it('--method heat under a metric too rough for the mesh (a cost of 1 or 8 at random per vertex) says so on stderr, one line per caution, and still answers (exit 0)', () => {
    const m = 12, r0 = rng(7), V: string[] = [], F: string[] = [];
    for (let j = 0; j <= m; j++) for (let i = 0; i <= m; i++) V.push(`${i / m} ${j / m} 0 ${r0() < 0.3 ? 8 : 1}`);
    const tris = flatGrid(m, m).triangles;
    for (let k = 0; k < tris.length; k += 3) F.push(`3 ${tris[k]} ${tris[k + 1]} ${tris[k + 2]}`);
    const ply = ['ply', 'format ascii 1.0', `element vertex ${V.length}`, 'property double x', 'property double y', 'property double z', 'property double cost',
      `element face ${F.length}`, 'property list uchar int vertex_indices', 'end_header', ...V, ...F].join('\n') + '\n';
    writeFileSync(join(dir, 'rough.ply'), ply);
    const args = ['distance', join(dir, 'rough.ply'), '--from', 'v:0', '--to', `v:${V.length - 1}`, '--metric', 'field:cost', '--metric-repair', 'mollify', '--json']; // ε 0.66× the mean edge: auto would refuse
    // without --metric-repair, auto refuses: exit 2, one line naming the mesh file and the metric
    const refused = runCli(args.filter((a, i) => a !== '--metric-repair' && args[i - 1] !== '--metric-repair'));
    expect(refused.code).toBe(2);
    expect(refused.stdout).toBe('');
    expect(refused.stderr).toMatch(new RegExp(`^orthodrome: ${join(dir, 'rough.ply').replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}: under the metric field:cost, \\d+ of 288 faces break the triangle inequality; .*--metric-repair mollify.*\\n$`));
    const heat = runCli([...args, '--method', 'heat']);
    expect(heat.code, heat.stderr).toBe(0);
    const lines = heat.stderr.trim().split('\n');
    expect(lines).toHaveLength(3); // the two metric cautions, then the heat field's own check (cli/heat-caution.ts)
    expect(lines[2]).toMatch(/^orthodrome: caution: the heat method's distance field fails its check .*--method exact/);
    expect(lines[0]).toMatch(/^orthodrome: caution: the repair of the metric field:cost changed edge lengths by up to/);
    expect(lines[1]).toMatch(/^orthodrome: caution: the metric field:cost changes by more than 1\.5× along [\d.]+% of the edges \(up to [\d.]+×\): too rough for the heat method on this mesh .*use --method exact/);
    const hj = JSON.parse(heat.stdout);
    expect(Number.isFinite(hj.targets[0].distance)).toBe(true);
    expect(hj.metricCautions.map((c: string) => `orthodrome: caution: ${c}`)).toEqual(lines.slice(0, 2)); // the same cautions for machines
    expect(hj.heatCheck.verdict).toBe('suspect'); // and the check's figures
    expect(hj.metricReport.roughEdgeShare).toBeGreaterThan(0.2);
    const exact = runCli([...args, '--method', 'exact']);
    expect(exact.code, exact.stderr).toBe(0);
    expect(exact.stderr.trim().split('\n')).toEqual([lines[0]]); // the repair concerns every method; the heat caution only heat
    expect(JSON.parse(exact.stdout).metricCautions).toHaveLength(1);
    const smooth = runCli(['distance', join(dir, 'hp.obj'), '--from', v(4, 0), '--to', v(4, n), '--metric', 'conformal:1/y', '--method', 'heat']);
    expect(smooth.code, smooth.stderr).toBe(0);
    expect(smooth.stderr).toMatch(/^orthodrome: caution: the heat method's accuracy figures are for the lengths of the mesh; under the varying metric conformal:1\/y .*check with --method exact\n$/);
  });
  it('refusals are one line, exit 2: a bad expression (column marked), a metric that is not positive definite, straight', () => {
    const bad = runCli(['curvature', join(dir, 'hp.obj'), '--metric', 'conformal:1/yy']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toBe("orthodrome: --metric conformal: unknown name 'yy' (variables and constants: x, y, z, pi, e) at column 3: 1/‸yy\n");
    const npd = runCli(['curvature', join(dir, 'hp.obj'), '--metric', 'conformal:y-1']);
    expect(npd.code).toBe(2);
    expect(npd.stderr).toMatch(/^orthodrome: .*hp\.obj: the metric conformal:y-1 is not positive definite at \([-\d., ]+\) on the edge between vertices \d+ and \d+: the factor is -?[\d.e-]+\n$/);
    const st = runCli(['straight', join(dir, 'hp.obj'), '--from', v(4, 4), '--heading', '0', '--length', '0.5', '--metric', 'conformal:1/y']);
    expect(st.code).toBe(2);
    expect(st.stderr).toContain('cannot walk in the metric conformal:1/y');
    expect(st.stderr.trim().split('\n')).toHaveLength(1);
  });
});
