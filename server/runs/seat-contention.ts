import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { MarginalResult } from '../../solver/inference/marginals';
import { OPEN, type CompiledRoster } from '../../solver/roster';
import type { RosterAssignment } from '../../shared/roster/schema';

/**
 * How contested each seat of a finished run is, kept compactly in the run's result.
 *
 * The numbers are sum-product marginals of the run's model under its own distribution
 * p(roster) ∝ exp(score): a point of score is a factor e in probability, so a roster 1 point
 * worse counts 1/e ≈ 0.37 times as much and one 7 points worse about 1/1100. Rosters that
 * break a hard rule have probability 0. Per seat:
 *   h: P(seat = the run's holder)
 *   s: P(the holder is on any seat of this shift) — the seats of one shift can never hold the
 *      same person (hard), so these events are disjoint and the sum is exact for exact marginals;
 *      it matters because the seats of a shift are often interchangeable, which splits `h`;
 *   o: up to three other holders of this seat with their probability (person id or null = open).
 */
export interface SeatContest {
  h: number;
  s: number;
  o: Array<[string | null, number]>;
}

export interface RunContest {
  method: MarginalResult['method'];
  exact: boolean;
  converged: boolean;
  iterations: number;
  timeMs: number;
  seats: Record<string, SeatContest>;
}

const round = (p: number) => Math.round(Math.min(1, Math.max(0, p)) * 10_000) / 10_000;

export function summariseContest(compiled: CompiledRoster, m: MarginalResult, assignment: RosterAssignment, timeMs: number): RunContest {
  const { roster, domains } = compiled;
  const who = (p: number) => (p === OPEN ? null : roster.people[p].id);
  // P(person index → probability) per seat, keyed by person id (null = open)
  const perSeat = roster.seats.map((_, s) => {
    const out = new Map<string | null, number>();
    domains[s].forEach((p, x) => out.set(who(p), (out.get(who(p)) ?? 0) + (m.marginals[s][x] ?? 0)));
    return out;
  });
  const seatsOfShift = new Map<string, number[]>();
  roster.seats.forEach((seat, s) => seatsOfShift.set(seat.shift, [...(seatsOfShift.get(seat.shift) ?? []), s]));
  const seats: Record<string, SeatContest> = {};
  roster.seats.forEach((seat, s) => {
    const holder = assignment[seat.id] ?? null;
    const h = perSeat[s].get(holder) ?? 0;
    // "open" is not a person: several seats of a shift can all be open, so its sum is not a probability.
    const onShift = holder === null ? h : seatsOfShift.get(seat.shift)!.reduce((sum, t) => sum + (perSeat[t].get(holder) ?? 0), 0);
    const others = [...perSeat[s].entries()]
      .filter(([p, q]) => p !== holder && q >= 0.0005)
      .sort((a, b) => b[1] - a[1])
      .slice(0, 3)
      .map(([p, q]): [string | null, number] => [p, round(q)]);
    seats[seat.id] = { h: round(h), s: round(onShift), o: others };
  });
  return { method: m.method, exact: m.exact, converged: m.converged, iterations: m.iterations, timeMs, seats };
}

/** Kept in its own column (migration 0006), written once with the run's result. */
export async function saveContest(sequelize: Sequelize, runId: number, contest: RunContest | null, transaction?: Transaction): Promise<void> {
  await sequelize.query('UPDATE runs SET contest = ? WHERE id = ?', { replacements: [contest === null ? null : JSON.stringify(contest), runId], transaction });
}

/** Written once with the run, so kept in memory for the next seat of the same run (up to 240 KB each for 60 × 13 weeks). */
const loaded = new Map<string, RunContest | null>();

export async function loadContest(sequelize: Sequelize, workspaceId: number, runId: number): Promise<RunContest | null> {
  const key = `${workspaceId}:${runId}`;
  if (loaded.has(key)) return loaded.get(key)!;
  const contest = await readContest(sequelize, workspaceId, runId);
  loaded.set(key, contest);
  if (loaded.size > 20) loaded.delete(loaded.keys().next().value!);
  return contest;
}

async function readContest(sequelize: Sequelize, workspaceId: number, runId: number): Promise<RunContest | null> {
  const rows = await sequelize.query<{ contest: string | RunContest | null }>('SELECT contest FROM runs WHERE id = ? AND workspace_id = ?', { replacements: [runId, workspaceId], type: QueryTypes.SELECT });
  const raw = rows[0]?.contest ?? null;
  return typeof raw === 'string' ? (JSON.parse(raw) as RunContest) : raw;
}
