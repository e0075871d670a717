import { createHash } from 'node:crypto';
import { HttpError } from '../http/errors';
import { parseRosterId, rosterIds } from '../rosters/ids';
import { AssignmentRow, PinRow, RunRow } from '../rosters/models';
import { describeShift, shiftFacts } from '../../shared/roster/derive';
import type { Roster } from '../../shared/roster/schema';
import type { SeatAlternativesAnswer, SeatContestAnswer } from '../../shared/api/seat-alternatives';
import { finite } from './execute';
import { computeInThread, stopAlternativesThread } from './alternatives-pool';
import { loadContest, type RunContest } from './seat-contention';
import { runAssignment } from './run-view';

/** Finished answers per run, seat and roster state (the same roster state gives the same answer). */
const answers = new Map<string, SeatAlternativesAnswer>();
const MAX_ANSWERS = 500;

function remember<T>(cache: Map<string, T>, key: string, value: T, max: number): T {
  cache.set(key, value);
  if (cache.size > max) cache.delete(cache.keys().next().value!);
  return value;
}

/** Drops the answers kept in memory and ends the thread with its models (a cold start, for measurements). */
export function forgetSeatAlternatives(): void {
  answers.clear();
  stopAlternativesThread();
}

// a no-break space keeps "17 %" on one line
const pct = (p: number) => (p >= 0.995 ? 'over 99\u00a0%' : p < 0.01 ? 'under 1\u00a0%' : `${Math.round(p * 100)}\u00a0%`);

/** "How contested" in words, from the marginals the run worker kept (server/runs/seat-contention.ts). */
function contestOf(contest: RunContest | null, seatKey: string, pinnedInRun: boolean, holderName: string | null, name: (id: string | null) => string | null): { words: string; detail: SeatContestAnswer | null; method: string | null } {
  const c = contest?.seats[seatKey];
  if (!contest || !c) return { words: 'How contested this seat is was not worked out for this run (a hand-edited save, a run from before this was added, or a roster too large to weigh in the time allowed).', detail: null, method: null };
  // Plain words lead; the method's name goes to the details line.
  const approx = contest.exact ? '' : ' (approximate)';
  const method = contest.exact
    ? 'Shares of good rosters: exact marginals (every roster counted).'
    : `Shares of good rosters: loopy sum-product${contest.converged ? `, converged after ${contest.iterations} pass${contest.iterations === 1 ? '' : 'es'}` : `, stopped after ${contest.iterations} pass${contest.iterations === 1 ? '' : 'es'} without converging`}.`;
  const detail: SeatContestAnswer = {
    holderProbability: c.h,
    holderOnShiftProbability: c.s,
    others: c.o.map(([p, q]) => ({ personId: p === null ? null : parseRosterId('p', p), name: name(p), probability: q })),
    method: contest.method,
    exact: contest.exact,
    converged: contest.converged,
  };
  if (pinnedInRun) return { words: 'Pinned when this run was solved, so the run had no choice here.', detail, method };
  const others = c.o.length ? `; otherwise ${c.o.map(([p, q]) => `${name(p) ?? 'left open'} ${pct(q)}`).join(', ')}` : '';
  let words: string;
  if (holderName === null) {
    words = `${c.h >= 0.9 ? 'Settled' : c.h >= 0.5 ? 'Leaning' : 'Contested'}: ${pct(c.h)} of good rosters leave this seat open${others}`;
  } else {
    const level = c.s >= 0.9 ? 'Settled' : c.s >= 0.5 ? 'Leaning' : 'Contested';
    const seatToo = c.s - c.h > 0.05 ? ` (${pct(c.h)} in this very seat: the shift's seats are interchangeable)` : '';
    words = `${level}: ${pct(c.s)} of good rosters put ${holderName} on this shift${seatToo}${others}`;
  }
  return { words: `${words}${approx}.`, detail, method };
}

/** Alternatives are weighed on a finished run's roster: 409 in words otherwise (checked by the API before it queues the job, and again in the worker). */
export function refuseUnfinished(run: { status: string }): void {
  if (run.status === 'done' || run.status === 'cancelled') return;
  const words = run.status === 'failed' ? 'This run failed, so it has no roster to weigh alternatives on.' : 'This run has not finished yet: alternatives are worked out on a finished run.';
  throw new HttpError(409, 'conflict', words, [{ path: 'params.id', message: `the run is ${run.status}` }]);
}

/**
 * For one seat of a finished run: who is on it, and for everyone else who may sit there (and for
 * leaving it open) the max-marginal — the best roster with that choice forced, against this run's
 * roster — plus how contested the seat is. The seat's own pin is lifted (it is what the
 * coordinator is weighing); other pins are kept, except pins set since the run that its roster
 * does not follow (they are left out and counted in `ignoredPins`). Every figure is the
 * independent scorer's (solver/roster/score-roster) score of a decoded roster.
 */
