/**
 * Types for npm `quadprog` (ships none): Goldfarb–Idnani dual active-set method for
 * min −dᵀb + ½ bᵀDb subject to Aᵀb ≥ b0, the first `meq` constraints as equalities. Arrays are
 * 1-based as in the Fortran original (index 0 unused); Dmat is overwritten by its factor.
 */
declare module 'quadprog' {
  export interface QpResult {
    /** b, 1-based. */
    solution?: number[];
    /** Multipliers of the constraints, 1-based. */
    Lagrangian?: number[];
    value?: number[];
    iterations?: number[];
    iact?: number[];
    /** Empty on success, else why there is no solution. */
    message: string;
  }
  export function solveQP(Dmat: number[][], dvec: number[], Amat: number[][], bvec?: number[], meq?: number, factorized?: number[]): QpResult;
}
