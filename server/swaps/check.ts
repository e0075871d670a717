import { scoreRoster, type RosterScore } from '../../solver/roster';
import type { Roster as RosterJson, RosterAssignment } from '../../shared/roster/schema';
import { TERM_LABELS } from '../../shared/api/rosters';
import type { ChangeCheck } from '../../shared/api/swaps';

/** Seat (roster JSON id) → the person (roster JSON id) who holds it after the change, or null. */
export type Moves = Record<string, string | null>;

const EPS = 1e-9;
const pts = (x: number) => `${Math.abs(x) < 0.005 ? '0' : (Math.round(x * 100) / 100).toString()} point${Math.abs(Math.abs(x) - 1) < EPS ? '' : 's'}`;
const signed = (x: number) => (x > 0 ? `+${pts(x)}` : x < 0 ? `−${pts(-x)}` : pts(0));

/**
 * Scores the published roster and the same roster with `moves` applied (both by scoreRoster,
 * the independent scorer), and says what changes. A change may not add a hard-rule breach; one
 * the published roster already had (an absence approved after publishing) does not block it,
 * since the change did not cause it.
 */
export function checkChange(roster: RosterJson, assignment: RosterAssignment, moves: Moves): ChangeCheck {
  const before = scoreRoster(roster, assignment);
  const after = scoreRoster(roster, { ...assignment, ...moves });
  return describe(before, after);
}

export function describe(before: RosterScore, after: RosterScore): ChangeCheck {
  const hadHard = new Set(before.violations.filter((v) => v.hard).map((v) => v.message));
  const breaches = after.violations.filter((v) => v.hard && !hadHard.has(v.message)).map((v) => v.message);
  const termChanges = Object.keys(after.terms)
    .map((term) => ({ term, label: TERM_LABELS[term] ?? term, points: (after.terms as Record<string, number>)[term] - ((before.terms as Record<string, number>)[term] ?? 0) }))
    .filter((t) => Math.abs(t.points) > EPS)
    .map((t) => ({ ...t, points: Math.round(t.points * 1e6) / 1e6 }));
  const delta = after.softTotal - before.softTotal;
  const words: string[] = [];
  if (breaches.length) words.push(`This change would break ${breaches.length === 1 ? 'a hard rule' : `${breaches.length} hard rules`}: ${breaches.join('; ')}.`);
  words.push(
    Math.abs(delta) < EPS
      ? `The roster's score stays at ${round(before.softTotal)}.`
      : `The roster's score goes from ${round(before.softTotal)} to ${round(after.softTotal)} (${signed(delta)}).`,
  );
  for (const t of termChanges) words.push(`${t.label}: ${signed(t.points)}.`);
  const soft = (s: RosterScore) => new Set(s.violations.filter((v) => !v.hard).map((v) => v.message));
  const was = soft(before);
  const now = soft(after);
  for (const m of now) if (!was.has(m)) words.push(`New: ${m}.`);
  for (const m of was) if (!now.has(m)) words.push(`No longer: ${m}.`);
  return { ok: breaches.length === 0, breaches, scoreBefore: round(before.softTotal), scoreAfter: round(after.softTotal), termChanges, words };
}

const round = (x: number) => Math.round(x * 100) / 100;
