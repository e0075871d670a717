import { StyleSheet, View } from 'react-native';
import { colors, radius, space, wishMarks } from '@/constants/theme';
import { isNightShift } from '@/shared/roster/derive';
import type { Term, Weekday } from '@/shared/roster/schema';
import { useRuns } from '@/hooks/api/get-runs';
import { useQuery } from '@tanstack/react-query';
import { runQueryOptions } from '@/hooks/api/get-run';
import { useAbsences } from '@/hooks/api/get-absences';
import { useTerms } from '@/hooks/api/get-terms';
import type { RosterWish } from '@/hooks/api/get-roster-wishes';
import type { RosterDto, ShiftDto } from '@/hooks/api/roster-types';
import { Body } from '@/components/ui/typography';
import { kindWords, spanWords } from '@/components/absences/format';
import { Pill } from './panel';
import { dayWords, timeOf } from './format';

const WEEKDAY: Weekday[] = ['sun', 'mon', 'tue', 'wed', 'thu', 'fri', 'sat'];
const weekdayOf = (date: string) => WEEKDAY[new Date(`${date}T12:00:00Z`).getUTCDay()];
const hoursOf = (s: ShiftDto) => (Date.parse(`${s.endsLocal}:00Z`) - Date.parse(`${s.startsLocal}:00Z`)) / 3_600_000;
const isoWeek = (date: string) => {
  const t = Date.parse(`${date}T12:00:00Z`);
  const monday = t - ((new Date(t).getUTCDay() + 6) % 7) * 86_400_000;
  return new Date(monday).toISOString().slice(0, 10);
};

interface Line {
  what: string;
  kept: boolean;
  why: string;
}

/** Whether the person's shifts keep one term, checked straight from the shifts (as the scorer does, in words). */
function termLine(term: Term, words: string, mine: ShiftDto[], from: string): Line {
  const inForce = mine.filter((s) => s.startsLocal.slice(0, 10) >= from);
  const nights = inForce.filter((s) => isNightShift({ start: s.startsLocal, end: s.endsLocal, night: s.night ?? undefined }));
  const n = (x: number, one: string) => `${x} ${one}${x === 1 ? '' : 's'}`;
  switch (term.kind) {
    case 'noNights':
      return { what: words, kept: nights.length === 0, why: nights.length ? `on ${nights.map((s) => dayWords(s.startsLocal)).join(', ')} nights` : 'no night shift' };
    case 'maxNights':
      return { what: words, kept: nights.length <= term.count, why: n(nights.length, 'night') };
    case 'maxWeekends': {
      const weekends = new Set(inForce.filter((s) => ['sat', 'sun'].includes(weekdayOf(s.startsLocal.slice(0, 10)))).map((s) => isoWeek(s.startsLocal.slice(0, 10))));
      return { what: words, kept: weekends.size <= term.count, why: n(weekends.size, 'weekend') };
    }
    case 'daysOff': {
      const bad = inForce.filter((s) => term.weekdays.includes(weekdayOf(s.startsLocal.slice(0, 10))));
      return { what: words, kept: bad.length === 0, why: bad.length ? `works ${bad.map((s) => dayWords(s.startsLocal)).join(', ')}` : 'no shift on those days' };
    }
    case 'maxShiftsPerWeek': {
      const weeks = new Map<string, number>();
      for (const s of inForce) weeks.set(isoWeek(s.startsLocal.slice(0, 10)), (weeks.get(isoWeek(s.startsLocal.slice(0, 10))) ?? 0) + 1);
      const most = Math.max(0, ...weeks.values());
      return { what: words, kept: most <= term.count, why: `at most ${n(most, 'shift')} in a week` };
    }
    case 'earliestStart': {
      const bad = inForce.filter((s) => timeOf(s.startsLocal) < term.time);
      return { what: words, kept: bad.length === 0, why: bad.length ? `${n(bad.length, 'shift')} start earlier` : 'every shift starts in time' };
    }
    case 'latestEnd': {
      const bad = inForce.filter((s) => s.endsLocal.slice(0, 10) !== s.startsLocal.slice(0, 10) || timeOf(s.endsLocal) > term.time);
      return { what: words, kept: bad.length === 0, why: bad.length ? `${n(bad.length, 'shift')} end later` : 'every shift is over in time' };
    }
    case 'allowedPatterns': {
      const bad = inForce.filter((s) => !term.labels.includes(s.label));
      return { what: words, kept: bad.length === 0, why: bad.length ? `${n(bad.length, 'shift')} of other kinds` : 'only those shifts' };
    }
    case 'minHours':
    case 'maxHours': {
      const h = inForce.reduce((t, s) => t + hoursOf(s), 0);
      // Absence credit counts too (the server knows it); the screen shows worked hours and leaves the verdict to the solver's concessions.
      return { what: words, kept: term.kind === 'maxHours' ? h <= term.hours : true, why: `${Math.round(h * 10) / 10} h worked, absence hours on top` };
    }
  }
}

