/**
 * Seeding a run from a source set: every source point becomes a root (a
 * vertex source is a pseudo-source at distance 0; a point on an edge or in a
 * face lights the edges of its faces), and every segment of a curve source
 * becomes a segment root whose planar fronts light the edges of its face(s)
 * (planar.ts). Corners of the faces holding a source get the straight
 * in-face distance as their first bound.
 *
 * Every point is first put in its canonical spelling (surface-point.ts): a
 * face point seeded as-is on a corner would light only the edge opposite
 * that corner (the adjacent edges hold it), and on an edge only its own
 * face, leaving the rest of the fan to edge-graph relaxation.
 */
import type { SurfacePoint } from '../../mesh/surface-point.js';
import { canonicalSurfacePoint } from '../../mesh/surface-point.js';
import { usageError } from '../../errors.js';
import type { SourceSet } from '../shared/sources.js';
import { pointSegmentDistance } from '../../metric/layout.js';
import { baryInFace, commonFaces, facesOfPoint } from '../../metric/face-points.js';
import type { ExactState } from './state.js';
import { addRoot, relaxVertex } from './state.js';
import { VIA_ROOT, VIA_SOURCE } from './codes.js';
import { emitFromPoint } from './propagate.js';
import { emitFromSegment } from './planar.js';
import { pointInFrame } from './evaluate.js';

/** Coordinates of a surface point in each of `faces`, three per face. */
function barys(s: ExactState, faces: number[], p: SurfacePoint): number[] {
  const b = [0, 0, 0], out: number[] = [];
  for (const f of faces) {
    baryInFace(s.t, f, p, b);
    out.push(...b);
  }
  return out;
}

/** Seeds the state; returns the list of source points that roots refer to (`PointRoot.source`). */
export function seedSources(s: ExactState, sources: SourceSet): SurfacePoint[] {
  const t = s.t;
  const PA = [0, 0], PB = [0, 0];
  const all: SurfacePoint[] = [];
  // one spelling per point (a face point on a corner is that vertex, on an edge that edge point):
  // a vertex source must be a pseudo-source lighting its whole fan, an edge point both its faces
  const seedPoint = (p0: SurfacePoint) => {
    const p = canonicalSurfacePoint(p0, t);
    all.push(p);
    if (p.kind === 'vertex') {
      s.pseudo[p.vertex] = 1;
      relaxVertex(s, p.vertex, 0, VIA_SOURCE, -1);
      return;
    }
    const root = addRoot(s, -1, 0);
    const faces = facesOfPoint(t, p);
    const bs = barys(s, faces, p);
    s.pointRoots.push({ root, source: all.length - 1, faces, bary: bs });
    faces.forEach((f, j) => {
      const b = bs.slice(3 * j, 3 * j + 3);
      emitFromPoint(s, f, b, 0, root);
      for (let k = 0; k < 3; k++) {
        pointInFrame(s, f, k, b, PA); // corner k is the origin of the frame of 3f+k
        relaxVertex(s, t.tri[3 * f + k]!, Math.hypot(PA[0]!, PA[1]!), VIA_ROOT, root);
      }
    });
  };
  sources.points.forEach(seedPoint);
  sources.curves.forEach((curve, ci) => {
    curve.forEach(seedPoint);
    const cs = curve.map((p) => canonicalSurfacePoint(p, t));
    for (let i = 1; i < cs.length; i++) {
      const a = cs[i - 1]!, b = cs[i]!;
      const faces = commonFaces(t, a, b);
      if (faces.length === 0) throw usageError(`points ${i - 1} and ${i} share no face`, `curve ${ci}`);
      const ba = barys(s, faces, a), bb = barys(s, faces, b);
      const root = addRoot(s, -1, 0);
      s.pointRoots.push({ root, source: -1, faces, bary: ba, bary2: bb });
      faces.forEach((f, j) => {
        const pa = ba.slice(3 * j, 3 * j + 3), pb = bb.slice(3 * j, 3 * j + 3);
        emitFromSegment(s, f, pa, pb, root);
        for (let k = 0; k < 3; k++) {
          pointInFrame(s, f, k, pa, PA);
          pointInFrame(s, f, k, pb, PB);
          relaxVertex(s, t.tri[3 * f + k]!, pointSegmentDistance(0, 0, PA[0]!, PA[1]!, PB[0]!, PB[1]!), VIA_ROOT, root);
        }
      });
    }
  });
  return all;
}

/**
 * The point of root r nearest to `from` (which lies on one of the root's
 * faces): the source point itself, or the foot on a curve segment, as a
 * face point.
 */
export function rootPoint(s: ExactState, all: SurfacePoint[], r: number, from: SurfacePoint): SurfacePoint {
  const pr = s.pointRoots.find((q) => q.root === r)!;
  const PA = [0, 0], PB = [0, 0];
  if (!pr.bary2) return all[pr.source]!;
  const b = [0, 0, 0];
  let j = pr.faces.findIndex((f) => baryInFace(s.t, f, from, b));
  if (j < 0) j = 0;
  const f = pr.faces[j]!;
  const pa = pr.bary.slice(3 * j, 3 * j + 3), pb = pr.bary2.slice(3 * j, 3 * j + 3);
  const X = [0, 0];
  pointInFrame(s, f, 0, pa, PA);
  pointInFrame(s, f, 0, pb, PB);
  pointInFrame(s, f, 0, b, X);
  const dx = PB[0]! - PA[0]!, dy = PB[1]! - PA[1]!, ll = dx * dx + dy * dy;
  let u = ll > 0 ? ((X[0]! - PA[0]!) * dx + (X[1]! - PA[1]!) * dy) / ll : 0;
  u = u < 0 ? 0 : u > 1 ? 1 : u;
  return { kind: 'face', face: f, bary: [0, 1, 2].map((k) => (1 - u) * pa[k]! + u * pb[k]!) as [number, number, number] };
}
