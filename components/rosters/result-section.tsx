import { useMemo, useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { MonthCalendar } from '@/components/ui/month-calendar';
import { calendarTheme, colors, radius, space } from '@/constants/theme';
import { TERM_LABELS } from '@/shared/api/rosters';
import { useRun } from '@/hooks/api/get-run';
import { useConcessions } from '@/hooks/api/get-concessions';
import { usePriceConcession } from '@/hooks/api/price-concession';
import type { PersonTotals, RosterDto, RunDetail, RunDto } from '@/hooks/api/roster-types';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body } from '@/components/ui/typography';
import { Choices, Loadable, Panel, Pill } from './panel';
import { gapWords, longDayWords, points, runName, timeOf } from './format';
import { useRosterView, type SeatView } from '@/hooks/use-roster-view';
import { SeatPanel } from './seat-panel';
import { RosterGrid } from './grid/roster-grid';

/** The view last chosen in this session: a re-solve opens the result the way the coordinator left it. */
let lastShape: 'grid' | 'days' = 'grid';

export function ResultSection({ roster, runId, runs, onPickRun }: { roster: RosterDto; runId: number | null; runs: RunDto[]; onPickRun: (id: number) => void }) {
  const finished = runs.filter((r) => (r.status === 'done' || r.status === 'cancelled') && r.score !== null).slice(0, 6);
  if (runId === null) return <Notice kind="info">No finished run yet. Solve the roster first (Solve).</Notice>;
  return (
    <View style={{ gap: space.lg }}>
      {finished.length > 1 ? (
        <Choices label="Run shown" options={finished.map((r) => ({ value: String(r.id), label: `${runName(r)}${r.parameters.manual ? ' (edited)' : ''}${roster.publishedRunId === r.id ? ' · published' : ''}` }))} value={[String(runId)]} onChange={(v) => onPickRun(Number(v[0]))} />
      ) : null}
      <RunResult roster={roster} runId={runId} onPickRun={onPickRun} />
    </View>
  );
}

function RunResult({ roster, runId, onPickRun }: { roster: RosterDto; runId: number; onPickRun: (id: number) => void }) {
  const run = useRun(runId);
  return (
    <Loadable query={run} label="The result">
      {(r) => (r.status === 'queued' || r.status === 'running' ? <Notice kind="info">This run is still solving; see Solve for its progress.</Notice> : r.result ? <ResultBody roster={roster} run={r} onPickRun={onPickRun} /> : <Notice>{r.error ?? 'This run has no roster.'}</Notice>)}
    </Loadable>
  );
}

function ResultBody({ roster, run, onPickRun }: { roster: RosterDto; run: RunDetail; onPickRun: (id: number) => void }) {
  const [shape, setShapeState] = useState<'grid' | 'days'>(lastShape);
  const setShape = (v: 'grid' | 'days') => setShapeState((lastShape = v));
  const assignment = useMemo(() => new Map(run.assignments.map((a) => [a.seatId, a.personId])), [run.assignments]);
  const { view, error } = useRosterView(roster.id, assignment);
  const [day, setDay] = useState<string>(roster.periodStart);
  const [seat, setSeat] = useState<number | null>(null);
  const result = run.result!;
  // Publishing (and reopening) moves the roster's version on without changing what was solved, so a
  // published roster never reads as changed; it is frozen and cannot be solved again until reopened.
  const published = roster.status === 'published';
  const stale = !published && run.rosterVersion !== roster.version;
  return (
    <View style={{ gap: space.lg }}>
      <Panel title={run.parameters.manual ? `${runName(run)} (hand-edited)` : runName(run)} testID="result-summary">
        <View style={styles.figures}>
          <Figure label="Score" value={`${points(run.score)} points`} />
          <Figure label="Open seats" value={String(result.openSeats)} />
          <Figure label="Concessions" value={String(result.violations.filter((v) => !v.hard).length)} />
        </View>
        <Body testID="result-gap-words">{run.parameters.manual ? 'Edited by hand: scored by the independent scorer, no bound.' : gapWords(run.score, run.bound, run.gap, result.optimal, result.ideal)}</Body>
        {stale ? <Notice kind="caution">The roster changed after this run (shifts, wishes, rules or pins). Solve again to include the changes.</Notice> : null}
        {published && roster.publishedRunId !== run.id ? <Notice kind="info">{`This is not the published run. The roster is published and frozen: reopen it (Publish) to solve again or publish another run.`}</Notice> : null}
      </Panel>
      {error ? <Notice>{`The roster could not be loaded: ${error.message}`}</Notice> : null}
      <Choices label="Show the roster as" options={[{ value: 'grid', label: 'Grid' }, { value: 'days', label: 'Month and days' }]} value={[shape]} onChange={(v) => setShape(v[0] as 'grid' | 'days')} testID="result-shape" />
      {shape === 'grid' ? <RosterGrid roster={roster} run={run} onSaved={onPickRun} /> : null}
      {shape === 'days' && view ? (
        <>
          <Panel title="Month" lead="Each day: green when every seat is filled, ochre when a seat stays open.">
            <MonthCalendar
              firstDay={1}
              current={day}
              minDate={roster.periodStart}
              maxDate={roster.periodEnd}
              enableSwipeMonths
              onDayPress={(d: { dateString: string }) => {
                setDay(d.dateString);
                setSeat(null);
              }}
              markedDates={markDays(view.byDay, view.seats, day)}
              theme={calendarTheme}
              testID="result-calendar"
            />
          </Panel>
          <Panel title={longDayWords(day)} lead="Open a seat for who could take it instead, and to pin it." testID="day-list">
            {(view.byDay.get(day) ?? []).length === 0 ? <Body muted>No shifts this day.</Body> : null}
            {(view.byDay.get(day) ?? []).map((shift) => (
              <View key={shift.id} style={styles.shift}>
                <Body bold>{`${shift.label} · ${timeOf(shift.startsLocal)}–${timeOf(shift.endsLocal)}`}</Body>
                <View style={styles.seats}>
                  {view.seatsOf(shift.id).map((s) => (
                    <SeatChip key={s.seatId} seat={s} name={view.personName(s.personId)} pinnedName={s.pinned ? view.personName(s.pinned.personId) : null} on={seat === s.seatId} onPress={() => setSeat(seat === s.seatId ? null : s.seatId)} />
                  ))}
                </View>
                {view.seatsOf(shift.id).some((s) => s.seatId === seat) && seat !== null ? <SeatPanel roster={roster} runId={run.id} seatId={seat} /> : null}
              </View>
            ))}
          </Panel>
        </>
      ) : shape === 'days' && !error ? (
        <Body muted>Loading the roster…</Body>
      ) : null}
      <Concessions run={run} />
      <PeopleView people={result.people} />
    </View>
  );
}

