import { HttpError } from '../http/errors';
import { parseRosterId } from '../rosters/ids';
import { ShiftRow, SeatRow } from '../rosters/models';
import { scoreRoster, type RosterScore } from '../../solver/roster';
import { TERM_LABELS } from '../../shared/api/rosters';
import type { RunCompare } from '../../shared/api/compare';
import { describeTerm } from '../../shared/api/terms';
import type { Roster, RosterAssignment } from '../../shared/roster/schema';
import { runAssignment } from './run-view';

const round = (x: number) => Math.round(x * 1e6) / 1e6;

/**
 * Soft points per person and term: each penalty counted in full for every person it names; wishes
 * and pairings, which also score points when honoured (no penalty names those), are each
 * person's own wishes and pairings scored by scoreRoster alone, gains and losses together.
 */
function byPerson(roster: Roster, assignment: RosterAssignment, score: RosterScore): Map<string, number> {
  const out = new Map<string, number>();
  for (const v of score.violations) {
    if (v.hard || v.term === 'wishes' || v.term === 'pairings') continue;
    for (const p of v.people) out.set(`${p}|${v.term}`, (out.get(`${p}|${v.term}`) ?? 0) + v.points);
  }
  const off = rulesOff(roster);
  const people = roster.people.map((q) => ({ ...q, terms: [] }));
  for (const person of roster.people) {
    const wishes = roster.wishes.filter((w) => w.person === person.id);
    const pairings = roster.pairings.filter((x) => x.a === person.id || x.b === person.id);
    if (!wishes.length && !pairings.length) continue;
    const alone = scoreRoster({ ...roster, rules: off, people, pins: [], wishes, pairings }, assignment).terms as Record<string, number>;
    if (wishes.length) out.set(`${person.id}|wishes`, alone.wishes ?? 0);
    if (pairings.length) out.set(`${person.id}|pairings`, alone.pairings ?? 0);
  }
  return out;
}

/** The rule set with every roster-wide rule off (to score one person's part alone). */
const rulesOff = (roster: Roster) =>
  Object.fromEntries(Object.entries(roster.rules).map(([k, v]) => [k, typeof v === 'object' && v !== null && 'enabled' in v ? { ...v, enabled: false } : v])) as Roster['rules'];

type TermOutcome = RunCompare['personRuleTerms'][number]['a'];

/**
 * Every per-person term of the roster (DESIGN.md "term") in one filling: honoured or not, its
 * units and points. Each term is scored by scoreRoster alone (every roster-wide rule off, no
 * wishes or pairings, nobody else's terms, the same absences since they credit hours), so two
 * terms of one kind for one person, or a roster-wide rule of the same name, are never mixed up.
 */
function termOutcomes(roster: Roster, assignment: RosterAssignment): TermOutcome[][] {
  const off = rulesOff(roster);
  return roster.people.map((person) =>
    person.terms.map((term) => {
      const alone: Roster = { ...roster, rules: off, wishes: [], pairings: [], pins: [], people: roster.people.map((q) => ({ ...q, terms: q.id === person.id ? [term] : [] })) };
      const breaches = scoreRoster(alone, assignment).violations.filter((v) => v.term === term.kind && v.people.includes(person.id));
      const points = term.hard ? null : round(breaches.reduce((m, v) => m + v.points, 0));
      const units = term.hard ? breaches.length : term.weight > 0 ? round(-(points ?? 0) / term.weight) : 0;
      return { honoured: breaches.length === 0, units, points, breaches: breaches.map((v) => v.message) };
    }),
  );
}

/**
 * Two finished runs of a roster, both scored by scoreRoster against the roster as it stands now
 * (so a difference is the runs', not a rule changed between them): the seats that changed, the
 * people affected, the score terms that moved per rule and per person, and the concessions one
 * has and the other not.
 */
