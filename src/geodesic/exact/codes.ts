/**
 * The small integer codes of the exact solver, named in one place: what
 * state a window is in, what kind of window it is, how a vertex's distance
 * bound was reached, and what kind of candidate an evaluation found. They are
 * plain numbers (stored in typed arrays and compared in hot loops), so each
 * is a named constant rather than an enum object.
 */

/** Window state (`WindowStore.state`): stored and waiting in the queue; it may still shrink or die. */
export const WIN_QUEUED = 0;
/** Window state: propagated through its face; final, never changed again (back-tracing relies on it). */
export const WIN_PROPAGATED = 1;
/** Window state: trimmed away before it was propagated (unlinked from its edge's list). */
export const WIN_DEAD = 2;
/** A window state. */
export type WindowState = typeof WIN_QUEUED | typeof WIN_PROPAGATED | typeof WIN_DEAD;

/** Window kind (`WindowStore.flat`): lit by a point image I = (sx, sy) at distance σ. */
export const POINT_WINDOW = 0;
/** Window kind: lit by a straight front of a curve source, direction (sx, sy), offset σ (planar.ts). */
export const PLANAR_WINDOW = 1;

/** How a vertex's bound was reached (`ExactState.viaType`): no bound yet. */
export const VIA_NONE = 0;
/** Straight from a window: viaId = window id. */
export const VIA_WINDOW = 1;
/** Straight from a root inside one face: viaId = root id. */
export const VIA_ROOT = 2;
/** Along an edge from a settled vertex: viaId = that vertex. */
export const VIA_VERTEX = 3;
/** The vertex is itself a source. */
export const VIA_SOURCE = 4;
/** How a vertex's distance bound was reached; see each VIA_ constant. */
export type Via = typeof VIA_NONE | typeof VIA_WINDOW | typeof VIA_ROOT | typeof VIA_VERTEX | typeof VIA_SOURCE;

/** Evaluation kind (`Evaluation.kind`, evaluate.ts): nothing reaches the point. */
export const EVAL_NONE = 0;
/** The best candidate is a window: id = window, x = its crossing on the window's half-edge. */
export const EVAL_WINDOW = 1;
/** The best candidate is a corner vertex of the face: id = vertex. */
export const EVAL_CORNER = 2;
/** The best candidate is a point or segment source on the face: id = index into `pointRoots`. */
export const EVAL_ROOT = 3;
/** What an evaluation found; see each EVAL_ constant. */
export type EvalKind = typeof EVAL_NONE | typeof EVAL_WINDOW | typeof EVAL_CORNER | typeof EVAL_ROOT;
