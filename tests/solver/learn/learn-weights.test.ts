/**
 * The learner against a coordinator whose weights are known: edits come from hidden weights
 * (tests/solver/learn/helpers.ts, the check itself in check.ts), and the learned weights must rank
 * the rules as the hidden ones do (Kendall's τ-b, computed in helpers.ts) and agree with more
 * held-out edits than the current weights. Checked against the hidden weights themselves, never
 * against figures of the learner. Time limits run on a counting clock, so the run repeats exactly.
 * Figures over seeds 0–4 and coordinator kinds: docs/learning.md.
 */
import { describe, expect, test } from 'vitest';
import { learnableRules, learnWeights, scorerTermKeys } from '../../../solver/learn';
import { fixture } from './helpers';
import { runCheck, summary } from './check';

describe('learnWeights', () => {
  test('moves the ranking towards hidden weights from 30 single-change edits and agrees with more held-out edits', async () => {
    const c = await runCheck(0);
    console.log(summary(c));
    expect(c.train).toHaveLength(30);
    for (const e of [...c.train, ...c.held]) expect(e.gain).toBeGreaterThan(0);
    expect(c.result.keys).toEqual(learnableRules(fixture(11, 6).rules, scorerTermKeys(fixture(11, 6))));
    expect(c.moved.length).toBeGreaterThanOrEqual(8);
    // The issue asks for τ ≥ 0.8. Not met, and not across seeds: this seed reaches 0.73, but over
    // seeds 0–4 of across-seeds.ts (other rosters, the hidden values in another order) τ is 0.73,
    // 0.38, 0.16, −0.26, 0.50 (mean 0.30). So this floor guards this seed's figure against
    // regressions and claims nothing general. The 30 edits mostly say "this rule weighs at least
    // that much": weights drawn from all those that agree with every edit (information.ts; the
    // hidden weights only drop the comparisons they break or tie themselves) rank at τ 0.75, 0.58,
    // 0.09, 0.17, 0.08 on those seeds, so no learner reaches 0.8 from these edits.
    expect(c.tau).toBeGreaterThanOrEqual(0.7);
    // held-out disagreement falls on every seed of across-seeds.ts
    expect(c.heldDisagreeAfter).toBeLessThan(c.heldDisagreeBefore);
    for (const w of c.result.weights) expect(w).toBeGreaterThanOrEqual(0);
    // Over the same rivals the 1-slack problem has the n-slack's optimum (Joachims, Finley & Yu,
    // Machine Learning 2009, Theorem 1): with the proposed rosters only (no oracle) both objectives
    // must meet; without its pair steps the 1-slack dual stalls at its cap (1.955 against 1.913 here).
    const rules = fixture(11, 6).rules; // the seed-0 check's rule set (checkEdits)
    const nSlack = await learnWeights(rules, c.train, { rounds: 0 });
    const oneSlack = await learnWeights(rules, c.train, { rounds: 0, formulation: 'oneSlack' });
    expect(oneSlack.objective).toBeCloseTo(nSlack.objective, 2);
  }, 120_000);

  test('from 30 edits that each rework one day, agrees with most held-out edits and moves the ranking towards hidden weights', async () => {
    // A coordinator who redoes a day at a time: the day's seats re-planned under the hidden weights
    // (the solver, every other seat pinned), each edit kept only if scoreRoster under the hidden
    // weights scores it strictly higher.
    const c = await runCheck(0, {}, 'day');
    console.log(summary(c));
    expect(c.train).toHaveLength(30);
    for (const e of [...c.train, ...c.held]) expect(e.gain).toBeGreaterThan(0);
    expect(c.moved.length).toBeGreaterThanOrEqual(8);
    // Held-out disagreement falls to a few edits on every seed of across-seeds.ts (13→2, 8→3, 15→1,
    // 13→0, 16→0 on seeds 0–4): the one claim here that holds across seeds.
    expect(c.heldDisagreeAfter).toBeLessThan(c.heldDisagreeBefore);
    expect(c.heldDisagreeAfter).toBeLessThanOrEqual(c.heldCounted / 4);
    // τ ≥ 0.8, as the issue asks, is not met with these edits either: τ is 0.63, 0.52, 0.39, 0.00,
    // 0.34 on seeds 0–4 (mean 0.37; with a prior 100 times weaker 0.87, 0.76, 0.48, 0.25, 0.31,
    // mean 0.53, see docs/learning.md), and weights drawn from all that agree with every edit
    // (information.ts) rank at 0.75, 0.66, 0.31, 0.30, 0.22: the day edits do not carry the
    // ranking on most seeds either. This floor is this seed's figure (0.63) less a margin, a
    // guard against regressions that claims nothing general; above the current weights' τ (0.27).
    expect(c.tau).toBeGreaterThanOrEqual(0.55);
    expect(c.tau).toBeGreaterThan(c.tau0);
    for (const w of c.result.weights) expect(w).toBeGreaterThanOrEqual(0);
  }, 300_000);
});
