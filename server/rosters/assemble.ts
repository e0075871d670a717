import { Person, Skill } from '../db/models';
import { parseRoster, type ParseRosterResult, type Roster as RosterJson, type RosterInput } from '../../shared/roster/schema';
import { PairingRow, PinRow, SeatRow, ShiftRow, WishRow } from './models';
import { findRoster } from './repository';
import { rosterIds } from './ids';
import { absencesForRoster } from '../absences/roster';
import { termsForPeriod } from '../terms/repository';
import { ledgerTerms } from '../ledger/terms';
import { HttpError } from '../http/errors';

/**
 * Reads one roster with everything the solver needs from the database into the roster JSON
 * format (shared/roster), then validates it so problems come back with the field named.
 * Only approved pairings count; the ledger of earlier periods adds soft terms (server/ledger/terms.ts).
 */
export async function assembleRoster(workspaceId: number, rosterId: number): Promise<{ input: RosterInput; parsed: ParseRosterResult; version: number }> {
  const roster = await findRoster(workspaceId, rosterId);
  const [skills, people, shifts, wishes, pairings, pins] = await Promise.all([
    Skill.findAll({ where: { workspaceId }, order: [['id', 'ASC']] }),
    // Archived people stay in old rosters' history only; a new solve never sees them.
    Person.findAll({ where: { workspaceId, archivedAt: null }, order: [['id', 'ASC']] }),
    ShiftRow.findAll({ where: { workspaceId, rosterId }, order: [['startsLocal', 'ASC'], ['id', 'ASC']] }),
    WishRow.findAll({ where: { workspaceId, rosterId }, order: [['id', 'ASC']] }),
    PairingRow.findAll({ where: { workspaceId, status: 'approved' }, order: [['id', 'ASC']] }),
    PinRow.findAll({ where: { workspaceId, rosterId } }),
  ]);
  const terms = await termsForPeriod(workspaceId, { start: roster.periodStart, end: roster.periodEnd });
  const seats = await SeatRow.findAll({ where: { workspaceId, shiftId: shifts.map((s) => s.id) }, order: [['shiftId', 'ASC'], ['position', 'ASC']] });
  // Wishes, pairings and pins of archived people would name someone the roster no longer has.
  const active = new Set(people.map((p) => p.id));
  const input: RosterInput = {
    format: 'rotaloom.roster/1',
    name: roster.name,
    period: { start: roster.periodStart, end: roster.periodEnd, timeZone: roster.timeZone },
    skills: skills.map((s) => ({ id: rosterIds.skill(s.id), name: s.name })),
    people: people.map((p) => ({
      id: rosterIds.person(p.id),
      name: p.name,
      skills: (p.skills ?? []).map(rosterIds.skill),
      ...(p.contractedHours > 0 ? { contractedHoursPerWeek: p.contractedHours } : {}),
      ...(terms.has(p.id) ? { terms: terms.get(p.id) } : {}),
    })),
    shifts: shifts.map((s) => ({
      id: rosterIds.shift(s.id),
      patternLabel: s.label,
      start: s.startsLocal,
      end: s.endsLocal,
      ...(s.night === null || s.night === undefined ? {} : { night: s.night }),
    })),
    seats: seats.map((s) => ({ id: rosterIds.seat(s.id), shift: rosterIds.shift(s.shiftId), skill: s.skillId ? rosterIds.skill(s.skillId) : null })),
    wishes: wishes.filter((w) => active.has(w.personId)).map((w) => ({
      person: rosterIds.person(w.personId),
      ...(w.shiftId ? { shift: rosterIds.shift(w.shiftId) } : { date: w.date ?? undefined }),
      kind: w.kind,
      strength: w.strength,
    })),
    pairings: pairings.filter((p) => active.has(p.personAId) && active.has(p.personBId)).map((p) => ({ a: rosterIds.person(p.personAId), b: rosterIds.person(p.personBId), score: p.score, never: p.neverTogether })),
    pins: pins.filter((p) => p.personId === null || active.has(p.personId)).map((p) => ({ seat: rosterIds.seat(p.seatId), person: p.personId ? rosterIds.person(p.personId) : null })),
    rules: roster.rules,
    absences: await absencesForRoster(workspaceId, { start: roster.periodStart, end: roster.periodEnd }, people.map((p) => p.id)),
  };
  const parsed = parseRoster(input);
  // Earlier periods' nights and weekends (the ledger) become soft per-person terms of this one.
  const carried = parsed.ok ? await ledgerTerms(workspaceId, parsed.roster) : new Map();
  if (carried.size === 0) return { input, parsed, version: roster.version };
  for (const person of input.people) if (carried.has(person.id)) person.terms = [...(person.terms ?? []), ...carried.get(person.id)!];
  return { input, parsed: parseRoster(input), version: roster.version };
}

/** The roster as it stands now, valid, or a 422 naming every problem (the message leads with the first). */
export async function assembleValidRoster(workspaceId: number, rosterId: number): Promise<{ roster: RosterJson; version: number }> {
  const { parsed, version } = await assembleRoster(workspaceId, rosterId);
  if (!parsed.ok) {
    throw new HttpError(422, 'unprocessable', `The roster has problems to fix first: ${parsed.issues[0].path}: ${parsed.issues[0].message}`, parsed.issues.map((i) => ({ path: `roster.${i.path}`, message: i.message })));
  }
  return { roster: parsed.roster, version };
}
