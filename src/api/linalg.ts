/**
 * `orthodrome/linalg`: the sparse Cholesky behind the heat method: triplet
 * and CSC storage, orderings (AMD, nested dissection), symbolic analysis,
 * numeric factorization and triangular solves.
 *
 * @packageDocumentation
 */
export * from '../linalg/index.js';
