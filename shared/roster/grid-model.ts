/**
 * The whole-roster grid as plain data: people × days, each cell with the person's seats,
 * absences, wishes (and whether the roster honours them) and the rule breaches that touch it.
 * Pure so it can be tested without a browser and shared by the screen, the print sheet and the PDF.
 */
import { addLocalDays, daysBetween, isoWeekday } from './time';

export interface GridShift {
  id: number;
  label: string;
  startsLocal: string;
  endsLocal: string;
  night: boolean | null;
  seats: Array<{ id: number; skillId: number | null }>;
}
export interface GridPerson {
  id: number;
  name: string;
  skillIds: number[];
  contractedHours?: number | null;
}
export interface GridWish {
  personId: number;
  date: string | null;
  shiftId: number | null;
  kind: 'prefer' | 'avoid' | 'cannot';
}
export interface GridAbsence {
  personId: number;
  kind: string;
  startDate: string;
  endDate: string;
  startTime: string | null;
  endTime: string | null;
  status?: string;
}
export interface GridViolation {
  term: string;
  hard: boolean;
  points: number | null;
  message: string;
  /** Roster JSON ids: p12 (person), st99 (seat). */
  people: string[];
  seats: string[];
}
export interface GridTotals {
  personId: string;
  hours: number;
  nights: number;
  weekendShifts: number;
  contractedHours?: number;
}

export interface GridInput {
  periodStart: string;
  periodEnd: string;
  shifts: GridShift[];
  people: GridPerson[];
  /** Seat id → person id (null = open). */
  assignment: Map<number, number | null>;
  pins?: Map<number, { personId: number | null }>;
  wishes?: GridWish[];
  absences?: GridAbsence[];
  violations?: GridViolation[];
  totals?: GridTotals[];
  skillName: (id: number | null) => string;
}

export interface CellSeat {
  seatId: number;
  shift: GridShift;
  skillId: number | null;
  pinned: boolean;
}
export interface CellWish {
  kind: GridWish['kind'];
  /** Null: a wish on one shift; the words say which. */
  shiftLabel: string | null;
  honoured: boolean;
}
export interface GridCell {
  day: string;
  seats: CellSeat[];
  absence: GridAbsence | null;
  wishes: CellWish[];
  breaches: GridViolation[];
}
export interface GridRow {
  person: GridPerson;
  cells: Map<string, GridCell>;
  hours: number;
  contractedHours: number | null;
  nights: number;
  weekendShifts: number;
  wishesHonoured: number;
  wishesTotal: number;
  /** Breaches of this person that name no seat (e.g. hours over the period). */
  rowBreaches: GridViolation[];
}
export interface FootEntry {
  skillId: number | null;
  skillName: string;
  filled: number;
  needed: number;
}
export interface GridModel {
  days: string[];
  rows: GridRow[];
  foot: Map<string, FootEntry[]>;
  /** Breaches that name no person (open seats): shown at the foot of their day. */
  dayBreaches: Map<string, GridViolation[]>;
}

const PERIOD_TERMS = new Set(['contractedHours', 'fairNights', 'fairWeekends']);
const dbId = (prefixed: string) => Number(prefixed.replace(/^[a-z]+/, ''));
export const isWeekend = (day: string) => isoWeekday(day) >= 6;
const hoursOf = (s: GridShift) => {
  const a = Date.parse(`${s.startsLocal}Z`);
  const b = Date.parse(`${s.endsLocal}Z`);
  return Number.isFinite(a) && Number.isFinite(b) ? (b - a) / 3_600_000 : 0;
};
/** A night shift: flagged as one, or (unflagged) one that crosses midnight. */
export const isNight = (s: GridShift) => s.night ?? s.endsLocal.slice(0, 10) !== s.startsLocal.slice(0, 10);

export function periodDays(start: string, end: string): string[] {
  const n = daysBetween(start, end) + 1;
  return Array.from({ length: Math.max(0, n) }, (_, i) => addLocalDays(start, i));
}

