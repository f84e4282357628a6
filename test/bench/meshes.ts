/**
 * Benchmark meshes shared by the solver benchmarks: deterministic, sized by
 * a parameter, one terrain-like and one irregular closed surface.
 */
import { icosphere, terrain, rng, type Shape } from '../fixtures/shapes.js';

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
