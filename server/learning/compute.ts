/**
 * The learning job: from stored edits and a roster's rules to a suggestion report. Pure
 * computation on plain data (no database, no request), so it can move to a queue job unchanged.
 */
import type { Roster as RosterJson, RosterAssignment, RuleSet } from '../../shared/roster/schema';
import { TERM_LABELS } from '../../shared/api/rosters';
import { MIN_EDITS_FOR_SUGGESTION, type PastRosterEffect, type SuggestionReport, type WeightChange } from '../../shared/api/suggestion';
import { suggestionCautions } from './cautions';
import { disagreements, learnWeights, replayWithWeights, type LearnOptions, type Preference } from '../../solver/learn';

export type StoredEdit = { id: number; rosterId: number; rosterName: string; roster: RosterJson; kept: RosterAssignment; proposed: RosterAssignment };

export type ComputeOptions = {
  learn?: Partial<LearnOptions>;
  /** Time to re-solve each past roster under the suggested weights. */
  replayMs: number;
  /** Past rosters to re-solve (the newest first). */
  replayRosters: number;
};

export const DEFAULT_COMPUTE_OPTIONS: ComputeOptions = { learn: { timeLimitMs: 10_000, oracleTimeLimitMs: 150, rounds: 2 }, replayMs: 1_500, replayRosters: 3 };

export type ComputeOutcome =
  | { ok: true; weights: WeightChange[]; report: SuggestionReport }
  | { ok: false; reason: 'contradictory'; message: string; pairs: [number, number][] };

/** A rule's name for the screen: the label the rest of the product uses, else its key in words. */
export function ruleName(key: string): string {
  return (TERM_LABELS[key] ?? key.replace(/([A-Z])/g, ' $1')).toLowerCase().replace(/^./, (c) => c.toLowerCase());
}

const round = (x: number) => (x >= 10 ? Math.round(x) : x >= 1 ? Math.round(x * 2) / 2 : Math.round(x * 100) / 100);
const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

