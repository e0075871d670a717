/** Exact scoring of assignments. */
import { factorScore, isHardFactor, scopeOf } from './factor-graph';
import type { Assignment, Model } from './types';

/** Exact score (points) of a full assignment; -Infinity if any hard factor forbids it. */
export function score(model: Model, x: Assignment): number {
  let s = model.constant ?? 0;
  for (const f of model.factors) {
    s += factorScore(model, f, x);
    if (s === -Infinity) return s;
  }
  return s;
}

/** One factor's part in a score. */
export interface FactorContribution {
  factor: number;
  id?: string;
  label?: string;
  kind: string;
  hard: boolean;
  vars: number[];
  score: number;
}

/** Each factor's contribution to the score of x, in model order. */
export function factorContributions(model: Model, x: Assignment): FactorContribution[] {
  return model.factors.map((f, i) => ({
    factor: i,
    id: f.id,
    label: f.label,
    kind: f.kind,
    hard: isHardFactor(f),
    vars: scopeOf(f),
    score: factorScore(model, f, x),
  }));
}

/** Factors that forbid x (score -Infinity). Empty means x is feasible. */
export function violatedFactors(model: Model, x: Assignment): number[] {
  const out: number[] = [];
  model.factors.forEach((f, i) => {
    if (factorScore(model, f, x) === -Infinity) out.push(i);
  });
  return out;
}
