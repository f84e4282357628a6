/**
 * Benchmark meshes: deterministic (seeded with meshes/rng.ts), sized by a
 * parameter. Two older ones (a jittered terrain grid, a bumpy sphere) and the
 * kinds of mesh users bring (issue 9), each named by {@link USER_MESHES}:
 *
 * - `smooth`: a heightfield over 1 km² from a sum of Gaussian hills, on a
 *   regular grid with alternating diagonals.
 * - `fractal`: a heightfield of multi-scale noise, a fractal sum of octaves of
 *   value noise (fractional Brownian motion: each octave doubles the frequency
 *   and halves the amplitude; Mandelbrot & Van Ness, SIAM Rev. 10(4), 1968;
 *   noise lattice interpolated with the quintic fade of Perlin, "Improving
 *   Noise", SIGGRAPH 2002), down to about two cells.
 * - `scan`: an irregular scan-like triangulation: one uniformly random point
 *   per grid cell (jittered sampling), the Delaunay triangulation of those
 *   points (Bowyer–Watson, from test/fixtures/holed-plates.ts), heights from
 *   smooth hills, gentle noise and ±1 cm sensor noise. Close point pairs give
 *   short edges and the hull gives slivers, as in real scans.
 * - `cad`: a CAD-style part: a stepped shaft with fillets, a groove and a
 *   chamfer, revolved with m segments; straight walls and annular shoulders
 *   are one segment tall (long thin triangles, aspect up to several hundred)
 *   and both end caps are fans about a vertex on the axis (valence m).
 *
 * Every generator takes a target face count and returns a mesh within a few
 * percent of it; heights and lengths are in metres (terrains) or millimetres
 * (the part).
 */
import { icosphere, terrain, rng, type Shape } from '../fixtures/shapes.js';
import { delaunay } from '../fixtures/holed-plates.js';

/**
 * Rolling hills over 1 km² on an n × n grid of cells (2n² faces) whose
 * interior vertices are jittered by up to ±0.3 cell — a stress case with many
 * obtuse and some folded triangles, which exercises intrinsic flips.
 */
export function jitteredTerrain(n: number, seed: number): Shape {
  const s = terrain(n, n, 1000, 1000, (x, y) => 40 * Math.sin(x / 90) * Math.cos(y / 130) + 15 * Math.sin((x + y) / 37));
  const r = rng(seed), cell = 1000 / n;
  for (let i = 0; i < s.positions.length; i += 3) {
    const x = s.positions[i]!, y = s.positions[i + 1]!;
    if (x > 0 && x < 1000 && y > 0 && y < 1000) {
      s.positions[i] = x + 0.6 * cell * (r() - 0.5);
      s.positions[i + 1] = y + 0.6 * cell * (r() - 0.5);
    }
  }
  return s;
}

/** Icosphere of radius 100 with long-wave bumps and vertex noise. */
export function bumpySphere(level: number, seed: number): Shape {
  const s = icosphere(level, 100);
  const r = rng(seed);
  for (let i = 0; i < s.positions.length; i += 3) {
    const k = 1 + 0.002 * (r() - 0.5) + 0.05 * Math.sin((3 * s.positions[i]!) / 100) * Math.cos((2 * s.positions[i + 2]!) / 100);
    for (let d = 0; d < 3; d++) s.positions[i + d]! *= k;
  }
  return s;
}

/** Cells per side of a square grid with about `faces` triangles (two per cell). */
const gridSide = (faces: number): number => Math.max(2, Math.round(Math.sqrt(faces / 2)));

/** Height of `count` seeded Gaussian hills over [0, 1000]² (widths 80–280 m, heights −30…70 m). */
function hills(seed: number, count = 9): (x: number, y: number) => number {
  const r = rng(seed);
  const h = Array.from({ length: count }, () => ({ x: 1000 * r(), y: 1000 * r(), w: 80 + 200 * r(), a: 100 * r() - 30 }));
  return (x, y) => {
    let z = 0;
    for (const k of h) z += k.a * Math.exp(-((x - k.x) ** 2 + (y - k.y) ** 2) / (2 * k.w * k.w));
    return z;
  };
}

/**
 * Fractal sum of `octaves` octaves of value noise: Σ_k gain^k · noise(2^k · x / wavelength),
 * noise in [−1, 1] on an integer lattice with seeded values, interpolated with Perlin's quintic
 * fade 6t⁵ − 15t⁴ + 10t³ (C² across cells). Octave k has its own lattice (seed + k).
 */
export function fractalNoise(seed: number, octaves: number, wavelength: number, gain = 0.5): (x: number, y: number) => number {
  const hash = (i: number, j: number, k: number): number => {
    let a = Math.imul(i, 0x27d4eb2d) ^ Math.imul(j, 0x165667b1) ^ Math.imul(k + seed, 0x61c88647);
    a = Math.imul(a ^ (a >>> 15), 0x2c1b3c6d);
    a = Math.imul(a ^ (a >>> 12), 0x297a2d39);
    return ((a ^ (a >>> 15)) >>> 0) / 2147483648 - 1;
  };
  const fade = (t: number): number => t * t * t * (t * (6 * t - 15) + 10);
  return (x, y) => {
    let z = 0, amp = 1, f = 1 / wavelength;
    for (let k = 0; k < octaves; k++, amp *= gain, f *= 2) {
      const u = x * f, v = y * f, i = Math.floor(u), j = Math.floor(v), s = fade(u - i), t = fade(v - j);
      const a = hash(i, j, k), b = hash(i + 1, j, k), c = hash(i, j + 1, k), d = hash(i + 1, j + 1, k);
      z += amp * ((a + (b - a) * s) * (1 - t) + (c + (d - c) * s) * t);
    }
    return z;
  };
}

