import { Person } from '../db/models';
import { Roster, SeatRow, ShiftRow } from '../rosters/models';
import { Skill } from '../db/models';
import type { OfferDto, ShiftRef, SwapDto } from '../../shared/api/swaps';
import type { OfferRow, SwapRow } from './models';

/** Names, shifts and rosters for a list of swaps and offers, read in one query per table. */
async function lookups(workspaceId: number, seatIds: number[], personIds: number[], rosterIds: number[]) {
  const seats = seatIds.length ? await SeatRow.findAll({ where: { workspaceId, id: [...new Set(seatIds)] } }) : [];
  const shifts = seats.length ? await ShiftRow.findAll({ where: { workspaceId, id: [...new Set(seats.map((s) => s.shiftId))] } }) : [];
  const people = personIds.length ? await Person.findAll({ where: { workspaceId, id: [...new Set(personIds)] }, attributes: ['id', 'name'] }) : [];
  const rosters = rosterIds.length ? await Roster.findAll({ where: { workspaceId, id: [...new Set(rosterIds)] }, attributes: ['id', 'name'] }) : [];
  const skillIds = seats.map((s) => s.skillId).filter((id): id is number => id !== null);
  const skills = skillIds.length ? await Skill.findAll({ where: { workspaceId, id: [...new Set(skillIds)] } }) : [];
  const shiftById = new Map(shifts.map((s) => [s.id, s]));
  const seatById = new Map(seats.map((s) => [s.id, s]));
  const name = new Map(people.map((p) => [p.id, p.name]));
  const rosterName = new Map(rosters.map((r) => [r.id, r.name]));
  const skillName = new Map(skills.map((s) => [s.id, s.name]));
  const shiftRef = (seatId: number | null): ShiftRef | null => {
    const seat = seatId ? seatById.get(seatId) : undefined;
    const shift = seat ? shiftById.get(seat.shiftId) : undefined;
    return seat && shift ? { seatId: seat.id, shiftId: shift.id, label: shift.label, startsLocal: shift.startsLocal, endsLocal: shift.endsLocal } : null;
  };
  const who = (id: number) => ({ id, name: name.get(id) ?? `person ${id}` });
  const skillOf = (seatId: number) => {
    const skill = seatById.get(seatId)?.skillId;
    return skill ? (skillName.get(skill) ?? null) : null;
  };
  return { shiftRef, who, rosterName: (id: number) => rosterName.get(id) ?? `roster ${id}`, skillOf };
}

export async function swapDtos(workspaceId: number, rows: SwapRow[]): Promise<SwapDto[]> {
  const l = await lookups(
    workspaceId,
    rows.flatMap((r) => [r.proposerSeatId, r.colleagueSeatId ?? 0].filter(Boolean)),
    rows.flatMap((r) => [r.proposerPersonId, r.colleaguePersonId]),
    rows.map((r) => r.rosterId),
  );
  return rows.map((r) => ({
    id: r.id,
    rosterId: r.rosterId,
    rosterName: l.rosterName(r.rosterId),
    kind: r.kind,
    status: r.status,
    proposer: l.who(r.proposerPersonId),
    colleague: l.who(r.colleaguePersonId),
    proposerShift: l.shiftRef(r.proposerSeatId),
    colleagueShift: l.shiftRef(r.colleagueSeatId ?? null),
    check: r.checkResult,
    version: r.version,
    createdAt: new Date(r.createdAt).toISOString(),
  }));
}

export async function offerDtos(workspaceId: number, rows: OfferRow[]): Promise<OfferDto[]> {
  const l = await lookups(
    workspaceId,
    rows.map((r) => r.seatId),
    rows.flatMap((r) => [...r.eligible, ...(r.takerPersonId ? [r.takerPersonId] : [])]),
    rows.map((r) => r.rosterId),
  );
  return rows.map((r) => ({
    id: r.id,
    rosterId: r.rosterId,
    rosterName: l.rosterName(r.rosterId),
    status: r.status,
    shift: l.shiftRef(r.seatId),
    skill: l.skillOf(r.seatId),
    eligible: r.eligible.map(l.who),
    taker: r.takerPersonId ? l.who(r.takerPersonId) : null,
    check: r.checkResult ?? null,
    version: r.version,
  }));
}
