/** Approximate minimum degree ordering — not available yet in this revision. */
import type { AdjacencyGraph } from './graph.js';
import { usageError } from '../errors.js';

/** Approximate minimum degree ordering (not yet implemented: throws USAGE). */
export function approximateMinimumDegree(_g: AdjacencyGraph): Int32Array {
  throw usageError("ordering 'amd' is not available yet; use 'nd' or 'natural'");
}
