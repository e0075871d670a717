import type { Transaction } from 'sequelize';
import { Person, Skill } from '../db/models';
import type { Roster as RosterJson, ShiftPatternInput } from '../../shared/roster/schema';
import { PairingRow, Roster, SeatRow, ShiftPatternRow, ShiftRow, WishRow } from './models';
import { rosterIds } from './ids';
import { PersonTermRow } from '../terms/models';
import { AbsenceRow } from '../absences/models';
import { addLocalDays } from '../../shared/roster/time';

/**
 * Writes a roster in the JSON format into a workspace: skills and people are matched by name
 * (created when missing) with their terms, then the roster with its shifts, seats, wishes, pairings and rules.
 * Used by the demo seed and by roster file imports. Runs inside the caller's transaction.
 */
export async function importRosterJson(
  workspaceId: number,
  roster: RosterJson,
  options: { name: string; patterns?: ShiftPatternInput[]; transaction: Transaction },
): Promise<{ rosterId: number; personIds: Map<string, number> }> {
  const { transaction } = options;
  const skillIds = new Map<string, number>();
  for (const s of roster.skills) {
    const [row] = await Skill.findOrCreate({ where: { workspaceId, name: s.name }, defaults: { workspaceId, name: s.name }, transaction });
    skillIds.set(s.id, row.id);
  }
  const personIds = new Map<string, number>();
  const created = new Set<string>();
  for (const p of roster.people) {
    const existing = await Person.findOne({ where: { workspaceId, name: p.name }, transaction });
    if (!existing) created.add(p.id);
    const row =
      existing ??
      (await Person.create(
        { workspaceId, name: p.name, contractedHours: p.contractedHoursPerWeek ?? 0, skills: p.skills.map((s) => skillIds.get(s)!) },
        { transaction },
      ));
    personIds.set(p.id, row.id);
  }
  // Stored rules name skills the way the assembled roster does (s<id>).
  const rules = {
    ...roster.rules,
    skillMix: { ...roster.rules.skillMix, requirements: roster.rules.skillMix.requirements.map((q) => ({ ...q, skill: rosterIds.skill(skillIds.get(q.skill)!) })) },
  };
  const rosterRow = await Roster.create(
    { workspaceId, name: options.name, periodStart: roster.period.start, periodEnd: roster.period.end, timeZone: roster.period.timeZone, rules },
    { transaction },
  );
  const patternIds = new Map<string, number>();
  for (const p of options.patterns ?? []) {
    const row = await ShiftPatternRow.create(
      {
        workspaceId,
        rosterId: rosterRow.id,
        label: p.label,
        weekdays: p.weekdays,
        startTime: p.start,
        endTime: p.end,
        seats: p.seats.map((s) => ({ skillId: s.skill ? skillIds.get(s.skill)! : null, count: s.count })),
        night: p.night ?? null,
      },
      { transaction },
    );
    patternIds.set(p.label, row.id);
  }
  const shiftRows = await ShiftRow.bulkCreate(
    roster.shifts.map((s) => ({
      workspaceId,
      rosterId: rosterRow.id,
      patternId: patternIds.get(s.patternLabel) ?? null,
      label: s.patternLabel,
      startsLocal: s.start,
      endsLocal: s.end,
      night: s.night ?? null,
    })),
    { transaction },
  );
  const shiftIds = new Map(roster.shifts.map((s, i) => [s.id, shiftRows[i].id]));
  const positions = new Map<string, number>();
  await SeatRow.bulkCreate(
    roster.seats.map((seat) => {
      const position = positions.get(seat.shift) ?? 0;
      positions.set(seat.shift, position + 1);
      return { workspaceId, shiftId: shiftIds.get(seat.shift)!, skillId: seat.skill ? skillIds.get(seat.skill)! : null, position };
    }),
    { transaction },
  );
  await WishRow.bulkCreate(
    roster.wishes.map((w) => ({
      workspaceId,
      rosterId: rosterRow.id,
      personId: personIds.get(w.person)!,
      date: w.date ?? null,
      shiftId: w.shift ? shiftIds.get(w.shift)! : null,
      kind: w.kind,
      strength: w.strength,
    })),
    { transaction },
  );
  // A person's terms are theirs, not the roster's: kept from the term's own date (or the period's
  // start), and only for people this import creates (an existing person keeps the terms they have).
  const terms = roster.people.filter((p) => created.has(p.id)).flatMap((p) =>
    p.terms.map(({ from, ...term }) => ({ workspaceId, personId: personIds.get(p.id)!, term, effectiveFrom: from ?? roster.period.start })),
  );
  if (terms.length) await PersonTermRow.bulkCreate(terms, { transaction });
  // Absences in a roster file are approved time away: whole days when they run 00:00 to 00:00.
  const absences = roster.absences
    .filter((a) => created.has(a.person))
    .map((a) => {
      const startTime = a.start.slice(11, 16);
      const endTime = a.end.slice(11, 16);
      const endDate = endTime === '00:00' ? addLocalDays(a.end.slice(0, 10), -1) : a.end.slice(0, 10);
      return {
        workspaceId,
        personId: personIds.get(a.person)!,
        kind: a.kind,
        startDate: a.start.slice(0, 10),
        endDate,
        startTime: startTime === '00:00' ? null : startTime,
        endTime: endTime === '00:00' ? null : endTime,
        creditHours: a.creditHours,
        status: 'approved' as const,
      };
    });
  if (absences.length) await AbsenceRow.bulkCreate(absences, { transaction });
  for (const p of roster.pairings) {
    const [a, b] = [personIds.get(p.a)!, personIds.get(p.b)!].sort((x, y) => x - y);
    const exists = await PairingRow.findOne({ where: { workspaceId, personAId: a, personBId: b }, transaction });
    if (!exists) await PairingRow.create({ workspaceId, personAId: a, personBId: b, score: p.score, neverTogether: p.never }, { transaction });
  }
  return { rosterId: rosterRow.id, personIds };
}
