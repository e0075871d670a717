/**
 * The honest check of issue 18, once per seed: a coordinator with hidden weights edits up to
 * four rosters (the first 30 edits), the learner sees only the edits and the current rules, and its weights are
 * compared with the hidden ones: Kendall's τ-b over the rules the edits exercise, and disagreement
 * on 20 held-out edits of two other rosters. Seed 0 is the test's; `npx tsx
 * tests/solver/learn/across-seeds.ts` runs seeds 0–4 (other rosters and the hidden values dealt
 * out in another order) to show the spread.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { currentWeights, disagreements, learnableRules, learnWeights, makeFeaturizer, scorerTermKeys, withWeights, type LearnOptions, type LearnResult } from '../../../solver/learn';
import { countingClock, editsFrom, fixture, hiddenWeights, kendallTauB, rulesWith, syntheticEdits, type CoordinatorKind, type SyntheticEdit } from './helpers';

export type CheckResult = {
  seed: number;
  kind: CoordinatorKind;
  keys: string[];
  hidden: Record<string, number>;
  train: SyntheticEdit[];
  held: SyntheticEdit[];
  /** Rules whose count at least two training edits change: the ones ranked. */
  moved: string[];
  tau: number;
  tau0: number;
  heldCounted: number;
  heldDisagreeBefore: number;
  heldDisagreeAfter: number;
  result: LearnResult;
  ms: number;
};

/**
 * The edits of one seed's check: 30 training edits and the held-out ones, by a coordinator of the
 * given kind with the seed's hidden weights. A coordinator who edits a roster a stretch at a time
 * works on four rosters (10 edits each at most; one may reach a roster they cannot improve before
 * their tenth edit), and two others are held out; one who re-plans whole rosters edits 30 rosters
 * once each, and 20 others are held out.
 *
 * `online`: the training rosters are proposed as in the product after each adopted suggestion:
 * each roster (once 5 edits are in) is solved under the weights learned, with these options, from
 * the edits before it, instead of under the current ones. The held-out rosters stay proposed under
 * the current weights.
 */
export async function checkEdits(seed: number, kind: CoordinatorKind = 'single', online?: Partial<LearnOptions>) {
  const off = 100 * seed;
  const probe = fixture(11 + off, 6);
  const rules = probe.rules;
  const keys = learnableRules(rules, scorerTermKeys(probe));
  const hidden = hiddenWeights(keys, seed);
  const rosters = (from: number, n: number) => Array.from({ length: n }, (_, i) => [from + off + i, 6 + (i % 2)] as const);
  const whole = kind === 'resolve';
  let train: SyntheticEdit[] = [];
  if (!online) train = (await editsFrom(whole ? rosters(11, 30) : rosters(11, 4), 10, hidden, kind)).slice(0, 30);
  else {
    let proposal = rules;
    let learnedAt = 0;
    for (const [s, people] of whole ? rosters(11, 30) : rosters(11, 4)) {
      if (train.length >= 30) break;
      // a suggestion once 5 edits are in, then again after every 10 more (adopted each time)
      if (train.length >= 5 && (learnedAt === 0 || train.length - learnedAt >= 10)) {
        const r = await learnWeights(rules, train, { timeLimitMs: 100_000, clock: countingClock(), ...online });
        proposal = withWeights(rules, r.keys, r.weights);
        learnedAt = train.length;
      }
      const roster = fixture(s, people);
      train.push(...(await syntheticEdits(roster, rulesWith(roster.rules, hidden as never), 10, s, 1000, countingClock(), kind, withWeights(roster.rules, keys, currentWeights(proposal, keys)))));
    }
    train = train.slice(0, 30);
  }
  const held = await editsFrom(whole ? rosters(61, 20) : rosters(21, 2), 10, hidden, kind);
  return { rules, keys, hidden, train, held };
}

export type CheckEdits = Awaited<ReturnType<typeof checkEdits>>;

/** checkEdits, kept in a file under the directory EDITS_DIR when it is set (the edits are seeded: the same each time). */
export async function storedCheckEdits(seed: number, kind: CoordinatorKind): Promise<CheckEdits> {
  const file = process.env.EDITS_DIR ? join(process.env.EDITS_DIR, `edits-${kind}-${seed}.json`) : null;
  if (file && existsSync(file)) return JSON.parse(readFileSync(file, 'utf8')) as CheckEdits;
  const made = await checkEdits(seed, kind);
  if (file) writeFileSync(file, JSON.stringify(made));
  return made;
}

/** `edits`: checkEdits(seed, kind) made earlier (to try several learners on the same edits). */
export async function runCheck(seed: number, learn: Partial<LearnOptions> = {}, kind: CoordinatorKind = 'single', edits?: CheckEdits): Promise<CheckResult> {
  const { rules, keys, hidden, train, held } = edits ?? (await checkEdits(seed, kind));
  const t0 = Date.now();
  // the counting clock makes the oracle's time limits counts of work (seeded runs repeat exactly)
  const result = await learnWeights(rules, train, { timeLimitMs: 100_000, clock: countingClock(), ...learn });
  const ms = Date.now() - t0;
  // a rule whose count no edit changes says nothing of its weight
  const moved = keys.filter((_, i) => train.filter((e) => {
    const f = makeFeaturizer(e.roster, rules, keys);
    return f(e.kept).rules[i] !== f(e.proposed).rules[i];
  }).length >= 2);
  const at = (k: string) => keys.indexOf(k);
  const tau = kendallTauB(moved.map((k) => result.weights[at(k)]), moved.map((k) => hidden[k]));
  const tau0 = kendallTauB(moved.map((k) => result.start[at(k)]), moved.map((k) => hidden[k]));
  const before = disagreements(rules, keys, result.start, held);
  const after = disagreements(rules, keys, result.weights, held);
  return { seed, kind, keys, hidden, train, held, moved, tau, tau0, heldCounted: before.counted, heldDisagreeBefore: before.disagree.length, heldDisagreeAfter: after.disagree.length, result, ms };
}

export function summary(c: CheckResult): string {
  return JSON.stringify({ seed: c.seed, kind: c.kind, edits: c.train.length, moved: c.moved.length, tau: +c.tau.toFixed(3), tau0: +c.tau0.toFixed(3), heldOut: `${c.heldDisagreeBefore} → ${c.heldDisagreeAfter} of ${c.heldCounted} disagree`, ms: c.ms, oracleCalls: c.result.oracleCalls, stop: c.result.stopReason });
}
