import { Worker } from 'node:worker_threads';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { HttpError } from '../http/errors';
import { TERM_LABELS } from '../../shared/api/rosters';
import type { Roster as RosterJson, RuleName, Term, TermKind } from '../../shared/roster/schema';
import { RULE_NAMES, TERM_KINDS } from '../../shared/roster/schema';
import { contractedTarget, fairShares, periodDays, shiftFacts } from '../../shared/roster/derive';
import { describeTerm } from '../../shared/api/terms';
import type { RunOutcome } from './execute';
import { runAssignment } from './run-view';

export interface StoredViolation {
  term: string;
  hard: boolean;
  points: number | null;
  message: string;
  people: string[];
  seats: string[];
}

/** A run's concessions: its soft violations, largest cost first (the order the screens show). */
export function concessionsOf(result: unknown): StoredViolation[] {
  const violations = ((result as { violations?: StoredViolation[] } | null)?.violations ?? []).filter((v) => !v.hard);
  return violations.slice().sort((a, b) => (a.points ?? 0) - (b.points ?? 0));
}

/**
 * The roster with one concession made impossible to give up, and what that means in words.
 * Wishes and seats are enforced exactly where the roster format can say so (an "avoid" wish on
 * a shift becomes "cannot"; a pairing kept apart becomes "never together"; a person's own term
 * becomes hard; one person's contracted hours or fair nights become hard hours or nights terms
 * for that person); the other rules (rest, weekends, coverage) can only be made hard for
 * everyone, and the words say so.
 */
export function enforce(roster: RosterJson, v: StoredViolation): { roster: RosterJson; enforced: string; exact: boolean } {
  const copy: RosterJson = structuredClone(roster);
  const seat = copy.seats.find((s) => s.id === v.seats[0]);
  if (v.term === 'wishes' && seat && v.people[0]) {
    copy.wishes.push({ person: v.people[0], shift: seat.shift, kind: 'cannot', strength: 0 });
    const who = copy.people.find((p) => p.id === v.people[0])?.name ?? 'this person';
    return { roster: copy, enforced: `${who}'s wish made a "cannot" for that shift`, exact: true };
  }
  if (v.term === 'pairings' && v.people.length === 2) {
    const [a, b] = v.people;
    const pairing = copy.pairings.find((p) => (p.a === a && p.b === b) || (p.a === b && p.b === a));
    if (pairing) {
      pairing.never = true;
      const name = (id: string) => copy.people.find((p) => p.id === id)?.name ?? id;
      return { roster: copy, enforced: `${name(a)} and ${name(b)} never on the same shift`, exact: false };
    }
  }
  const person = v.people.length === 1 ? copy.people.find((p) => p.id === v.people[0]) : undefined;
  if (person && (TERM_KINDS as readonly string[]).includes(v.term)) {
    // the person's own term of that kind, made hard: exactly this concession
    const mine = person.terms.filter((t) => t.kind === (v.term as TermKind));
    if (mine.length) {
      for (const t of mine) t.hard = true;
      return { roster: copy, enforced: `${person.name}'s term "${describeTerm(mine[0])}" made hard`, exact: true };
    }
  }
  if (person && v.term === 'contractedHours') {
    // for this person only: hours (with credited absence) held inside contracted hours ± tolerance
    const target = contractedTarget(person, periodDays(copy));
    if (target !== undefined) {
      const tol = copy.rules.contractedHours.toleranceHours;
      const round = (h: number) => Math.round(h * 100) / 100;
      const bounds: Term[] = [
        { kind: 'minHours', hours: round(Math.max(0, target - tol)), hard: true, weight: 0 },
        { kind: 'maxHours', hours: round(target + tol), hard: true, weight: 0 },
      ];
      person.terms.push(...bounds);
      return { roster: copy, enforced: `${person.name} held to ${bounds[0].kind === 'minHours' ? bounds[0].hours : 0}–${round(target + tol)} h over the period (contracted hours ± ${tol} h)`, exact: true };
    }
  }
  if (person && v.term === 'fairNights') {
    const facts = shiftFacts(copy);
    const p = copy.people.indexOf(person);
    const share = fairShares(copy, facts, (f) => f.night).get(p);
    if (share !== undefined) {
      person.terms.push({ kind: 'maxNights', count: share, hard: true, weight: 0 });
      return { roster: copy, enforced: `${person.name} held to their fair share of ${share} nights`, exact: true };
    }
  }
  if ((RULE_NAMES as readonly string[]).includes(v.term)) {
    const rule = v.term as RuleName;
    (copy.rules[rule] as { hard: boolean; enabled: boolean }).hard = true;
    (copy.rules[rule] as { hard: boolean; enabled: boolean }).enabled = true;
    return { roster: copy, enforced: `the rule "${TERM_LABELS[rule] ?? rule}" made hard for everyone (this rule has no per-person form)`, exact: false };
  }
  throw new HttpError(422, 'unprocessable', `Rotaloom cannot enforce a concession of kind "${v.term}"`);
}

