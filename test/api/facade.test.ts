/**
 * The public facade (src/index.ts): a surface from bytes, distances by each
 * method with their own figures, shortest paths, points from their text
 * form (snapping loaded only for `p:` points) and result files, checked on
 * shapes with closed forms.
 */
import { describe, expect, it } from 'vitest';
import {
  boundarySources, encodeRoute, encodeVertexColumns, measureDistances, openSurface, pointLocator, prepareDistances, shortestPath,
  type Surface,
} from '../../src/index.js';
import { flatGrid, icosphere, objText } from '../fixtures/shapes.js';

const bytes = (text: string) => new TextEncoder().encode(text);
/** A 4 × 3 rectangle, 8 × 6 cells, jittered inside: flat, convex. */
const rect = (): Surface => openSurface(bytes(objText(flatGrid(8, 6, 4, 3, 0.15, 5))), 'rect.obj');
const dist = (s: Surface, a: number, b: number) => Math.hypot(...[0, 1, 2].map((d) => s.positions[3 * a + d]! - s.positions[3 * b + d]!));

describe('facade', () => {
  it('opens OBJ bytes; exact distances on a flat convex domain are Euclidean (closed form), and the result carries its figures', () => {
    const s = rect();
    expect(s.topology.nv).toBe(9 * 7);
    const r = measureDistances(s, { points: [{ kind: 'vertex', vertex: 0 }], curves: [] }, { method: 'exact' });
    const scale = 5; // the diagonal: tolerances scaled to the mesh
    for (let v = 0; v < s.topology.nv; v++) expect(Math.abs(r.field.distance[v]! - dist(s, 0, v))).toBeLessThan(1e-9 * scale);
    expect(r.method).toBe('exact');
    expect(r.complete).toBe(true);
    expect(r.solveMs).toBeGreaterThanOrEqual(0);
    expect(typeof r.details.windows).toBe('number');
    // the far corner through `at`: |(4, 3)| = 5 (closed form)
    expect(Math.abs(r.at({ kind: 'vertex', vertex: s.topology.nv - 1 }) - 5)).toBeLessThan(1e-9 * scale);
  });

  it('a prepared heat solver answers two source sets, each result with its own figures (no state read back)', () => {
    const s = openSurface(bytes(objText(icosphere(2, 1))), 'ball.obj');
    const solver = prepareDistances(s, 'heat');
    const a = solver.solve({ points: [{ kind: 'vertex', vertex: 0 }], curves: [] });
    const b = solver.solve({ points: [{ kind: 'vertex', vertex: 5 }], curves: [] });
    expect(a.details.flatFaces).toBe(0);
    expect(b.details.flatFaces).toBe(0);
    expect(a.field.distance[0]).toBe(0);
    expect(b.field.distance[5]).toBe(0);
    // the first result is not changed by the second solve
    expect(a.field.distance[5]).toBeGreaterThan(0);
    // the antipode of a vertex of the unit icosphere is a vertex at great-circle distance π (closed form); the heat
    // method approximates it (Crane, Weischedel & Wardetzky 2013): 10% is a loose bound on this coarse sphere (from memory)
    const far = a.field.distance.reduce((m, x) => Math.max(m, x), 0);
    expect(Math.abs(far - Math.PI) / Math.PI).toBeLessThan(0.1);
  });

  it('the shortest path on a flat domain is the straight segment (closed form), with its polyline and files', () => {
    const s = rect();
    const last = s.topology.nv - 1;
    const route = shortestPath(s, [{ kind: 'vertex', vertex: 0 }, { kind: 'vertex', vertex: last }]);
    expect(Math.abs(route.length - dist(s, 0, last))).toBeLessThan(1e-9 * 5);
    expect(Array.from(route.polyline.slice(0, 3))).toEqual(Array.from(s.positions.slice(0, 3)));
    const obj = new TextDecoder().decode(encodeRoute(route, 'obj') as Uint8Array);
    expect(obj).toMatch(/^l /m); // an OBJ polyline element (Wavefront OBJ: `l v1 v2 …`)
    const csv = encodeRoute(route, 'csv') as string;
    expect(csv.split('\n')[0]).toBe('x,y,z,length,face');
  });

  it('writes per-vertex columns mapped to the file vertices (csv rows = file vertices)', () => {
    const s = rect();
    const values = new Float64Array(s.topology.nv).map((_, v) => v / 2);
    const csv = encodeVertexColumns(s, [{ name: 'half', unit: 'mesh units', values }], 'csv') as string;
    const rows = csv.trim().split('\n');
    expect(rows[0]).toBe('vertex,x,y,z,half');
    expect(rows).toHaveLength(s.topology.nv + 1);
    expect(Number(rows[3]!.split(',')[4])).toBe(1); // vertex 2: 2 / 2
  });

  it('boundary sources: one loop on a rectangle, none on a closed sphere (common practice: a disc has one boundary, a sphere none)', () => {
    expect(boundarySources(rect())).toHaveLength(1);
    expect(boundarySources(openSurface(bytes(objText(icosphere(1))), 'ball.obj'))).toHaveLength(0);
  });

  it('point locator: snapping is made only when a p: spec is to be resolved', async () => {
    const s = rect();
    const plain = await pointLocator(s, ['v:0', 'e:3:0.5']);
    expect(plain.resolve('v:3')).toEqual({ kind: 'vertex', vertex: 3 });
    expect(() => plain.resolve('p:1,1,0')).toThrow(/needs snapping/);
    const snapping = await pointLocator(s, ['v:0', 'p:1,1,0']);
    const p = snapping.resolve('p:1,1,0.5', '--to'); // 0.5 above the plane z = 0: lands 0.5 away (closed form)
    expect(['vertex', 'edge', 'face']).toContain(p.kind);
    expect(Math.abs(snapping.landings[0]!.distance - 0.5)).toBeLessThan(1e-9);
    expect(() => snapping.resolve('v:999', '--to')).toThrow(/--to/);
  });
});
