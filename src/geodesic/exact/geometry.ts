/**
 * What the exact solver needs of a mesh before any source is known: each
 * half-edge's length and its face laid out along it, the corner angles,
 * which vertices are pseudo-sources, which are sharp enough for a window to
 * wind round them (winding.ts), and the window-queue bucket width.
 * Computing it is linear in the mesh and, on a two-point query, costs more
 * than the query itself (measured: ~170 ms of ~200 ms on a 1M-face
 * terrain), so a prepared solver or a run of several legs computes it once
 * and passes it to every run ({@link ExactOptions.geometry}).
 *
 * Read-only once made: runs copy the pseudo-source flags (a source vertex
 * is marked in the run's copy only).
 */
import type { IntrinsicMesh } from '../../metric/intrinsic.js';
import { cornerAngles } from '../../metric/triangle.js';
import { layoutAlong } from '../../metric/layout.js';
import { saddleFlags } from './pseudo-sources.js';
import { sharpFlags } from './winding.js';

/** Window-queue bucket width as a fraction of the mean edge length (narrower: closer to key order, more empty buckets to skip). */
const BUCKET = 0.25;

/** Source-independent data of the exact solver for one mesh (see the module comment). */
export interface ExactGeometry {
  /** The mesh it was made for; runs on another mesh refuse it. */
  readonly mesh: IntrinsicMesh;
  /** Length of each half-edge. */
  readonly hl: Float64Array;
  /** Third corner (cx, cy) of the face of each half-edge laid out along it (see layout.ts). */
  readonly hc: Float64Array;
  /** Corner angle at the tail of each half-edge. */
  readonly angle: Float64Array;
  /** 1 for saddle and reflex boundary vertices (pseudo-sources.ts). */
  readonly saddle: Uint8Array;
  /** Number of such vertices. */
  readonly saddles: number;
  /** 1 for interior vertices so sharp that a window can wind round them (winding.ts). */
  readonly sharp: Uint8Array;
  /** Width of a window-queue bucket, in mesh units. */
  readonly bucketWidth: number;
}

/** Computes the {@link ExactGeometry} of a mesh (linear time). */
export function prepareExactGeometry(mesh: IntrinsicMesh): ExactGeometry {
  const t = mesh.topology;
  const nh = 3 * t.nf;
  const hl = new Float64Array(nh), hc = new Float64Array(2 * nh);
  let sum = 0;
  for (let h = 0; h < nh; h++) sum += hl[h] = layoutAlong(mesh, h, hc, 2 * h);
  const angle = cornerAngles(mesh);
  const saddle = new Uint8Array(t.nv);
  const saddles = saddleFlags(t, angle, saddle);
  const sharp = new Uint8Array(t.nv);
  sharpFlags(t, angle, sharp);
  return { mesh, hl, hc, angle, saddle, saddles, sharp, bucketWidth: nh ? (BUCKET * sum) / nh : 1 };
}
