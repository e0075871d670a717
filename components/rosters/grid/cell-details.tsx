import { useMemo, useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, radius, space } from '@/constants/theme';
import { useRosterScore } from '@/hooks/api/score-roster';
import { useSaveManualRun } from '@/hooks/api/save-manual-run';
import type { RosterDto, RunDetail } from '@/hooks/api/roster-types';
import type { PersonDto } from '@/shared/api/people';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body } from '@/components/ui/typography';
import { SeatPanel } from '../seat-panel';
import { Pill } from '../panel';
import { longDayWords, points, timeOf } from '../format';
import { absenceWords } from './grid-table';
import type { CellSeat, GridCell, GridModel, GridRow } from '@/shared/roster/grid-model';

interface Props {
  roster: RosterDto;
  run: RunDetail;
  model: GridModel;
  row: GridRow;
  cell: GridCell;
  people: PersonDto[];
  assignment: Map<number, number | null>;
  skillName: (id: number | null) => string;
  onSaved?: (runId: number) => void;
  onClose: () => void;
}

/** What a tapped cell holds, each seat's details (alternatives, pin) and a move tried with the live score. */
export function CellDetails({ roster, run, model, row, cell, people, assignment, skillName, onSaved, onClose }: Props) {
  const frozen = roster.status === 'published';
  // Seats of the day this person could take: open ones first, then seats held by others.
  const daySeats = useMemo(() => {
    const out: CellSeat[] = [];
    for (const r of model.rows) for (const s of r.cells.get(cell.day)?.seats ?? []) out.push(s);
    return out;
  }, [model, cell.day]);
  return (
    <View style={styles.box} role="region" aria-label={`${row.person.name}, ${longDayWords(cell.day)}`} testID="grid-details">
      <View style={styles.head}>
        <Body bold style={{ flex: 1 }}>{`${row.person.name} · ${longDayWords(cell.day)}`}</Body>
        <Button kind="quiet" label="Close" onPress={onClose} testID="grid-details-close" />
      </View>
      {cell.seats.length === 0 ? <Body muted>Not working this day.</Body> : null}
      {cell.absence ? <Body>{`Away: ${absenceWords(cell.absence.kind)}${cell.absence.startTime ? ` from ${cell.absence.startTime}` : ''}${cell.absence.endTime ? ` until ${cell.absence.endTime}` : ''} (${cell.absence.startDate} to ${cell.absence.endDate}).`}</Body> : null}
      {cell.wishes.map((w, i) => (
        <Body key={i} testID="grid-details-wish">{`Wish: ${w.kind === 'prefer' ? 'would like to work' : w.kind === 'avoid' ? 'would rather not work' : 'cannot work'}${w.shiftLabel ? ` the ${w.shiftLabel} shift` : ' this day'}: ${w.honoured ? 'honoured' : 'not honoured'}.`}</Body>
      ))}
      {cell.breaches.length > 0 ? (
        <View style={{ gap: space.xs }} testID="grid-details-breaches">
          {cell.breaches.map((b, i) => (
            <Notice key={i} kind={b.hard ? 'error' : 'caution'}>{`${b.hard ? 'Breaks a hard rule' : `Gives up ${points(b.points)} points`}: ${b.message}`}</Notice>
          ))}
        </View>
      ) : null}
      {cell.seats.map((s) => (
        <View key={s.seatId} style={{ gap: space.sm }}>
          <Body bold>{`${s.shift.label} ${timeOf(s.shift.startsLocal)}–${timeOf(s.shift.endsLocal)} · ${skillName(s.skillId)}`}</Body>
          <SeatPanel roster={roster} runId={run.id} seatId={s.seatId} />
          {!frozen ? <MoveHere roster={roster} run={run} assignment={assignment} seat={s} people={people} model={model} onSaved={onSaved} /> : null}
        </View>
      ))}
      {cell.seats.length === 0 && !frozen ? <PutOnShift roster={roster} run={run} assignment={assignment} row={row} seats={daySeats} skillName={skillName} onSaved={onSaved} /> : null}
      {frozen ? <Body muted>The roster is published; reopen it (Publish) to move people.</Body> : null}
    </View>
  );
}

/** People who already work on a day: listed last and marked, since a second shift that day is rarely wanted. */
function workingOn(model: GridModel, day: string): Set<number> {
  return new Set(model.rows.filter((r) => (r.cells.get(day)?.seats.length ?? 0) > 0).map((r) => r.person.id));
}

function MoveHere({ roster, run, assignment, seat, people, model, onSaved }: { roster: RosterDto; run: RunDetail; assignment: Map<number, number | null>; seat: CellSeat; people: PersonDto[]; model: GridModel; onSaved?: (runId: number) => void }) {
  const [who, setWho] = useState<number | null | undefined>(undefined);
  const busy = workingOn(model, seat.shift.startsLocal.slice(0, 10));
  const holder = assignment.get(seat.seatId) ?? null;
  const eligible = people.filter((p) => p.id !== holder && (seat.skillId === null || p.skillIds.includes(seat.skillId)));
  const free = eligible.filter((p) => !busy.has(p.id));
  const working = eligible.filter((p) => busy.has(p.id));
  return (
    <View style={styles.move} testID="grid-move">
      <Body bold>Move someone here</Body>
      <Body muted>Pick a person to see the roster's score with them on this seat; save it as a new run if it suits you.</Body>
      <View style={styles.chips}>
        {holder !== null ? <Button kind="quiet" label="Leave open" onPress={() => setWho(null)} /> : null}
        {free.map((p) => (
          <Button key={p.id} kind="quiet" label={p.name} onPress={() => setWho(p.id)} testID={`grid-move-${p.id}`} />
        ))}
      </View>
      {working.length ? (
        <>
          <Body muted style={{ fontSize: 13 }}>Already working that day:</Body>
          {/* The group's name tells screen readers; the buttons keep to the name so they fit a phone. */}
          <View style={styles.chips} role="group" aria-label="Already working that day">
            {working.map((p) => (
              <Button key={p.id} kind="quiet" label={p.name} onPress={() => setWho(p.id)} testID={`grid-move-${p.id}`} />
            ))}
          </View>
        </>
      ) : null}
      {who !== undefined ? <LiveMove roster={roster} run={run} assignment={assignment} seatId={seat.seatId} personId={who} name={who === null ? 'the seat left open' : (people.find((p) => p.id === who)?.name ?? 'them')} onSaved={onSaved} /> : null}
    </View>
  );
}

