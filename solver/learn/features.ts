/**
 * Features of a filled roster for weight learning: scoreRoster's terms in "violation units".
 *
 * The learned weights are the soft, enabled rules of a rule set, found at run time from the rule
 * set itself and from the keys of scoreRoster's `terms` (the rule catalogue grows; nothing here
 * lists rules). A rule's feature is its term's points per unit of weight: the roster is scored
 * with that rule at weight 1, so φ_k = −(violation units) and a roster's score is w·φ + c, where c
 * is the part the learner takes as given: wishes (per kind) and pairings (together / apart), whose
 * points are the strengths people entered, per person, not roster-wide rules. Scoring at weight 1
 * rather than dividing by the current weight also measures a rule whose weight is now 0.
 */
import type { Roster, RosterAssignment } from '../../shared/roster/schema';
import { makeRosterScorer, type RosterScore } from '../roster/score-roster';

/** The parts of the score the learner keeps at weight 1 (reported beside the rules). */
export const FIXED_FEATURES = ['wishes:prefer', 'wishes:avoid', 'pairings:together', 'pairings:apart'] as const;
export type FixedFeature = (typeof FIXED_FEATURES)[number];

export type RuleLike = { enabled: boolean; hard: boolean; weight: number };
export type RuleSetLike = Record<string, unknown>;

function ruleLike(v: unknown): v is RuleLike {
  if (typeof v !== 'object' || v === null) return false;
  const r = v as Record<string, unknown>;
  return typeof r.enabled === 'boolean' && typeof r.hard === 'boolean' && typeof r.weight === 'number';
}

/**
 * The weights to learn for a rule set: each soft, enabled rule that scoreRoster reports as a term.
 * `termKeys` are the keys of any RosterScore's terms (scoreRoster fills every term, zero or not).
 */
export function learnableRules(rules: RuleSetLike, termKeys: readonly string[]): string[] {
  const terms = new Set(termKeys);
  return Object.keys(rules).filter((k) => terms.has(k) && ruleLike(rules[k]) && rules[k].enabled && !rules[k].hard);
}

/** The current weights w0 of the learnable rules. */
export function currentWeights(rules: RuleSetLike, keys: readonly string[]): number[] {
  return keys.map((k) => (rules[k] as RuleLike).weight);
}

/** A rule set with the learnable rules at the given weights (and every other setting as in `rules`). */
export function withWeights<R extends RuleSetLike>(rules: R, keys: readonly string[], w: readonly number[]): R {
  const out: RuleSetLike = { ...rules };
  keys.forEach((k, i) => {
    out[k] = { ...(rules[k] as object), enabled: true, hard: false, weight: w[i] };
  });
  return out as R;
}

export type Features = {
  /** φ over the learned rules: the term's points at weight 1 (≤ 0). */
  rules: number[];
  /** Wishes and pairings, split by kind. */
  fixed: Record<FixedFeature, number>;
  /** Sum of the fixed parts: c in w·φ + c. */
  offset: number;
  /** Whether the roster keeps every hard rule (the features ignore hard violations). */
  feasible: boolean;
};

/** Splits a score's wish and pairing terms by kind: the penalties are in the violations, the gains are the rest. */
function fixedParts(s: RosterScore): Record<FixedFeature, number> {
  let avoid = 0;
  let apart = 0;
  for (const v of s.violations) {
    if (v.hard) continue;
    if (v.term === 'wishes') avoid += v.points;
    else if (v.term === 'pairings') apart += v.points;
  }
  const terms = s.terms as Record<string, number>;
  return { 'wishes:prefer': (terms.wishes ?? 0) - avoid, 'wishes:avoid': avoid, 'pairings:together': (terms.pairings ?? 0) - apart, 'pairings:apart': apart };
}

/**
 * A featuriser for many fillings of one roster, under the learnable rules of `rules` (the rule
 * set being tuned; its other settings, such as hours limits, are the ones the features measure).
 */
export function makeFeaturizer(roster: Roster, rules: RuleSetLike, keys: readonly string[]): (assignment: RosterAssignment) => Features {
  const unit = { ...roster, rules: withWeights(rules, keys, keys.map(() => 1)) } as Roster;
  const score = makeRosterScorer(unit);
  return (assignment) => {
    const s = score(assignment);
    const terms = s.terms as Record<string, number>;
    const fixed = fixedParts(s);
    return { rules: keys.map((k) => terms[k] ?? 0), fixed, offset: FIXED_FEATURES.reduce((m, f) => m + fixed[f], 0), feasible: s.feasible };
  };
}

/** Term keys of the scorer, read from a score of the empty roster (so new rules appear without edits here). */
export function scorerTermKeys(roster: Roster): string[] {
  return Object.keys(makeRosterScorer(roster)({}).terms);
}
