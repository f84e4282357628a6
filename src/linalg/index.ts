/**
 * Sparse direct solver: CSC storage, triplet assembly, fill-reducing
 * orderings, symbolic analysis and numeric Cholesky with triangular solves.
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
export type { FactorOptions } from './numeric.js';
export { lowerSolve, lowerTransposeSolve } from './solve.js';
export { supernodalLowerSolve, supernodalLowerTransposeSolve } from './solve-supernodal.js';