export async function seatAlternatives(workspaceId: number, runId: number, seatId: number): Promise<SeatAlternativesAnswer> {
  const started = Date.now();
  const found = await RunRow.findOne({ where: { id: runId, workspaceId }, attributes: ['id', 'status'] });
  if (!found) throw new HttpError(404, 'not_found', 'Run not found', [{ path: 'params.id', message: 'no such run in this workspace' }]);
  refuseUnfinished(found);
  const { run, roster: asStored, assignment } = await runAssignment(workspaceId, runId);
  const seatKey = rosterIds.seat(seatId);
  const seat = asStored.seats.find((s) => s.id === seatKey);
  if (!seat) throw new HttpError(404, 'not_found', 'Seat not found in this roster', [{ path: 'params.seatId', message: 'not a seat of this run’s roster' }]);
  const keep = asStored.pins.filter((p) => p.seat !== seatKey);
  const followed = keep.filter((p) => (assignment[p.seat] ?? null) === p.person);
  const roster: Roster = { ...asStored, pins: followed };
  const hash = (r: Roster) => createHash('sha1').update(JSON.stringify(r)).update(JSON.stringify(assignment)).digest('hex');
  const digest = hash(roster);
  // the answer also depends on the seat's own pin (shown, not weighed)
  const answerKey = `${workspaceId}:${runId}:${seatId}:${hash(asStored)}`;
  const cached = answers.get(answerKey);
  if (cached) return { ...cached, cached: true, timeMs: Date.now() - started };

  const computed = await computeInThread({ modelKey: `${workspaceId}:${runId}:${digest}`, roster, assignment, seatKey });
  if (computed.kind === 'encode-failed') {
    const names = computed.seats.slice(0, 3).map((s) => `seat ${parseRosterId('st', s)}`).join(', ');
    throw new HttpError(409, 'conflict', `The roster changed since this run in a way its roster no longer fits (${names}: the person there may no longer have the skill, or has a "cannot" wish). Solve again to weigh alternatives.`);
  }
  if (computed.kind === 'infeasible') {
    throw new HttpError(409, 'conflict', `With the roster as it stands now, this run's roster breaks a hard rule (${computed.firstHard}). Solve again to weigh alternatives.`);
  }
  const name = (id: string | null) => (id === null ? null : (roster.people.find((p) => p.id === id)?.name ?? id));
  const alternatives = computed.alternatives
    .map((a) => ({
      personId: a.personKey === null ? null : parseRosterId('p', a.personKey),
      name: name(a.personKey),
      evaluated: a.evaluated,
      feasible: a.feasible,
      scoreChange: a.change === null ? null : finite(a.change),
      scoreChangeAtMost: a.atMost === null ? null : finite(a.atMost),
      exact: a.exact,
      otherSeatsMoved: a.moved,
      otherSeats: a.movedTo.map(([s, p]) => ({ seatId: parseRosterId('st', s), personId: p === null ? null : parseRosterId('p', p) })),
      breaks: a.breaks,
      impossible: a.impossible,
    }))
    .sort(
      (a, b) =>
        Number(b.feasible) - Number(a.feasible) ||
        Number(b.evaluated) - Number(a.evaluated) ||
        (b.scoreChange ?? -Infinity) - (a.scoreChange ?? -Infinity) ||
        (b.scoreChangeAtMost ?? Infinity) - (a.scoreChangeAtMost ?? Infinity),
    );

  const exact = alternatives.every((a) => a.exact);
  const facts = shiftFacts(roster);
  const shiftIndex = roster.shifts.findIndex((s) => s.id === seat.shift);
  const shift = roster.shifts[shiftIndex];
  const current = assignment[seatKey] ?? null;
  const [pin, row, contest] = await Promise.all([
    PinRow.findOne({ where: { workspaceId, rosterId: run.rosterId, seatId } }),
    AssignmentRow.findOne({ where: { workspaceId, runId: run.id, seatId } }),
    loadContest(RunRow.sequelize!, workspaceId, run.id),
  ]);
  const contested = contestOf(contest, seatKey, Boolean(row?.pinned), name(current), name);
  const ignoredPins = keep.length - followed.length;
  const answer: SeatAlternativesAnswer = {
    runId: run.id,
    seatId,
    shift: { id: parseRosterId('sh', shift.id), label: shift.patternLabel, startsLocal: shift.start, endsLocal: shift.end, words: describeShift(facts[shiftIndex]) },
    skill: seat.skill ? (roster.skills.find((k) => k.id === seat.skill)?.name ?? seat.skill) : null,
    current: { personId: current === null ? null : parseRosterId('p', current), name: name(current) },
    pinned: pin ? { personId: pin.personId ?? null } : null,
    score: finite(computed.baseTotal),
    method: 'max-marginal',
    exact,
    methodWords: exact
      ? 'Each choice was tried in this seat with every possible roster around it: the change shown is the best there is. Other seats may change to make room.'
      : 'Each choice was tried in this seat with the rest of the roster re-arranged around it: the change found (a roster that exists) and the most any roster could gain. The true best lies between; a wide range means the limit is loose, not that a gain is likely.',
    methodDetail: [
      exact ? 'Changes: max-marginals, exact.' : 'Changes: max-marginals by a forced re-solve per choice; “at most” is the solver’s dual bound.',
      contested.method,
    ].filter(Boolean).join(' '),
    contested: contested.words,
    contest: contested.detail,
    ignoredPins,
    ...(ignoredPins ? { ignoredPinsWords: `${ignoredPins} pin${ignoredPins === 1 ? ' was' : 's were'} set after this run and ${ignoredPins === 1 ? 'is' : 'are'} left out here; solve again to weigh ${ignoredPins === 1 ? 'it' : 'them'}.` } : {}),
    cached: false,
    timeMs: 0,
    alternatives,
  };
  answer.timeMs = Date.now() - started;
  remember(answers, answerKey, answer, MAX_ANSWERS);
  return answer;
}
