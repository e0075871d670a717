import { useMemo, useRef, useState } from 'react';
import { StyleSheet, useWindowDimensions, View, type GestureResponderEvent } from 'react-native';
import { space, WIDE_BREAKPOINT } from '@/constants/theme';
import { useAbsences } from '@/hooks/api/get-absences';
import { useRosterWishes } from '@/hooks/api/get-roster-wishes';
import { ApiError } from '@/hooks/api/api-client';
import type { RosterDto, RunDetail } from '@/hooks/api/roster-types';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body } from '@/components/ui/typography';
import { Choices, Panel } from '../panel';
import { dayWords } from '../format';
import { useRosterView } from '@/hooks/use-roster-view';
import { buildGrid, type GridCell, type GridRow } from '@/shared/roster/grid-model';
import { GridTable, PHONE_SIZES, WIDE_SIZES } from './grid-table';
import { GridLegend } from './grid-legend';
import { CellDetails } from './cell-details';
import { PrintButton } from './print-sheet';
import { GridScroller } from './grid-scroller';

type Sort = 'name' | 'hours';

/**
 * The whole roster at once: a row per person, a column per day. A phone shows one week and
 * swipes between weeks; a wide screen shows the whole period with the header and names pinned.
 */
export function RosterGrid({ roster, run, onSaved }: { roster: RosterDto; run: RunDetail; onSaved?: (runId: number) => void }) {
  const assignment = useMemo(() => new Map(run.assignments.map((a) => [a.seatId, a.personId])), [run.assignments]);
  const { view, error } = useRosterView(roster.id, assignment);
  const wishes = useRosterWishes(roster.id);
  const absences = useAbsences({ from: roster.periodStart, to: roster.periodEnd, status: 'approved' });
  // Until the absences API is deployed everywhere a 404 only means "no absences known".
  const absencesMissing = absences.error instanceof ApiError && absences.error.status === 404;
  const { width } = useWindowDimensions();
  const wide = width >= WIDE_BREAKPOINT;
  const [sort, setSort] = useState<Sort>('name');
  const [skill, setSkill] = useState<string>('all');
  const [who, setWho] = useState('');
  const [week, setWeek] = useState(0);
  const [selected, setSelected] = useState<{ personId: number; day: string } | null>(null);
  const [hover, setHover] = useState<string | null>(null);

  const model = useMemo(() => {
    if (!view) return null;
    const inRoster = new Set(run.assignments.map((a) => a.personId).filter((x): x is number => x !== null));
    return buildGrid({
      periodStart: roster.periodStart,
      periodEnd: roster.periodEnd,
      shifts: view.shifts,
      people: view.people.filter((p) => !p.archivedAt || inRoster.has(p.id)),
      assignment,
      pins: view.pins,
      wishes: wishes.data?.items ?? [],
      absences: absences.data ?? [],
      violations: run.result?.violations ?? [],
      totals: run.result?.people ?? [],
      skillName: view.skillName,
    });
  }, [view, wishes.data, absences.data, run, roster.periodStart, roster.periodEnd, assignment]);

  const rows = useMemo(() => {
    if (!model) return [];
    const q = who.trim().toLowerCase();
    const list = model.rows.filter((r) => (skill === 'all' || r.person.skillIds.includes(Number(skill))) && (!q || r.person.name.toLowerCase().includes(q)));
    return list.sort((a, b) => (sort === 'hours' ? b.hours - a.hours || a.person.name.localeCompare(b.person.name) : a.person.name.localeCompare(b.person.name)));
  }, [model, sort, skill, who]);

  const weeks = model ? Math.ceil(model.days.length / 7) : 1;
  const shownWeek = Math.min(week, weeks - 1);
  const days = model ? (wide ? model.days : model.days.slice(shownWeek * 7, shownWeek * 7 + 7)) : [];

  // A swipe is a mostly sideways drag that did not scroll the grid itself (the totals lie beyond on a phone).
  const touch = useRef<{ x: number; y: number; scroll: number } | null>(null);
  const scrollX = useRef(0);
  const onTouchStart = (e: GestureResponderEvent) => {
    const t = e.nativeEvent.touches?.[0] ?? e.nativeEvent;
    touch.current = { x: t.pageX, y: t.pageY, scroll: scrollX.current };
  };
  const onTouchEnd = (e: GestureResponderEvent) => {
    const start = touch.current;
    touch.current = null;
    if (!start || wide) return;
    const t = e.nativeEvent.changedTouches?.[0] ?? e.nativeEvent;
    const dx = t.pageX - start.x;
    const dy = t.pageY - start.y;
    if (Math.abs(dx) < 60 || Math.abs(dy) > Math.abs(dx) / 2 || Math.abs(scrollX.current - start.scroll) > 4) return;
    setWeek(Math.max(0, Math.min(weeks - 1, shownWeek + (dx < 0 ? 1 : -1))));
  };

  if (error) return <Notice>{`The roster could not be loaded: ${error.message}`}</Notice>;
  if (!view || !model) return <Body muted>Loading the grid…</Body>;
  const pickedRow = selected ? model.rows.find((r) => r.person.id === selected.personId) : undefined;
  const pickedCell = pickedRow && selected ? pickedRow.cells.get(selected.day) : undefined;
  const skillOptions = [{ value: 'all', label: 'All skills' }, ...[...new Set(view.people.flatMap((p) => p.skillIds))].map((id) => ({ value: String(id), label: view.skillName(id) }))];
  const onCell = (row: GridRow, cell: GridCell) => setSelected(selected?.personId === row.person.id && selected.day === cell.day ? null : { personId: row.person.id, day: cell.day });

  return (
    <View style={{ gap: space.md }}>
      <Panel title="Grid" lead="Everyone against every day. Tap a cell for its seat, who else could take it, and to move someone there." testID="grid-panel" right={<PrintButton roster={roster} run={run} model={model} skillName={view.skillName} />}>
        <View style={styles.controls}>
          <View style={{ minWidth: 180, flexGrow: 1 }}>
            <TextField label="Find a person" value={who} onChangeText={setWho} placeholder="name" testID="grid-filter-person" />
          </View>
          <View style={{ gap: space.xs }}>
            <Body bold>Sort</Body>
            <Choices label="Sort by" options={[{ value: 'name', label: 'Name' }, { value: 'hours', label: 'Hours' }]} value={[sort]} onChange={(v) => setSort(v[0] as Sort)} testID="grid-sort" />
          </View>
        </View>
        <Choices label="Skill" options={skillOptions} value={[skill]} onChange={(v) => setSkill(v[0])} testID="grid-filter-skill" />
        {absencesMissing ? <Body muted>Absences are not available on this server yet; the grid shows shifts and wishes only.</Body> : absences.error ? <Notice kind="caution">{`Absences could not be loaded: ${absences.error.message}`}</Notice> : null}
        {wishes.error ? <Notice kind="caution">{`Wishes could not be loaded: ${wishes.error.message}`}</Notice> : null}
      </Panel>
      {!wide ? (
        <View style={styles.weekNav} testID="grid-week-nav">
          <Button kind="quiet" label="‹ Week" onPress={() => setWeek(Math.max(0, shownWeek - 1))} disabled={shownWeek === 0} testID="grid-week-prev" />
          <Body bold style={{ flex: 1, textAlign: 'center' }} testID="grid-week-label">{days.length ? `${dayWords(days[0])} – ${dayWords(days[days.length - 1])} (${shownWeek + 1} of ${weeks})` : ''}</Body>
          <Button kind="quiet" label="Week ›" onPress={() => setWeek(Math.min(weeks - 1, shownWeek + 1))} disabled={shownWeek >= weeks - 1} testID="grid-week-next" />
        </View>
      ) : null}
      <Body muted role="status" aria-live="polite" testID="grid-hover" style={styles.hover} numberOfLines={3}>
        {hover ?? (wide ? 'Hover over or tap a cell to read it.' : 'Tap a cell to read it; swipe sideways for the next week, scroll for the totals.')}
      </Body>
      {rows.length === 0 ? <Notice kind="info">Nobody matches these filters.</Notice> : null}
      <GridScroller onScrollX={(x) => { scrollX.current = x; }} onTouchStart={onTouchStart} onTouchEnd={onTouchEnd} testID="grid-scroll">
        <GridTable model={model} days={days} rows={rows} sizes={wide ? WIDE_SIZES : PHONE_SIZES} skillName={view.skillName} selected={selected} onCellPress={onCell} onCellHover={setHover} />
      </GridScroller>
      <GridLegend />
      {pickedRow && pickedCell ? (
        <CellDetails key={`${selected!.personId}-${selected!.day}`} roster={roster} run={run} model={model} row={pickedRow} cell={pickedCell} people={view.people} assignment={assignment} skillName={view.skillName} onSaved={onSaved} onClose={() => setSelected(null)} />
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  controls: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md, alignItems: 'flex-end' },
  weekNav: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  // A fixed height: the words change as the pointer moves, and the grid below must not jump.
  hover: { height: 60, fontSize: 14, lineHeight: 20, overflow: 'hidden' },
});