export async function compareRuns(workspaceId: number, rosterId: number, aId: number, bId: number): Promise<RunCompare> {
  const load = async (id: number, field: string) => {
    const got = await runAssignment(workspaceId, id).catch((err: unknown) => {
      if (err instanceof HttpError) throw new HttpError(err.status, err.code, err.message, [{ path: field, message: err.message }]);
      throw err;
    });
    if (got.run.rosterId !== rosterId) throw new HttpError(404, 'not_found', 'Run not found for this roster', [{ path: field, message: 'not a run of this roster' }]);
    return got;
  };
  const a = await load(aId, 'query.a');
  const b = await load(bId, 'query.b');
  const roster = b.roster;
  const sa = scoreRoster(roster, a.assignment);
  const sb = scoreRoster(roster, b.assignment);
  const name = new Map(roster.people.map((p) => [p.id, p.name]));
  const who = (p: string | null) => (p ? { id: parseRosterId('p', p), name: name.get(p) ?? p } : null);
  const changed = roster.seats.filter((s) => (a.assignment[s.id] ?? null) !== (b.assignment[s.id] ?? null));
  const seatRows = changed.length ? await SeatRow.findAll({ where: { workspaceId, id: changed.map((s) => parseRosterId('st', s.id)) } }) : [];
  const shifts = seatRows.length ? await ShiftRow.findAll({ where: { workspaceId, id: [...new Set(seatRows.map((s) => s.shiftId))] } }) : [];
  const seats = changed
    .map((s) => {
      const seat = seatRows.find((r) => r.id === parseRosterId('st', s.id))!;
      const shift = shifts.find((x) => x.id === seat.shiftId)!;
      return { seatId: seat.id, shiftId: shift.id, label: shift.label, startsLocal: shift.startsLocal, endsLocal: shift.endsLocal, a: who(a.assignment[s.id] ?? null), b: who(b.assignment[s.id] ?? null) };
    })
    .sort((x, y) => x.startsLocal.localeCompare(y.startsLocal) || x.seatId - y.seatId);
  const moved = new Map<number, { id: number; name: string; gained: number; lost: number }>();
  const touch = (p: { id: number; name: string } | null, key: 'gained' | 'lost') => {
    if (!p) return;
    const m = moved.get(p.id) ?? moved.set(p.id, { ...p, gained: 0, lost: 0 }).get(p.id)!;
    m[key] += 1;
  };
  for (const s of seats) {
    touch(s.a, 'lost');
    touch(s.b, 'gained');
  }
  const terms = Object.keys(sb.terms)
    .map((term) => {
      const av = (sa.terms as Record<string, number>)[term] ?? 0;
      const bv = (sb.terms as Record<string, number>)[term] ?? 0;
      return { term, label: TERM_LABELS[term] ?? term, a: round(av), b: round(bv), change: round(bv - av) };
    })
    .filter((t) => Math.abs(t.change) > 1e-9);
  const pa = byPerson(roster, a.assignment, sa);
  const pb = byPerson(roster, b.assignment, sb);
  const personTerms = [...new Set([...pa.keys(), ...pb.keys()])]
    .map((key) => {
      const [p, term] = key.split('|');
      return { id: parseRosterId('p', p), name: name.get(p) ?? p, term, label: TERM_LABELS[term] ?? term, change: round((pb.get(key) ?? 0) - (pa.get(key) ?? 0)) };
    })
    .filter((t) => Math.abs(t.change) > 1e-9)
    .sort((x, y) => x.change - y.change || x.name.localeCompare(y.name));
  const ta = termOutcomes(roster, a.assignment);
  const tb = termOutcomes(roster, b.assignment);
  const personRuleTerms = roster.people.flatMap((person, p) =>
    person.terms.map((term, i) => ({
      id: parseRosterId('p', person.id),
      name: person.name,
      index: i,
      kind: term.kind,
      label: TERM_LABELS[term.kind] ?? term.kind,
      words: describeTerm(term),
      hard: term.hard,
      a: ta[p][i],
      b: tb[p][i],
      change: term.hard ? null : round((tb[p][i].points ?? 0) - (ta[p][i].points ?? 0)),
    })),
  );
  const soft = (s: RosterScore) => s.violations.filter((v) => !v.hard);
  const keys = (s: RosterScore) => new Set(soft(s).map((v) => `${v.term}|${v.message}`));
  const ka = keys(sa);
  const kb = keys(sb);
  const pick = (v: RosterScore['violations'][number]) => ({ term: v.term, message: v.message, points: round(v.points) });
  return {
    a: { runId: a.run.id, score: round(sa.softTotal), feasible: sa.feasible },
    b: { runId: b.run.id, score: round(sb.softTotal), feasible: sb.feasible },
    seats,
    people: [...moved.values()].sort((x, y) => x.name.localeCompare(y.name)),
    terms,
    personTerms,
    personRuleTerms,
    concessionsAdded: soft(sb).filter((v) => !ka.has(`${v.term}|${v.message}`)).map(pick),
    concessionsRemoved: soft(sa).filter((v) => !kb.has(`${v.term}|${v.message}`)).map(pick),
  };
}