type ThreadResult = { type: 'done'; outcome: RunOutcome } | { type: 'failed'; reasons: string[] } | { type: 'error'; message: string };

/** One solve in a worker thread (the same entry the run worker uses), stopped at the time limit plus a grace period. */
export function solveInThread(roster: RosterJson, params: { timeLimitSeconds: number; seed: number }): Promise<ThreadResult> {
  return new Promise((resolve) => {
    const thread = new Worker(path.join(path.dirname(fileURLToPath(import.meta.url)), 'solve-thread-entry.mjs'), { workerData: { roster, params } });
    let settled = false;
    const settle = (value: ThreadResult) => {
      if (settled) return;
      settled = true;
      clearTimeout(hardStop);
      void thread.terminate();
      resolve(value);
    };
    // The solver honours its own time limit (counted once it starts); this only catches a thread that
    // never answers. Starting a thread loads the solver, which takes seconds on a busy machine.
    const hardStop = setTimeout(() => settle({ type: 'error', message: 'the re-solve did not finish in time' }), params.timeLimitSeconds * 1000 + 90_000);
    thread.on('message', (msg: { type: string }) => {
      if (msg.type !== 'progress') settle(msg as ThreadResult);
    });
    thread.on('error', (err) => settle({ type: 'error', message: err.message }));
    thread.on('exit', (code) => settle({ type: 'error', message: `the solver thread exited (${code})` }));
  });
}

const pts = (x: number) => `${Math.abs(x) < 10 ? x.toFixed(1) : Math.round(x)}`;

/**
 * "What would it cost to honour this": re-solve the roster as it stands with the concession
 * enforced (method "resolve-enforced"; solver/explain had no price-of-honouring function when
 * this was written) and compare with the run's score. Both are heuristic scores within their own
 * gaps, so a re-solve can come out equal or better; the words then say so rather than claim a gain.
 */
export async function priceConcession(workspaceId: number, runId: number, index: number, params: { timeLimitSeconds: number; seed: number }) {
  const { run, roster } = await runAssignment(workspaceId, runId);
  const concessions = concessionsOf(run.result);
  if (index >= concessions.length) {
    throw new HttpError(404, 'not_found', concessions.length === 0 ? 'This run gave up no soft constraints' : `This run has ${concessions.length} concessions, numbered 0 to ${concessions.length - 1}`, [
      { path: 'body.index', message: 'no such concession' },
    ]);
  }
  const concession = concessions[index];
  const { roster: enforcedRoster, enforced, exact } = enforce(roster, concession);
  const started = Date.now();
  const result = await solveInThread(enforcedRoster, params);
  const baseScore = run.score ?? null;
  const base = { index, term: concession.term, message: concession.message, points: concession.points };
  if (result.type === 'error') throw new HttpError(500, 'internal', `The re-solve stopped with an error: ${result.message}`);
  if (result.type === 'failed') {
    return {
      concession: base,
      method: 'resolve-enforced' as const,
      enforced,
      exact,
      feasible: false,
      baseScore,
      score: null,
      bound: null,
      price: null,
      changedSeats: 0,
      timeMs: Date.now() - started,
      words: `Honouring this looks impossible with ${enforced}: ${result.reasons.join(' ')}`,
    };
  }
  const o = result.outcome;
  const price = baseScore === null ? null : baseScore - o.score;
  const original = (await runAssignment(workspaceId, runId)).assignment;
  const changedSeats = Object.keys(o.assignment).filter((s) => (original[s] ?? null) !== (o.assignment[s] ?? null)).length;
  const words =
    price === null
      ? `With ${enforced}, the best roster found scores ${pts(o.score)} points.`
      : price > 1e-6
        ? `Honouring this costs about ${pts(price)} points: with ${enforced}, the best roster found in ${params.timeLimitSeconds} s scores ${pts(o.score)} instead of ${pts(baseScore!)}, and ${changedSeats} seat${changedSeats === 1 ? '' : 's'} change.`
        : `Honouring this costs nothing that the re-solve could find: with ${enforced}, it found a roster scoring ${pts(o.score)} (the run's scored ${pts(baseScore!)}); ${changedSeats} seat${changedSeats === 1 ? '' : 's'} change.`;
  return {
    concession: base,
    method: 'resolve-enforced' as const,
    enforced,
    exact,
    feasible: true,
    baseScore,
    score: o.score,
    bound: Number.isFinite(o.bound) ? o.bound : null,
    price,
    changedSeats,
    timeMs: Date.now() - started,
    words,
  };
}