/** Smooth heightfield over 1 km²: Gaussian hills on a grid with alternating diagonals, about `faces` triangles. */
export function smoothHeightfield(faces: number, seed: number): Shape {
  const n = gridSide(faces);
  return terrain(n, n, 1000, 1000, hills(seed));
}

/**
 * Heightfield of multi-scale noise over 1 km²: a fractal sum of octaves from a 500 m wavelength
 * (±60 m) down to about two cells, on a grid with alternating diagonals, about `faces` triangles.
 */
export function fractalHeightfield(faces: number, seed: number): Shape {
  const n = gridSide(faces);
  const octaves = Math.max(1, Math.ceil(Math.log2(500 / (2 * (1000 / n)))));
  const noise = fractalNoise(seed, octaves, 500);
  return terrain(n, n, 1000, 1000, (x, y) => 60 * noise(x, y));
}

/**
 * Scan-like irregular terrain over 1 km²: one random point per cell of a k × k grid (k² points,
 * about 2k² triangles), Delaunay-triangulated; heights from hills, 3 m of fractal noise and
 * ±1 cm sensor noise.
 */
export function scanTerrain(faces: number, seed: number): Shape {
  const k = Math.max(3, Math.round(Math.sqrt(faces / 2)));
  const r = rng(seed), cell = 1000 / k;
  const xs: number[] = [], ys: number[] = [];
  for (let j = 0; j < k; j++) for (let i = 0; i < k; i++) { xs.push((i + r()) * cell); ys.push((j + r()) * cell); }
  const tris = delaunay(xs, ys);
  const height = hills(seed + 1), noise = fractalNoise(seed + 2, 6, 200);
  const positions = new Float64Array(3 * xs.length);
  for (let v = 0; v < xs.length; v++) {
    const x = xs[v]!, y = ys[v]!;
    positions.set([x, y, height(x, y) + 3 * noise(x, y) + 0.02 * (r() - 0.5)], 3 * v);
  }
  return { positions, triangles: Uint32Array.from(tris) };
}

/**
 * Profile of the revolved part, (radius, z) in mm from the bottom axis point to the top one:
 * a Ø80 flange 20 mm tall with 3 mm fillets, a shoulder, a Ø50 shaft 90 mm long with a groove
 * (seeded position) and a 2 mm chamfer to the top face.
 */
export function partProfile(seed: number): [number, number][] {
  const r = rng(seed);
  const p: [number, number][] = [[0, 0]];
  const fillet = (cr: number, cz: number, rad: number, a0: number, a1: number, n = 6) => {
    for (let i = 0; i <= n; i++) { const a = a0 + ((a1 - a0) * i) / n; p.push([cr + rad * Math.cos(a), cz + rad * Math.sin(a)]); }
  };
  fillet(37, 3, 3, -Math.PI / 2, 0); // bottom outer edge of the flange
  fillet(37, 17, 3, 0, Math.PI / 2); // top outer edge
  fillet(28, 23, 3, -Math.PI / 2, -Math.PI); // shoulder into the shaft (concave)
  const g = 50 + 40 * r(); // groove: 4 mm wide, 2 mm deep
  p.push([25, g], [23, g], [23, g + 4], [25, g + 4]);
  p.push([25, 108], [23, 110], [0, 110]);
  return p;
}

/**
 * CAD-style part (see the module comment), about `faces` triangles: the profile of
 * {@link partProfile} revolved with m segments; ring vertices at every profile point off the axis,
 * one vertex at each axis end (the fan centres). Closed, genus 0, CCW from outside.
 */
export function cadPart(faces: number, seed: number): Shape {
  const prof = partProfile(seed);
  const rings = prof.length - 2; // profile points off the axis
  const m = Math.max(8, Math.round(faces / (2 * (rings - 1) + 2)));
  const positions = new Float64Array(3 * (rings * m + 2));
  const bottom = rings * m, top = bottom + 1;
  for (let i = 0; i < rings; i++) {
    const [rad, z] = prof[i + 1]!;
    for (let j = 0; j < m; j++) {
      const a = (2 * Math.PI * j) / m;
      positions.set([rad * Math.cos(a), rad * Math.sin(a), z], 3 * (i * m + j));
    }
  }
  positions.set([0, 0, prof[prof.length - 1]![1]], 3 * top);
  const tris: number[] = [];
  const at = (i: number, j: number): number => i * m + (j % m);
  for (let j = 0; j < m; j++) tris.push(bottom, at(0, j + 1), at(0, j)); // bottom fan, seen from −z
  for (let i = 0; i + 1 < rings; i++) {
    for (let j = 0; j < m; j++) tris.push(at(i, j), at(i, j + 1), at(i + 1, j + 1), at(i, j), at(i + 1, j + 1), at(i + 1, j));
  }
  for (let j = 0; j < m; j++) tris.push(top, at(rings - 1, j), at(rings - 1, j + 1)); // top fan, seen from +z
  return { positions, triangles: Uint32Array.from(tris) };
}

/** The user-like generators by name, each `(faces, seed) → Shape`. */
export const USER_MESHES: Record<'smooth' | 'fractal' | 'scan' | 'cad', (faces: number, seed: number) => Shape> = {
  smooth: smoothHeightfield,
  fractal: fractalHeightfield,
  scan: scanTerrain,
  cad: cadPart,
};