/**
 * How the latest roster treats one person: their absences, terms and wishes, each kept or not
 * and why, read from the run's seats; plus what the solver itself gave up for them.
 */
export function PersonOutcome({ roster, personId, personName, wishes, shifts }: { roster: RosterDto; personId: number; personName: string; wishes: RosterWish[]; shifts: ShiftDto[] }) {
  const runs = useRuns(roster.id);
  const latest = runs.data?.find((r) => r.status === 'done' || (r.status === 'cancelled' && r.score !== null));
  // Before any run there is nothing to fetch.
  const run = useQuery({ ...runQueryOptions(latest?.id ?? 0), enabled: Boolean(latest) });
  const absences = useAbsences({ personId, status: 'approved' });
  const terms = useTerms(personId);
  if (!latest) return <Body muted testID="person-outcome">{`No roster solved yet: solve to see how ${personName}’s wishes, absences and terms are kept.`}</Body>;
  if (!run.data || !absences.data || !terms.data) return null;
  const seatShift = new Map<number, ShiftDto>();
  for (const s of shifts) for (const seat of s.seats) seatShift.set(seat.id, s);
  const mine = run.data.assignments.filter((a) => a.personId === personId).map((a) => seatShift.get(a.seatId)).filter((s): s is ShiftDto => Boolean(s));
  const onDay = (d: string) => mine.filter((s) => s.startsLocal.slice(0, 10) === d);
  const lines: Line[] = [];
  for (const a of absences.data) {
    if (a.endDate < roster.periodStart || a.startDate > roster.periodEnd) continue;
    const during = mine.filter((s) => s.startsLocal.slice(0, 10) >= a.startDate && s.startsLocal.slice(0, 10) <= a.endDate);
    lines.push({ what: `${kindWords(a.kind)}, ${spanWords(a)}`, kept: during.length === 0, why: during.length ? `still on ${during.length} shift${during.length === 1 ? '' : 's'}` : 'on no shift while away' });
  }
  for (const t of terms.data) lines.push(termLine(t.term, t.words, mine, t.effectiveFrom));
  for (const w of wishes.filter((x) => x.personId === personId)) {
    const shift = w.shiftId ? shifts.find((s) => s.id === w.shiftId) : undefined;
    const date = w.date ?? shift?.startsLocal.slice(0, 10) ?? '';
    const worked = shift ? mine.filter((s) => s.id === shift.id) : onDay(date);
    const target = shift ? `the ${shift.label} shift on ${dayWords(date)}` : dayWords(date);
    const kept = w.kind === 'prefer' ? worked.length > 0 : worked.length === 0;
    lines.push({ what: `${wishMarks[w.kind].word} ${target}`, kept, why: worked.length ? `on the ${worked.map((s) => s.label).join(' and ')} shift` : 'not on shift' });
  }
  const given = (run.data.result?.violations ?? []).filter((v) => v.people.includes(personName));
  return (
    <View style={styles.box} testID="person-outcome">
      <Body bold>{`${personName} in the latest roster (run ${latest.id}): ${mine.length} shift${mine.length === 1 ? '' : 's'}`}</Body>
      {lines.length === 0 ? <Body muted>No wishes, absences or terms to check.</Body> : null}
      {lines.map((l, i) => (
        <View key={i} style={styles.line} testID={`outcome-${i}`}>
          <Pill tone={l.kept ? 'good' : 'bad'}>{l.kept ? 'kept' : 'not kept'}</Pill>
          <Body style={{ flex: 1, minWidth: 180 }}>{`${l.what}: ${l.why}`}</Body>
        </View>
      ))}
      {given.length ? given.map((v, i) => <Body key={i} muted>{`Given up: ${v.message}`}</Body>) : <Body muted>The solver gave up nothing of theirs.</Body>}
    </View>
  );
}

const styles = StyleSheet.create({
  box: { gap: space.sm, padding: space.md, borderRadius: radius.sm, backgroundColor: colors.loomSoft },
  line: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm },
});