function PutOnShift({ roster, run, assignment, row, seats, skillName, onSaved }: { roster: RosterDto; run: RunDetail; assignment: Map<number, number | null>; row: GridRow; seats: CellSeat[]; skillName: (id: number | null) => string; onSaved?: (runId: number) => void }) {
  const [seatId, setSeatId] = useState<number | null>(null);
  const shiftIds = new Set<number>();
  // Every seat of the day this person may take (skills), open seats shown first.
  const all: Array<{ seatId: number; label: string; open: boolean }> = [];
  const dayShifts = new Map<number, CellSeat['shift']>();
  for (const s of seats) dayShifts.set(s.shift.id, s.shift);
  for (const shift of dayShifts.values()) {
    shiftIds.add(shift.id);
    for (const seat of shift.seats) {
      if (seat.skillId !== null && !row.person.skillIds.includes(seat.skillId)) continue;
      all.push({ seatId: seat.id, label: `${shift.label} ${timeOf(shift.startsLocal)} · ${skillName(seat.skillId)}`, open: (assignment.get(seat.id) ?? null) === null });
    }
  }
  all.sort((a, b) => Number(b.open) - Number(a.open));
  if (all.length === 0) return <Body muted>{`No seat this day that ${row.person.name} has the skills for.`}</Body>;
  return (
    <View style={styles.move} testID="grid-put">
      <Body bold>{`Put ${row.person.name} on a shift this day`}</Body>
      <View style={styles.chips}>
        {all.map((s) => (
          <Button key={s.seatId} kind="quiet" label={`${s.label}${s.open ? ' (open)' : ''}`} onPress={() => setSeatId(s.seatId)} testID={`grid-put-${s.seatId}`} />
        ))}
      </View>
      {seatId !== null ? <LiveMove roster={roster} run={run} assignment={assignment} seatId={seatId} personId={row.person.id} name={row.person.name} onSaved={onSaved} /> : null}
    </View>
  );
}

/** The independent scorer on the roster with one seat changed: the same live score the editor shows. */
function LiveMove({ roster, run, assignment, seatId, personId, name, onSaved }: { roster: RosterDto; run: RunDetail; assignment: Map<number, number | null>; seatId: number; personId: number | null; name: string; onSaved?: (runId: number) => void }) {
  const moved = useMemo(() => {
    const a: Record<string, number | null> = {};
    for (const [k, v] of assignment) a[String(k)] = v;
    a[String(seatId)] = personId;
    return a;
  }, [assignment, seatId, personId]);
  const score = useRosterScore(roster.id, moved);
  const save = useSaveManualRun();
  const fresh = score.data && !score.isPlaceholderData ? score.data : null;
  const hard = fresh?.violations.filter((v) => v.hard) ?? [];
  const delta = fresh?.total !== null && fresh?.total !== undefined && run.score !== null ? fresh.total - run.score : null;
  return (
    <View style={styles.live} aria-live="polite" testID="grid-live-score">
      {!fresh ? (
        <Body muted>{`Scoring the roster with ${name} here…`}</Body>
      ) : fresh.feasible ? (
        <View style={styles.chips}>
          <Pill tone={delta !== null && delta >= -0.05 ? 'good' : 'warn'}>{`${points(fresh.total)} points`}</Pill>
          <Body>{`With ${name} here${delta === null ? '' : `: ${Math.abs(delta) < 0.05 ? 'no change' : `${delta > 0 ? '+' : '−'}${points(Math.abs(delta))} points`} against this run`}.`}</Body>
        </View>
      ) : (
        <Notice>{`With ${name} here the roster breaks a hard rule: ${hard.slice(0, 2).map((v) => v.message).join('; ')}`}</Notice>
      )}
      {score.error ? <Notice>{score.error.message}</Notice> : null}
      {save.error ? <Notice>{save.error.message}</Notice> : null}
      <Button
        label="Save as a new run"
        disabled={!fresh || !fresh.feasible}
        busy={save.isPending}
        onPress={() =>
          save
            .mutateAsync({ rosterId: roster.id, assignment: moved, version: roster.version, basedOnRunId: run.id })
            .then((r) => onSaved?.(r.runId))
            .catch(() => {})
        }
        testID="grid-move-save"
      />
    </View>
  );
}

const styles = StyleSheet.create({
  box: { gap: space.sm, padding: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: colors.loom, backgroundColor: colors.card },
  head: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  move: { gap: space.sm, padding: space.md, borderRadius: radius.sm, backgroundColor: colors.loomSoft },
  chips: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs, alignItems: 'center' },
  live: { gap: space.sm, padding: space.sm, borderRadius: radius.sm, backgroundColor: colors.white },
});
