/**
 * Edits the learner cannot use, said as such: an edit that changes nothing, two edits that undo
 * each other, and an edit no non-negative weights can explain. Whether an edit is explainable is
 * decided here from scoreRoster's terms with every learned rule at weight 1 (the closed form: if
 * the kept roster breaks no rule less and gains no wish or pairing points, w·d + e ≤ 0 for every
 * w ≥ 0), not from the learner's own features.
 */
import { describe, expect, test } from 'vitest';
import type { Roster, RosterAssignment } from '../../../shared/roster/schema';
import { learnableRules, learnWeights, scorerTermKeys } from '../../../solver/learn';
import { makeRosterScorer } from '../../../solver/roster/score-roster';
import { fixture, hiddenWeights, rulesWith, syntheticEdits } from './helpers';

describe('learnWeights on edits it cannot use', () => {
  test('skips an unchanged edit, pairs edits that undo each other, and names the unexplainable one', async () => {
    const roster = fixture(11, 6);
    const keys = learnableRules(roster.rules, scorerTermKeys(roster));
    const edits = await syntheticEdits(roster, rulesWith(roster.rules, hiddenWeights(keys) as never), 10, 11);
    const unit = { ...roster, rules: rulesWith(roster.rules, Object.fromEntries(keys.map((k) => [k, 1])) as never) } as Roster;
    const score = makeRosterScorer(unit);
    const terms = (a: RosterAssignment) => score(a).terms as Record<string, number>;
    // an edit whose reverse breaks some rule more and none less, wishes and pairings no better
    const oneWay = edits.find((e) => {
      const k = terms(e.kept);
      const p = terms(e.proposed);
      const d = keys.map((r) => k[r] - p[r]);
      const gain = (k.wishes ?? 0) + (k.pairings ?? 0) - (p.wishes ?? 0) - (p.pairings ?? 0);
      return d.every((x) => x >= 0) && d.some((x) => x > 0) && gain >= 0;
    });
    expect(oneWay).toBeDefined();
    const e = oneWay!;
    const prefs = [
      { roster, kept: e.proposed, proposed: e.proposed }, // 0: changes nothing
      { roster, kept: e.kept, proposed: e.proposed }, // 1
      { roster, kept: e.proposed, proposed: e.kept }, // 2: undoes 1, and no w ≥ 0 prefers it
    ];
    const r = await learnWeights(roster.rules, prefs, { rounds: 0 });
    expect(r.skipped).toEqual([{ index: 0, reason: 'the kept roster is the proposed one' }]);
    expect(r.used).toEqual([1, 2]);
    expect(r.contradictions).toEqual([[1, 2]]);
    expect(r.unexplainable).toEqual([2]);
    for (const w of r.weights) expect(w).toBeGreaterThanOrEqual(0);
  }, 60_000);
});