function markDays(byDay: Map<string, Array<{ id: number }>>, seats: SeatView[], selected: string) {
  const marked: Record<string, { marked?: boolean; dotColor?: string; selected?: boolean; selectedColor?: string }> = {};
  for (const [d, shifts] of byDay) {
    const ids = new Set(shifts.map((s) => s.id));
    const open = seats.some((s) => ids.has(s.shift.id) && s.personId === null);
    marked[d] = { marked: true, dotColor: open ? colors.thread : colors.ok };
  }
  marked[selected] = { ...(marked[selected] ?? {}), selected: true, selectedColor: colors.loom };
  return marked;
}

function SeatChip({ seat, name, pinnedName, on, onPress }: { seat: SeatView; name: string; pinnedName: string | null; on: boolean; onPress: () => void }) {
  const open = seat.personId === null;
  // A pin to someone else takes effect at the next run: say who holds the seat now and who it is pinned to.
  const pinWords = !seat.pinned ? '' : seat.pinned.personId === seat.personId ? ' · pinned' : ` · pinned to ${pinnedName} from the next run`;
  return (
    <Pressable
      role="button"
      aria-expanded={on}
      accessibilityLabel={`Seat for ${seat.skillName} on the ${seat.shift.label} shift: ${name}${pinWords.replace(' · ', ', ')}`}
      onPress={onPress}
      style={[styles.chip, open && styles.chipOpen, on && styles.chipOn]}
      testID={`seat-${seat.seatId}`}
    >
      <Body style={[styles.chipText, on && { color: colors.white }]}>{`${name}${pinWords}`}</Body>
      <Body style={[styles.chipSkill, on && { color: colors.loomSoft }]}>{seat.skillName}</Body>
    </Pressable>
  );
}

function Concessions({ run }: { run: RunDetail }) {
  const concessions = useConcessions(run.id);
  const price = usePriceConcession();
  const [shown, setShown] = useState(8);
  const [prices, setPrices] = useState<Record<number, string>>({});
  return (
    <Panel title="Concessions" lead="What this roster gives up, largest cost first. Ask what honouring one would cost: Rotaloom re-solves with it enforced." testID="concessions">
      <Loadable query={concessions} label="Concessions">
        {(items) =>
          items.length === 0 ? (
            <Body>Nothing given up: every wish and soft rule is kept.</Body>
          ) : (
            <View style={{ gap: space.sm }}>
              {items.slice(0, shown).map((c) => (
                <View key={c.index} style={styles.concession} testID={`concession-${c.index}`}>
                  <View style={styles.concessionHead}>
                    <Pill tone="warn">{`${points(c.points)} points`}</Pill>
                    <Body muted>{TERM_LABELS[c.term] ?? c.term}</Body>
                  </View>
                  <Body>{capital(c.message)}</Body>
                  {prices[c.index] ? (
                    <Notice kind="info">{prices[c.index]}</Notice>
                  ) : (
                    <Button
                      kind="quiet"
                      label="What would it cost to honour this?"
                      busy={price.isPending && price.variables?.index === c.index}
                      disabled={price.isPending}
                      onPress={() => price.mutate({ runId: run.id, index: c.index, timeLimitSeconds: Math.min(5, Math.max(1, run.parameters.timeLimitSeconds || 5)) }, { onSuccess: (p) => setPrices((x) => ({ ...x, [c.index]: p.words })) })}
                      testID={`concession-price-${c.index}`}
                    />
                  )}
                </View>
              ))}
              {price.error ? <Notice>{price.error.message}</Notice> : null}
              {items.length > shown ? <Button kind="quiet" label={items.length - shown <= 20 ? `Show the other ${items.length - shown}` : `Show 20 more (${items.length - shown} not shown)`} onPress={() => setShown(shown + 20)} /> : null}
            </View>
          )
        }
      </Loadable>
    </Panel>
  );
}

