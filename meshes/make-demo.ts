/**
 * Makes the bundled demo meshes of the project's invented scenario:
 *
 * - `ostrel-knoll.obj` — a drone-photogrammetry scan of the Ostrel Knoll
 *   hillside (an invented place) on the survey grid of the invented Ostrel
 *   estate: easting/northing in metres near (431200, 6170400), heights in
 *   metres. A ridge, a saddle, a gully and a small crag; 2.5 m spacing with
 *   scan noise.
 * - `px7-cup.ply` — a deep-drawn cup with a flange and a pierced bottom hole,
 *   part PX-7 of the invented Velmora press shop, in millimetres, binary PLY
 *   with a per-vertex `quality` property (scanner confidence, 0..1).
 *
 * Deterministic: `npx tsx meshes/make-demo.ts` rewrites the same bytes.
 */
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { rng } from './rng.js';

const here = dirname(fileURLToPath(import.meta.url));

/** Height of the knoll above datum (m) at local coordinates (m). */
export function knollHeight(x: number, y: number): number {
  const g = (cx: number, cy: number, sx: number, sy: number, h: number) =>
    h * Math.exp(-(((x - cx) / sx) ** 2) - ((y - cy) / sy) ** 2);
  let z = 212 + 0.04 * x + 0.015 * y; // regional slope
  z += g(80, 70, 45, 30, 38); // main summit
  z += g(160, 95, 35, 28, 24); // second top; the saddle lies between
  z -= g(120, 20, 10, 60, 9); // gully cutting the south flank
  const crag = Math.max(0, 1 - Math.hypot(x - 60, y - 110) / 9); // small steep crag
  z += 7 * crag * crag;
  return z;
}

function makeKnoll(): string {
  const nx = 80, ny = 60, step = 2.5, E0 = 431200, N0 = 6170400;
  const r = rng(7);
  const lines: string[] = [
    '# Ostrel Knoll hillside, drone photogrammetry scan (invented demo data)',
    '# units: metres; x = easting, y = northing on the Ostrel estate grid, z = height',
  ];
  for (let j = 0; j <= ny; j++) {
    for (let i = 0; i <= nx; i++) {
      let x = i * step, y = j * step;
      if (i > 0 && i < nx && j > 0 && j < ny) {
        x += (r() - 0.5) * 0.6;
        y += (r() - 0.5) * 0.6;
      }
      const z = knollHeight(x, y) + (r() - 0.5) * 0.05;
      lines.push(`v ${(E0 + x).toFixed(3)} ${(N0 + y).toFixed(3)} ${z.toFixed(3)}`);
    }
  }
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const a = j * (nx + 1) + i + 1, b = a + 1, c = a + nx + 1, d = c + 1;
      if ((i + j) % 2 === 0) lines.push(`f ${a} ${b} ${d}`, `f ${a} ${d} ${c}`);
      else lines.push(`f ${a} ${b} ${c}`, `f ${b} ${d} ${c}`);
    }
  }
  return lines.join('\n') + '\n';
}

/** Profile of the cup: (radius, height) in mm as a function of arclength parameter s in [0, 1]. */
function cupProfile(): [number, number][] {
  const pts: [number, number][] = [];
  const seg = (n: number, f: (u: number) => [number, number]) => {
    for (let i = pts.length ? 1 : 0; i <= n; i++) pts.push(f(i / n));
  };
  const rHole = 6, rBottom = 18, rf = 4, rWall = 30, hWall = 26, rFlange = 46;
  seg(6, (u) => [rHole + u * (rBottom - rHole), 0]); // bottom
  seg(6, (u) => { // bottom fillet, centre (rBottom, rf)
    const a = -Math.PI / 2 + (u * Math.PI) / 2;
    return [rBottom + rf * Math.cos(a), rf + rf * Math.sin(a)];
  });
  // tapered wall from (rBottom + rf, rf) to (rWall - rf, hWall - rf)
  seg(10, (u) => [rBottom + rf + u * (rWall - rf - (rBottom + rf)), rf + u * (hWall - 2 * rf)]);
  seg(6, (u) => { // top fillet, centre (rWall, hWall - rf)
    const a = Math.PI - (u * Math.PI) / 2;
    return [rWall + rf * Math.cos(a), hWall - rf + rf * Math.sin(a)];
  });
  seg(6, (u) => [rWall + u * (rFlange - rWall), hWall]); // flange
  return pts;
}

function makeCup(): Buffer {
  const prof = cupProfile();
  const nTheta = 96;
  const r = rng(11);
  const nv = prof.length * nTheta;
  const pos = new Float64Array(3 * nv);
  const quality = new Float32Array(nv);
  for (let j = 0; j < prof.length; j++) {
    const [rad, z] = prof[j]!;
    for (let i = 0; i < nTheta; i++) {
      const th = (2 * Math.PI * (i + 0.5 * (j % 2))) / nTheta;
      const v = j * nTheta + i;
      const noise = (r() - 0.5) * 0.01;
      pos[3 * v] = (rad + noise) * Math.cos(th);
      pos[3 * v + 1] = (rad + noise) * Math.sin(th);
      pos[3 * v + 2] = z + (r() - 0.5) * 0.01;
      quality[v] = Number((0.85 + 0.15 * r()).toFixed(3));
    }
  }
  const faces: number[] = [];
  for (let j = 0; j + 1 < prof.length; j++) {
    for (let i = 0; i < nTheta; i++) {
      const a = j * nTheta + i, b = j * nTheta + ((i + 1) % nTheta);
      const c = (j + 1) * nTheta + i, d = (j + 1) * nTheta + ((i + 1) % nTheta);
      // rows are staggered by half a step on odd rings
      if (j % 2 === 0) faces.push(a, b, c, b, d, c);
      else faces.push(a, b, d, a, d, c);
    }
  }
  const nf = faces.length / 3;
  const header =
    'ply\nformat binary_little_endian 1.0\n' +
    'comment PX-7 drawn cup with flange, Velmora press shop (invented demo data); units: millimetres\n' +
    `element vertex ${nv}\nproperty double x\nproperty double y\nproperty double z\nproperty float quality\n` +
    `element face ${nf}\nproperty list uchar int vertex_indices\nend_header\n`;
  const body = Buffer.alloc(nv * 28 + nf * 13);
  let o = 0;
  for (let v = 0; v < nv; v++) {
    body.writeDoubleLE(pos[3 * v]!, o); body.writeDoubleLE(pos[3 * v + 1]!, o + 8); body.writeDoubleLE(pos[3 * v + 2]!, o + 16);
    body.writeFloatLE(quality[v]!, o + 24);
    o += 28;
  }
  for (let f = 0; f < nf; f++) {
    body.writeUInt8(3, o);
    body.writeInt32LE(faces[3 * f]!, o + 1); body.writeInt32LE(faces[3 * f + 1]!, o + 5); body.writeInt32LE(faces[3 * f + 2]!, o + 9);
    o += 13;
  }
  return Buffer.concat([Buffer.from(header, 'latin1'), body]);
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  writeFileSync(join(here, 'ostrel-knoll.obj'), makeKnoll());
  writeFileSync(join(here, 'px7-cup.ply'), makeCup());
  process.stdout.write('wrote meshes/ostrel-knoll.obj and meshes/px7-cup.ply\n');
}