export function buildGrid(input: GridInput): GridModel {
  const days = periodDays(input.periodStart, input.periodEnd);
  const shiftOfSeat = new Map<number, GridShift>();
  for (const s of input.shifts) for (const seat of s.seats) shiftOfSeat.set(seat.id, s);

  const rows = new Map<number, GridRow>();
  for (const p of input.people) {
    const cells = new Map<string, GridCell>();
    for (const d of days) cells.set(d, { day: d, seats: [], absence: null, wishes: [], breaches: [] });
    rows.set(p.id, { person: p, cells, hours: 0, contractedHours: p.contractedHours ?? null, nights: 0, weekendShifts: 0, wishesHonoured: 0, wishesTotal: 0, rowBreaches: [] });
  }

  const foot = new Map<string, Map<string, FootEntry>>();
  const workedShifts = new Map<number, Set<number>>(); // person → shift ids
  for (const s of input.shifts) {
    const day = s.startsLocal.slice(0, 10);
    const perSkill = foot.get(day) ?? new Map<string, FootEntry>();
    foot.set(day, perSkill);
    for (const seat of s.seats) {
      const key = String(seat.skillId);
      const entry = perSkill.get(key) ?? { skillId: seat.skillId, skillName: input.skillName(seat.skillId), filled: 0, needed: 0 };
      perSkill.set(key, entry);
      entry.needed += 1;
      const who = input.assignment.get(seat.id) ?? null;
      if (who === null) continue;
      entry.filled += 1;
      const row = rows.get(who);
      if (!row) continue;
      row.cells.get(day)?.seats.push({ seatId: seat.id, shift: s, skillId: seat.skillId, pinned: input.pins?.has(seat.id) ?? false });
      workedShifts.set(who, (workedShifts.get(who) ?? new Set()).add(s.id));
      row.hours += hoursOf(s);
      if (isNight(s)) row.nights += 1;
      if (isWeekend(day)) row.weekendShifts += 1;
    }
  }
  // The run's own totals are the scorer's (they credit absences); prefer them to the count above.
  for (const t of input.totals ?? []) {
    const row = rows.get(dbId(t.personId));
    if (!row) continue;
    row.hours = t.hours;
    row.nights = t.nights;
    row.weekendShifts = t.weekendShifts;
    if (t.contractedHours !== undefined) row.contractedHours = t.contractedHours;
  }

  for (const a of input.absences ?? []) {
    if (a.status && a.status !== 'approved') continue;
    const row = rows.get(a.personId);
    if (!row) continue;
    for (const d of days) if (d >= a.startDate && d <= a.endDate) row.cells.get(d)!.absence = a;
  }

  const shiftById = new Map(input.shifts.map((s) => [s.id, s]));
  for (const w of input.wishes ?? []) {
    const row = rows.get(w.personId);
    if (!row) continue;
    const shift = w.shiftId !== null ? shiftById.get(w.shiftId) : undefined;
    const day = shift ? shift.startsLocal.slice(0, 10) : w.date;
    if (!day || !row.cells.has(day)) continue;
    const cell = row.cells.get(day)!;
    const works = shift ? (workedShifts.get(w.personId)?.has(shift.id) ?? false) : cell.seats.length > 0;
    const honoured = w.kind === 'prefer' ? works : !works;
    cell.wishes.push({ kind: w.kind, shiftLabel: shift ? shift.label : null, honoured });
    row.wishesTotal += 1;
    if (honoured) row.wishesHonoured += 1;
  }

  const dayBreaches = new Map<string, GridViolation[]>();
  for (const v of input.violations ?? []) {
    const people = v.people.map(dbId).filter((id) => rows.has(id));
    const seatDays = v.seats.map((s) => ({ seat: dbId(s), shift: shiftOfSeat.get(dbId(s)) })).filter((x) => x.shift);
    // Period-wide rules (hours against contract, fair shares) name every seat of the person; marking
    // each of those cells would hide the local breaches, so they go to the row's end instead.
    if (seatDays.length === 0 || (people.length > 0 && (PERIOD_TERMS.has(v.term) || seatDays.length > 8))) {
      for (const id of people) rows.get(id)!.rowBreaches.push(v);
      continue;
    }
    for (const { seat, shift } of seatDays) {
      const day = shift!.startsLocal.slice(0, 10);
      const holder = input.assignment.get(seat) ?? null;
      const whom = people.length ? people : holder !== null && rows.has(holder) ? [holder] : [];
      if (whom.length === 0) {
        const list = dayBreaches.get(day) ?? [];
        if (!list.includes(v)) list.push(v);
        dayBreaches.set(day, list);
      }
      for (const id of whom) {
        const cell = rows.get(id)!.cells.get(day);
        if (cell && !cell.breaches.includes(v)) cell.breaches.push(v);
      }
    }
  }

  return {
    days,
    rows: [...rows.values()],
    foot: new Map([...foot].map(([d, m]) => [d, [...m.values()].sort((a, b) => a.skillName.localeCompare(b.skillName))])),
    dayBreaches,
  };
}

/** A shift's mark in a cell: the first two letters of its own label ("Ea", "Ni"), so marks follow the workspace's names. */
export function shiftMark(label: string): string {
  const letters = label.replace(/[^\p{L}\p{N}]/gu, '');
  if (!letters) return '•';
  return letters.charAt(0).toUpperCase() + letters.slice(1, 2).toLowerCase();
}

/** The part of the day a shift starts in, which picks its colour. */
export function shiftBand(s: Pick<GridShift, 'startsLocal' | 'endsLocal' | 'night'>): 'morning' | 'afternoon' | 'evening' | 'night' {
  if (s.night) return 'night';
  const h = Number(s.startsLocal.slice(11, 13));
  if (h >= 4 && h < 11) return 'morning';
  if (h >= 11 && h < 16) return 'afternoon';
  if (h >= 16 && h < 20) return 'evening';
  return 'night';
}

export const ABSENCE_MARKS: Record<string, string> = { annual: 'Lv', sick: 'Sk', training: 'Tr', parental: 'Pa', other: 'Aw' };
export const WISH_MARKS: Record<GridWish['kind'], string> = { prefer: '+', avoid: '−', cannot: '×' };

/** The words a screen reader and the tooltip use for one cell. */
export function cellWords(row: GridRow, cell: GridCell, words: { day: string; skillName: (id: number | null) => string; absenceWords: (kind: string) => string }): string {
  const parts: string[] = [`${row.person.name}, ${words.day}`];
  if (cell.seats.length === 0) parts.push('not working');
  for (const s of cell.seats) parts.push(`${s.shift.label} ${s.shift.startsLocal.slice(11, 16)}–${s.shift.endsLocal.slice(11, 16)} as ${words.skillName(s.skillId)}${s.pinned ? ' (pinned)' : ''}`);
  if (cell.absence) parts.push(`away: ${words.absenceWords(cell.absence.kind)}`);
  for (const w of cell.wishes) parts.push(`wish ${w.kind}${w.shiftLabel ? ` ${w.shiftLabel}` : ''}: ${w.honoured ? 'honoured' : 'not honoured'}`);
  for (const b of cell.breaches) parts.push(`${b.hard ? 'breaks' : 'gives up'}: ${b.message}`);
  return parts.join('; ');
}
