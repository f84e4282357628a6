/**
 * Sparse direct solver: CSC storage, triplet assembly, fill-reducing
 * orderings (nested dissection by default, approximate minimum degree,
 * natural), symbolic analysis kept apart from the numeric factorization
 * (supernodal multifrontal by default, simplicial up-looking on request),
 * and allocation-free triangular solves.
 *
 * ```ts
 * const T = new TripletMatrix(n);            // lower triangle only: i >= j
 * T.add(i, j, v);                            // repeats are summed
 * const A = T.toCsc();
 * const sym = analyzeCholesky(A);            // once per pattern
 * const f = CholeskyFactor.factor(A, sym);   // throws NUMERIC if not SPD
 * f.solve(b, x);                             // x = A⁻¹ b, no allocation
 * f.refactor(A2);                            // same pattern, new values
 * const [fa, fb] = CholeskyFactor.factorPair(A, B, sym);  // B shares A's blocks where they agree
 * CholeskyFactor.factorMany([A, B, C], sym, { executor }); // some on other threads (Node: parallel-node.ts)
 * ```
 */
export type { CscMatrix } from './csc.js';
export { spmv, symmetricSpmvLower, lowerTriangle, transpose, symmetricFromLower, checkCsc, nnz } from './csc.js';
export { TripletMatrix } from './triplet.js';
export type { AdjacencyGraph } from './graph.js';
export { adjacencyFromLower } from './graph.js';
export { nestedDissection } from './ordering-nd.js';
export type { NestedDissectionOptions } from './ordering-nd.js';
export { approximateMinimumDegree } from './ordering-amd.js';
export { eliminationTree, postorder } from './etree.js';
export { columnCounts } from './colcounts.js';
export type { Ordering, CholeskySymbolic, AnalyzeOptions, CholeskyMethod } from './symbolic.js';
export type { SupernodalStructure } from './supernodes.js';
export { analyzeCholesky, DEFAULT_ORDERING } from './symbolic.js';
export { CholeskyFactor } from './numeric.js';
export type { FactorOptions, FactorManyOptions } from './numeric.js';
export type { FactorExecutor, FactorJob, FactorJobResult } from './executor.js';
export type { OrderingExecutor, NdBatch, NdJob } from './ordering-executor.js';
export { parallelNestedDissection } from './ordering-executor.js';
export { lowerSolve, lowerTransposeSolve } from './solve.js';
export { supernodalLowerSolve, supernodalLowerTransposeSolve } from './solve-supernodal.js';