const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

/** Hours against contract and nights per person, with bars drawn from plain Views. */
function PeopleView({ people }: { people: PersonTotals[] }) {
  const working = people.filter((p) => p.shifts > 0 || (p.contractedHours ?? 0) > 0);
  const maxHours = Math.max(1, ...working.map((p) => Math.max(p.hours, p.contractedHours ?? 0)));
  const maxNights = Math.max(1, ...working.map((p) => p.nights));
  return (
    <Panel title="People" lead="Hours over the period against each contract (the line), and nights worked." testID="people-view">
      <View style={styles.legend}>
        <View style={[styles.swatch, { backgroundColor: colors.loom }]} />
        <Body muted>hours</Body>
        <View style={[styles.swatch, { backgroundColor: colors.thread, width: 3 }]} />
        <Body muted>contract</Body>
        <View style={[styles.swatch, { backgroundColor: '#6E7F9E' }]} />
        <Body muted>nights</Body>
      </View>
      {working.map((p) => {
        const contract = p.contractedHours;
        const diff = contract === undefined ? null : p.hours - contract;
        return (
          <View key={p.personId} style={styles.person} accessible accessibilityLabel={`${p.name}: ${p.hours} hours${contract !== undefined ? ` of ${Math.round(contract)} contracted` : ''}, ${p.shifts} shifts, ${p.nights} nights`}>
            <View style={styles.personHead}>
              <Body bold style={{ flex: 1 }}>{p.name}</Body>
              <Body muted>{`${p.shifts} shifts · ${round(p.hours)} h${contract !== undefined ? ` / ${round(contract)} h` : ''}${diff !== null ? ` (${diff >= 0 ? '+' : '−'}${round(Math.abs(diff))})` : ''} · ${p.nights} nights`}</Body>
            </View>
            <View style={styles.track}>
              <View style={[styles.hours, { width: `${(p.hours / maxHours) * 100}%` }]} />
              {contract !== undefined ? <View style={[styles.contract, { left: `${(contract / maxHours) * 100}%` }]} /> : null}
            </View>
            <View style={styles.trackThin}>
              <View style={[styles.nights, { width: `${(p.nights / maxNights) * 100}%` }]} />
            </View>
          </View>
        );
      })}
    </Panel>
  );
}

const round = (x: number) => Math.round(x * 10) / 10;

function Figure({ label, value }: { label: string; value: string }) {
  return (
    <View style={styles.figure}>
      <Body muted style={{ fontSize: 13 }}>{label}</Body>
      <Body bold>{value}</Body>
    </View>
  );
}

const styles = StyleSheet.create({
  figures: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  figure: { minWidth: 110, padding: space.sm, borderRadius: radius.sm, backgroundColor: colors.paper },
  shift: { gap: space.sm, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.sm },
  seats: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  chip: { minHeight: 44, paddingHorizontal: space.md, paddingVertical: space.xs, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.white, justifyContent: 'center' },
  chipOpen: { borderColor: colors.thread, borderStyle: 'dashed', backgroundColor: colors.threadSoft },
  chipOn: { backgroundColor: colors.loom, borderColor: colors.loom },
  chipText: { fontSize: 15, lineHeight: 19 },
  chipSkill: { fontSize: 12, lineHeight: 15, color: colors.inkSoft },
  concession: { gap: space.xs, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.sm },
  concessionHead: { flexDirection: 'row', gap: space.sm, alignItems: 'center', flexWrap: 'wrap' },
  legend: { flexDirection: 'row', alignItems: 'center', gap: space.xs, flexWrap: 'wrap' },
  swatch: { width: 14, height: 10, borderRadius: 2 },
  person: { gap: 4, paddingVertical: space.xs },
  personHead: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  track: { height: 12, backgroundColor: colors.paper, borderRadius: 3, position: 'relative' },
  hours: { height: 12, backgroundColor: colors.loom, borderRadius: 3 },
  contract: { position: 'absolute', top: -3, width: 3, height: 18, backgroundColor: colors.thread },
  trackThin: { height: 6, backgroundColor: colors.paper, borderRadius: 3 },
  nights: { height: 6, backgroundColor: '#6E7F9E', borderRadius: 3 },
});

