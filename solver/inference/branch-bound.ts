/**
 * Depth-first branch and bound on the model reparametrized by an MPLP state.
 * With b_i the beliefs and r_c(x_c) = θ_c(x_c) - Σ_i δ_{c→i}(x_i) ≤ opConst[c],
 *   score(x) = const + Σ_i b_i(x_i) + Σ_c r_c(x_c),
 * so a partial assignment is bounded by
 *   const + Σ_{assigned} b_i(x_i) + Σ_{free} max b_i + Σ_{complete c} r_c(x_c) + Σ_{other c} opConst[c].
 * Exact when it finishes; precondition: every operator updated at least once.
 */
import type { Engine } from './engine';
import type { MessageState } from './message-state';
import { NEG } from './factor-operators';

export interface BranchBoundResult {
  x: Int32Array | null;
  best: number;
  /** True when the search space was exhausted (the best found is optimal). */
  complete: boolean;
  nodes: number;
}

export function branchAndBound(engine: Engine, state: MessageState, incumbent: Int32Array | null, incumbentScore: number, deadline: number, signal?: AbortSignal, tol = 1e-7, clock: () => number = Date.now): BranchBoundResult {
  const n = engine.n;
  const maxB = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let m = NEG;
    for (const v of state.belief[i]!) if (v > m) m = v;
    maxB[i] = m;
  }
  // value order per variable: beliefs descending
  const valueOrder = state.belief.map((b) => Array.from(b.keys()).sort((p, q) => b[q]! - b[p]!));
  // variable order: most constrained (most operators) first, then smallest belief margin
  const margin = state.belief.map((b) => {
    const s = Array.from(b).sort((p, q) => q - p);
    return s.length > 1 ? s[0]! - s[1]! : Infinity;
  });
  const varOrder = Array.from({ length: n }, (_, i) => i).sort((a, b) => engine.adjOp[b]!.length - engine.adjOp[a]!.length || margin[a]! - margin[b]!);
  const assignedCount = new Int32Array(engine.ops.length);
  const x = new Int32Array(n).fill(-1);
  let best = incumbentScore, bestX = incumbent ? Int32Array.from(incumbent) : null;
  let nodes = 0, aborted = false;
  let freeMax = 0;
  for (let i = 0; i < n; i++) freeMax += maxB[i]!;
  let opSum = 0;
  for (let c = 0; c < engine.ops.length; c++) opSum += state.opConst[c]!;

  const reparamTerm = (c: number): number => {
    const op = engine.ops[c]!, m = state.msg[c]!;
    let r = op.score(x);
    for (let s = 0; s < op.vars.length; s++) {
      const v = x[op.vars[s]!]!;
      if (!op.sup) r -= m[op.off[s]! + v]!;
      else for (let k = op.off[s]!; k < op.off[s + 1]!; k++) if (op.sup[k] === v) r -= m[k]!;
    }
    return r;
  };

  const rec = (depth: number, partial: number, free: number, ops: number): void => {
    if (aborted) return;
    if ((++nodes & 1023) === 0 && (clock() > deadline || signal?.aborted)) {
      aborted = true;
      return;
    }
    if (depth === n) {
      const s = engine.constant + partial + ops;
      if (s > best + tol || bestX === null) {
        best = s;
        bestX = Int32Array.from(x);
      }
      return;
    }
    const i = varOrder[depth]!;
    for (const v of valueOrder[i]!) {
      const bi = state.belief[i]![v]!;
      x[i] = v;
      let opsNew = ops;
      for (const c of engine.adjOp[i]!) {
        if (++assignedCount[c] === engine.ops[c]!.vars.length) opsNew += reparamTerm(c) - state.opConst[c]!;
      }
      const ub = engine.constant + partial + bi + (free - maxB[i]!) + opsNew;
      if (ub > best + tol || bestX === null) rec(depth + 1, partial + bi, free - maxB[i]!, opsNew);
      for (const c of engine.adjOp[i]!) assignedCount[c]!--;
      x[i] = -1;
      if (aborted) return;
    }
  };
  rec(0, 0, freeMax, opSum);
  return { x: bestX, best, complete: !aborted, nodes };
}
