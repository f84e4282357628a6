/**
 * `inspect` lists the boundary loops (src/report/inspect.ts) and prints
 * coordinates exactly (cli/commands/inspect.ts).
 *
 * Outside facts: a regular n-gon inscribed in radius r has perimeter
 * 2nr·sin(π/n) (elementary; the holed plates sample each circle at n equal
 * steps, test/fixtures/holed-plates.ts); the Möbius strip has one boundary
 * circle (standard topology); ECMA-262 Number::toString is the shortest
 * round-trip decimal, so a printed coordinate parses back to the same double.
 */
import { describe, expect, it } from 'vitest';
import { meshFromTriangles } from '../../src/io/mesh-data.js';
import { surfaceFromMeshData } from '../../src/mesh/surface.js';
import { inspectSurface, LISTED_LOOPS } from '../../src/report/inspect.js';
import { formatInspect } from '../../cli/commands/inspect.js';
import { twoHolePlate } from '../fixtures/holed-plates.js';

const inspect = (positions: Float64Array, triangles: ArrayLike<number>) => inspectSurface(surfaceFromMeshData(meshFromTriangles(positions, triangles, 'plate.obj')));

describe('inspect: boundary loops', () => {
  const R = 1, h = 0.1;
  const plate = twoHolePlate(R, h);
  const r = inspect(plate.positions, plate.triangles);

  it('one entry per loop, ids in order, lengths the polygon perimeters 2nr·sin(π/n)', () => {
    expect(r.boundaryLoops).toBe(3);
    expect(r.boundaryLoopList.map((l) => l.id)).toEqual([0, 1, 2]);
    const n = [63, 13, 13]; // round(2π·r/h) samples per circle (the fixture's rule), r = 1, 0.2, 0.2
    expect(r.boundaryLoopList.map((l) => l.vertices)).toEqual(n);
    const rad = [R, 0.2 * R, 0.2 * R];
    r.boundaryLoopList.forEach((l, i) => expect(Math.abs(l.length - 2 * n[i]! * rad[i]! * Math.sin(Math.PI / n[i]!))).toBeLessThan(1e-13 * n[i]!));
  });

  it('vertex lists are file vertices in order along the loop: consecutive ones share a boundary edge of the file', () => {
    const T = plate.triangles, P = plate.positions;
    const edgeUse = new Map<string, number>();
    for (let f = 0; f < T.length / 3; f++) {
      for (let k = 0; k < 3; k++) {
        const a = T[3 * f + k]!, b = T[3 * f + ((k + 1) % 3)]!;
        const key = a < b ? `${a},${b}` : `${b},${a}`;
        edgeUse.set(key, (edgeUse.get(key) ?? 0) + 1);
      }
    }
    for (const l of r.boundaryLoopList) {
      expect(l.vertexList.length).toBe(l.vertices);
      expect(new Set(l.vertexList).size).toBe(l.vertices);
      for (let i = 0; i < l.vertexList.length; i++) {
        const a = l.vertexList[i]!, b = l.vertexList[(i + 1) % l.vertexList.length]!;
        expect(edgeUse.get(a < b ? `${a},${b}` : `${b},${a}`)).toBe(1); // an edge of one face: boundary
      }
      const v = l.point.vertex;
      expect(l.vertexList).toContain(v);
      expect(v).toBe(Math.min(...l.vertexList));
      expect(l.vertexList[0]).toBe(v); // the list starts at the point
      expect(l.point.position).toEqual([P[3 * v], P[3 * v + 1], P[3 * v + 2]]);
      for (let d = 0; d < 3; d++) {
        const xs = l.vertexList.map((u) => P[3 * u + d]!);
        expect(l.boundingBox.min[d]).toBe(Math.min(...xs));
        expect(l.boundingBox.max[d]).toBe(Math.max(...xs));
      }
    }
  });

  it('the count and the list agree on a Möbius strip (one rim, through all 2n vertices)', () => {
    const n = 24, P = new Float64Array(6 * n), T: number[] = [];
    for (let i = 0; i < n; i++) {
      const u = (2 * Math.PI * i) / n;
      for (let j = 0; j < 2; j++) {
        const w = j - 0.5, rr = 3 + w * Math.cos(u / 2);
        P.set([rr * Math.cos(u), rr * Math.sin(u), w * Math.sin(u / 2)], 3 * (2 * i + j));
      }
    }
    for (let i = 0; i < n; i++) {
      const a = 2 * i, b = 2 * i + 1, c = i < n - 1 ? 2 * i + 2 : 1, d = i < n - 1 ? 2 * i + 3 : 0;
      T.push(a, c, b, b, c, d);
    }
    const m = inspect(P, T);
    expect(m.orientable).toBe(false);
    expect(m.boundaryLoops).toBe(1);
    expect(m.boundaryLoopList.length).toBe(1);
    expect([...m.boundaryLoopList[0]!.vertexList].sort((a, b) => a - b)).toEqual(Array.from({ length: 2 * n }, (_, i) => i));
  });

  it(`a soup of separate triangles: every loop counted, the first ${LISTED_LOOPS} listed, the text shows 20 and says how many more`, () => {
    const k = LISTED_LOOPS + 5, P = new Float64Array(9 * k), T = new Uint32Array(3 * k);
    for (let f = 0; f < k; f++) {
      const s = 1 + f / k; // sizes all different: the longest is the last
      P.set([3 * f, 0, 0, 3 * f + s, 0, 0, 3 * f, s, 0], 9 * f);
      T.set([3 * f, 3 * f + 1, 3 * f + 2], 3 * f);
    }
    const m = inspect(P, T);
    expect(m.boundaryLoops).toBe(k);
    expect(m.boundaryLoopList.length).toBe(LISTED_LOOPS);
    expect(m.boundaryLoopList[0]!.vertexList).toEqual([3 * (k - 1), 3 * (k - 1) + 1, 3 * (k - 1) + 2]);
    const text = formatInspect(m);
    expect(text.split('\n').filter((l) => /^ {2}loop:\d+:/.test(l)).length).toBe(20);
    expect(text).toContain(`… ${k - 20} more boundary loop(s) (--json lists ${LISTED_LOOPS}, with their vertices)`);
  });

  it('the text prints coordinates exactly (a northing of 5413398.123456789 keeps its digits), other figures rounded', () => {
    const E = 612345.678901234, N = 5413398.123456789;
    const P = plate.positions.slice();
    for (let i = 0; i < P.length; i += 3) { P[i] = P[i]! + E; P[i + 1] = P[i + 1]! + N; }
    const m = inspect(P, plate.triangles);
    const text = formatInspect(m);
    const v0 = m.boundaryLoopList[0]!.point.vertex; // vertex 0: the rim sample at angle 0, (E + 1, N)
    expect(v0).toBe(0);
    expect(P[1]).toBe(N);
    expect(text).toContain(`through v:0 at (${P[0]}, ${N}, 0)`);
    expect(text).toContain('5413398.123456789');
    expect(text).not.toContain('5413400');
    const box = /bounding box \[([^\]]*)\] – \[([^\]]*)\]/.exec(text)!;
    expect(box[1]!.split(', ').map(Number)).toEqual(m.boundingBox.min);
    expect(box[2]!.split(', ').map(Number)).toEqual(m.boundingBox.max);
    expect(text).toMatch(/length 6\.28\d* units/); // lengths keep their readable rounding
  });
});