export async function computeSuggestion(rules: RuleSet, allEdits: StoredEdit[], options: ComputeOptions = DEFAULT_COMPUTE_OPTIONS, signal?: AbortSignal): Promise<ComputeOutcome> {
  const toPrefs = (list: StoredEdit[]): Preference[] => list.map((e) => ({ roster: e.roster, kept: e.kept, proposed: e.proposed }));
  let edits = allEdits;
  let prefs = toPrefs(edits);
  let result = await learnWeights(rules, prefs, options.learn, signal);
  // Edits that undo each other cannot all be agreed with: the one that undoes the most others is
  // left out first (the majority stands), the older one on a tie (the newer says what is wanted now).
  const reversed: string[] = [];
  if (result.contradictions.length > 0) {
    const words = (i: number) => `edit ${edits[i].id} on ${edits[i].rosterName}`;
    let pairs = result.contradictions.slice();
    const out = new Set<number>();
    while (pairs.length) {
      const degree = new Map<number, number>();
      for (const [a, b] of pairs) for (const x of [a, b]) degree.set(x, (degree.get(x) ?? 0) + 1);
      const worst = [...degree.entries()].sort((x, y) => y[1] - x[1] || x[0] - y[0])[0][0];
      out.add(worst);
      const undone = pairs.filter((p) => p.includes(worst)).map(([a, b]) => (a === worst ? b : a));
      reversed.push(`${words(worst)} is left out: it undoes ${undone.map(words).join(', ')}`);
      pairs = pairs.filter((p) => !p.includes(worst));
    }
    const kept = edits.filter((_, i) => !out.has(i));
    if (kept.length < MIN_EDITS_FOR_SUGGESTION) {
      return {
        ok: false,
        reason: 'contradictory',
        message: `These edits contradict each other: ${reversed.join('; ')}. No weights can agree with both of such a pair, and ${kept.length === 1 ? '1 edit is' : `${kept.length} edits are`} left; a suggestion needs at least ${MIN_EDITS_FOR_SUGGESTION}.`,
        pairs: result.contradictions.map(([x, y]) => [edits[x].id, edits[y].id]),
      };
    }
    edits = kept;
    prefs = toPrefs(edits);
    result = await learnWeights(rules, prefs, options.learn, signal);
  }
  // rounded the way a coordinator would type them; a change that rounds away is no change
  const weights: WeightChange[] = result.keys.map((key, k) => ({ key, name: ruleName(key), from: result.start[k], to: round(result.weights[k]) }));
  const changes = weights.filter((w) => w.to !== w.from);
  const suggested = result.keys.map((key) => weights.find((w) => w.key === key)!.to);
  const rosterIds = [...new Set(edits.map((e) => e.rosterId))];
  const before = disagreements(rules, result.keys, result.start, prefs);
  const after = disagreements(rules, result.keys, suggested, prefs);

  // What the suggested weights would have changed: each past roster (newest first) re-solved from what was proposed.
  const past: PastRosterEffect[] = [];
  for (const rosterId of rosterIds.slice().reverse()) {
    const mine = edits.map((e, i) => ({ e, i })).filter((x) => x.e.rosterId === rosterId);
    const last = mine[mine.length - 1].e;
    const agreeBefore = mine.filter((x) => !before.disagree.includes(x.i)).length;
    const agreeAfter = mine.filter((x) => !after.disagree.includes(x.i)).length;
    const entry: PastRosterEffect = { rosterId, rosterName: last.rosterName, edits: mine.length, agreeBefore, agreeAfter, seatsChanged: null, seats: last.roster.seats.length, moved: [], note: null };
    if (past.length < options.replayRosters && changes.length > 0) {
      const first = mine[0].e;
      const replay = await replayWithWeights(first.roster, rules, result.keys, suggested, first.proposed, { timeLimitMs: options.replayMs }, signal);
      if (replay.status === 'solved') {
        entry.seatsChanged = replay.seatsChanged.length;
        entry.moved = replay.units.filter((u) => Math.abs(u.after - u.before) > 1e-9).map((u) => ({ key: u.key, name: ruleName(u.key), before: u.before, after: u.after }));
      } else entry.note = `Could not be solved again as it was: ${replay.reasons[0] ?? 'a hard rule cannot be kept'}`;
    } else if (changes.length > 0) entry.note = 'Not solved again (only the newest rosters are).';
    past.push(entry);
  }

  const rostersWords = plural(rosterIds.length, 'roster');
  const words = changes.length
    ? `Your edits suggest: ${changes.map((c) => `${c.name} ${c.from} → ${c.to}`).join(', ')} (from ${plural(result.used.length, 'edit')} over ${rostersWords})`
    : `Your edits agree with the weights you have (from ${plural(result.used.length, 'edit')} over ${rostersWords}): nothing to change.`;
  return {
    ok: true,
    weights,
    report: {
      words,
      changes,
      unchanged: weights.filter((w) => w.to === w.from).map((w) => w.name),
      edits: result.used.length,
      rosters: rosterIds.length,
      agreeBefore: before.counted - before.disagree.length,
      agreeAfter: after.counted - after.disagree.length,
      skipped: result.skipped.length,
      contradictions: reversed,
      cautions: suggestionCautions(changes, { before: before.counted - before.disagree.length, after: after.counted - after.disagree.length, of: after.counted }),
      unexplained: result.unexplainable.map((i) => `edit ${edits[i].id} on ${edits[i].rosterName} breaks no rule less and honours no more wishes or pairings than the roster it replaced`),
      past,
      learner: { method: 'structured SVM (margin rescaling, cutting planes; solveRoster as oracle)', timeMs: result.timeMs, oracleCalls: result.oracleCalls, rounds: result.rounds, stopReason: result.stopReason },
    },
  };
}
