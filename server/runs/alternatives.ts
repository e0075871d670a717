import { HttpError } from '../http/errors';
import { parseRosterId, rosterIds } from '../rosters/ids';
import { PinRow } from '../rosters/models';
import { scoreRoster } from '../../solver/roster';
import { describeShift, shiftFacts } from '../../shared/roster/derive';
import type { RosterAssignment } from '../../shared/roster/schema';
import { finite } from './execute';
import { runAssignment } from './run-view';

/**
 * For one seat of a finished run: who is on it and the other people who could be, each with the
 * score change if they took the seat and everything else stayed (a person already on the same
 * shift swaps seats). Method "rescored-swap": every candidate is scored by the independent scorer
 * (solver/roster/score-roster); solver/explain had no max-marginals when this was written, so
 * this is the change for that one move, not the best roster with that person in the seat.
 */
export async function seatAlternatives(workspaceId: number, runId: number, seatId: number) {
  const { run, roster: asStored, assignment } = await runAssignment(workspaceId, runId);
  const seatKey = rosterIds.seat(seatId);
  // This seat's own pin is what the coordinator is weighing, so alternatives are scored without it.
  const roster = { ...asStored, pins: asStored.pins.filter((p) => p.seat !== seatKey) };
  const seat = roster.seats.find((s) => s.id === seatKey);
  if (!seat) throw new HttpError(404, 'not_found', 'Seat not found in this roster', [{ path: 'params.seatId', message: 'not a seat of this roster' }]);
  const base = scoreRoster(roster, assignment);
  const facts = shiftFacts(roster);
  const shiftIndex = roster.shifts.findIndex((s) => s.id === seat.shift);
  const shift = roster.shifts[shiftIndex];
  const sameShiftSeats = roster.seats.filter((s) => s.shift === seat.shift).map((s) => s.id);
  const current = assignment[seatKey] ?? null;
  const name = (id: string | null) => (id === null ? null : (roster.people.find((p) => p.id === id)?.name ?? id));
  const skillName = seat.skill ? (roster.skills.find((k) => k.id === seat.skill)?.name ?? seat.skill) : null;
  const baseTotal = base.feasible ? base.total : base.softTotal;

  const candidates: Array<string | null> = [null, ...roster.people.filter((p) => seat.skill === null || p.skills.includes(seat.skill)).map((p) => p.id)];
  const alternatives = candidates
    .filter((c) => c !== current)
    .map((candidate) => {
      const next: RosterAssignment = { ...assignment, [seatKey]: candidate };
      const otherSeat = candidate === null ? undefined : sameShiftSeats.find((s) => s !== seatKey && assignment[s] === candidate);
      if (otherSeat) next[otherSeat] = current;
      const check = scoreRoster(roster, next);
      const total = check.feasible ? check.total : check.softTotal;
      const broken = check.violations.filter((v) => v.hard).slice(0, 3).map((v) => v.message);
      return {
        personId: candidate === null ? null : parseRosterId('p', candidate),
        name: name(candidate),
        swapsWithSeatId: otherSeat ? parseRosterId('st', otherSeat) : null,
        feasible: check.feasible,
        scoreChange: check.feasible ? total - baseTotal : null,
        breaks: broken,
      };
    })
    .sort((a, b) => (b.feasible ? 1 : 0) - (a.feasible ? 1 : 0) || (b.scoreChange ?? -Infinity) - (a.scoreChange ?? -Infinity));

  const feasibleDeltas = alternatives.filter((a) => a.feasible).map((a) => a.scoreChange!);
  const closest = feasibleDeltas.length ? Math.max(...feasibleDeltas) : null;
  const pin = await PinRow.findOne({ where: { workspaceId, rosterId: run.rosterId, seatId } });
  return {
    runId: run.id,
    seatId,
    shift: { id: parseRosterId('sh', shift.id), label: shift.patternLabel, startsLocal: shift.start, endsLocal: shift.end, words: describeShift(facts[shiftIndex]) },
    skill: skillName,
    current: { personId: current === null ? null : parseRosterId('p', current), name: name(current) },
    pinned: pin ? { personId: pin.personId ?? null } : null,
    score: finite(base.total),
    method: 'rescored-swap' as const,
    methodWords: 'Score change if this person took the seat and nothing else moved (a person already on this shift swaps seats), from the independent scorer — not max-marginals.',
    // How contested the seat is: the smallest loss of any other feasible choice (0 or a gain = not settled at all).
    contested:
      closest === null
        ? 'Nobody else could take this seat without breaking a hard rule.'
        : closest >= -1e-9
          ? 'Not settled: another choice scores as well or better on its own.'
          : `Closest alternative costs ${Math.abs(closest) < 10 ? Math.abs(closest).toFixed(1) : Math.round(Math.abs(closest))} points.`,
    alternatives: alternatives.map((a) => ({ ...a, scoreChange: a.scoreChange === null ? null : finite(a.scoreChange) })),
  };
}
