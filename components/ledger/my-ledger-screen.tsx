import { useState } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { format, parseISO } from 'date-fns';
import { colors, space } from '@/constants/theme';
import type { LedgerCounts, MyLedgerAnswer } from '@/shared/api/ledger';
import { useMyLedger } from '@/hooks/api/get-my-ledger';
import { Section } from '@/components/auth/section';
import { ChoiceChips } from '@/components/staff/choice-chips';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body, Heading } from '@/components/ui/typography';
import { HOURS_KEYS, KINDS, Legend, PairChart, PeriodsChart, WISH_KINDS, periodLabel } from './ledger-charts';

const day = (date: string) => format(parseISO(date), 'd MMM yyyy');
const num = (v: number) => String(Math.round(v * 10) / 10);
// A no-break space keeps the unit with its number when a line wraps.
const hours = (v: number) => `${num(v)}\u00a0h`;
const signed = (v: number) => `${v >= 0 ? '+' : '−'}${hours(Math.abs(v))}`;
const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** The rows of the "you and the team" chart and table, in the order the ledger's key uses. */
const COMPARED: Array<{ key: keyof LedgerCounts; short: string; label: string }> = [
  { key: 'nights', short: 'Nights', label: 'Nights' },
  { key: 'weekendShifts', short: 'Weekends', label: 'Weekend shifts' },
  { key: 'holidayShifts', short: 'Holidays', label: 'Public holidays' },
  { key: 'unpopularShifts', short: 'Unpopular', label: 'Unpopular shifts' },
  { key: 'swaps', short: 'Swaps', label: 'Swaps and taken shifts' },
];

const TABLE: Array<{ key: keyof LedgerCounts; label: string; unit?: 'h' }> = [
  { key: 'shifts', label: 'Shifts' },
  ...COMPARED.map(({ key, label }) => ({ key, label })),
  { key: 'weekendsWorked', label: 'Weekends worked' },
  { key: 'wishesHonoured', label: 'Wishes kept' },
  { key: 'wishesRefused', label: 'Wishes not kept' },
  { key: 'hours', label: 'Hours worked', unit: 'h' },
  { key: 'contractHours', label: 'Contracted hours', unit: 'h' },
];

const YOU = { label: 'You', color: colors.loom };
const TEAM = { label: 'Team average', color: colors.thread };

/**
 * A staff member's own ledger: their nights, weekends, public holidays, unpopular shifts, wishes,
 * hours and swaps across published rosters, beside the team's average per person. The server
 * sends no one else's line, and leaves out any average that would give a colleague's counts away.
 */
export function MyLedgerScreen() {
  const ledger = useMyLedger();
  return (
    <View style={styles.page}>
      <Heading>My ledger</Heading>
      <Body muted>Your counts across published rosters, beside the team’s average per person. Coordinators’ next rosters read them: if you worked more nights or weekends than your share, the next roster asks for fewer.</Body>
      {ledger.isPending ? <ActivityIndicator color={colors.loom} accessibilityLabel="Loading your ledger" /> : null}
      {ledger.error ? (
        <View style={styles.stack} testID="my-ledger-error">
          <Notice>{`Your ledger could not be loaded. ${ledger.error.message}`}</Notice>
          <Button kind="quiet" label="Try again" busy={ledger.isFetching} onPress={() => void ledger.refetch()} />
        </View>
      ) : null}
      {ledger.data ? <Ledger data={ledger.data} /> : null}
    </View>
  );
}

function Ledger({ data }: { data: MyLedgerAnswer }) {
  const [whose, setWhose] = useState<'me' | 'team'>('me');
  if (data.periods.length === 0) {
    return <Notice kind="info">Nothing is published yet. When a coordinator publishes a roster, your nights, weekends, public holidays, wishes and hours are counted here.</Notice>;
  }
  const range = `${day(data.from!)} to ${day(data.to!)}, ${plural(data.periods.length, 'published roster')}.`;
  if (!data.me) {
    return (
      <View style={styles.stack} testID="my-ledger-none">
        <Body muted>{range}</Body>
        <Notice kind="info">You are not on any published roster in this time, so there is nothing of yours to count yet. Your counts appear here once a published roster has you on it.</Notice>
      </View>
    );
  }
  const me = data.me;
  const team = data.team;
  const shown = new Set(team.rosterIds);
  const withheld = data.periods.filter((p) => !shown.has(p.rosterId));
  const minPeople = data.minColleagues + 1;
  const teamSeries = team.byPeriod.filter((t) => t.average !== null).map((t) => ({ rosterId: t.rosterId, ...t.average! }));
  const teamNote =
    team.rosterIds.length === 0
      ? `The team’s average is not shown: on ${data.periods.length === 1 ? 'this roster' : 'these rosters'} fewer than ${minPeople} people were counted, and an average of so few would give a colleague’s own counts away.`
      : withheld.length > 0
        ? `The team’s average leaves out ${withheld.map((p) => p.name).join(', ')}: fewer than ${minPeople} people were counted there, and an average of so few would give a colleague’s own counts away. The bars compare you and the team on the ${team.rosterIds.length === 1 ? 'other roster' : `other ${team.rosterIds.length} rosters`} only.`
        : `The team’s average is per person counted on each roster (${plural(data.teamSize, 'person', 'people')} in all, you included).`;
  const diff = me.totals.hours - me.totals.contractHours;
  const wishes = me.totals.wishesHonoured + me.totals.wishesRefused;
  const teamWishes = team.average.wishesHonoured + team.average.wishesRefused;

  return (
    <View style={styles.stack}>
      <Section title="You and the team" lead={range} testID="my-ledger-compare">
        <Body muted testID="my-ledger-team-note">{teamNote}</Body>
        {team.rosterIds.length > 0 ? (
          <PairChart
            testID="my-ledger-compare-chart"
            accessibilityLabel={`You beside the team’s average: ${COMPARED.map((c) => `${c.label} ${num(team.mine[c.key])} against ${num(team.average[c.key])}`).join('; ')}`}
            rows={COMPARED.map((c) => ({ label: c.short, first: team.mine[c.key], second: team.average[c.key] }))}
            keys={[YOU, TEAM]}
          />
        ) : null}
        <NumbersTable mine={me.totals} average={team.rosterIds.length > 0 ? team.average : null} partial={withheld.length > 0} />
      </Section>

      <Section title="Period by period" lead="Nights, weekend, public-holiday and unpopular shifts on each published roster, by its first day." testID="my-ledger-periods">
        {teamSeries.length > 0 ? (
          <ChoiceChips
            label="Whose"
            choices={[
              { value: 'me', label: 'You' },
              { value: 'team', label: 'Team average' },
            ]}
            value={whose}
            onChange={setWhose}
            testID="my-ledger-whose"
          />
        ) : null}
        <PeriodsChart
          periods={data.periods}
          series={whose === 'team' && teamSeries.length > 0 ? teamSeries : me.byPeriod}
          testID="my-ledger-periods-chart"
          accessibilityLabel={`${whose === 'team' ? 'Team average' : 'You'}, period by period`}
        />
        <Legend />
      </Section>

      <Section title="Hours against contract" lead={`In all ${hours(me.totals.hours)} worked of ${hours(me.totals.contractHours)} contracted (${signed(diff)}).`} testID="my-ledger-hours">
        <PairChart
          testID="my-ledger-hours-chart"
          accessibilityLabel={`Hours against contract: ${me.byPeriod.map((b) => `${periodLabel(data.periods.find((p) => p.rosterId === b.rosterId))} ${num(b.hours)} of ${num(b.contractHours)} h`).join('; ')}`}
          rows={me.byPeriod.map((b) => ({ label: periodLabel(data.periods.find((p) => p.rosterId === b.rosterId)), first: b.hours, second: b.contractHours }))}
          keys={HOURS_KEYS}
        />
      </Section>

      <Section
        title="Wishes"
        lead={
          wishes === 0
            ? 'You stated no wishes on these rosters.'
            : `${me.totals.wishesHonoured} of ${plural(wishes, 'wish', 'wishes')} kept.${team.rosterIds.length > 0 ? ` The team’s average: ${num(team.average.wishesHonoured)} of ${num(teamWishes)}.` : ''}`
        }
        testID="my-ledger-wishes"
      >
        {wishes > 0 ? (
          <>
            <PeriodsChart periods={data.periods} series={me.byPeriod} kinds={WISH_KINDS} testID="my-ledger-wishes-chart" accessibilityLabel={`Wishes kept and not, period by period`} />
            <Legend kinds={WISH_KINDS} />
          </>
        ) : null}
      </Section>

      <Section title="Every roster" testID="my-ledger-list">
        {data.periods.map((p) => {
          const mine = me.byPeriod.find((b) => b.rosterId === p.rosterId);
          const avg = team.byPeriod.find((t) => t.rosterId === p.rosterId)?.average ?? null;
          return (
            <View key={p.rosterId} style={styles.row} testID={`my-ledger-period-${p.rosterId}`}>
              <Body bold>{p.name}</Body>
              <Body muted>{`${day(p.start)} to ${day(p.end)}`}</Body>
              <Body>{mine ? `You: ${line(mine)}` : 'You: not on this roster.'}</Body>
              <Body muted>{avg ? `Team average: ${line(avg)}` : `Team average: not shown (fewer than ${minPeople} people counted).`}</Body>
            </View>
          );
        })}
      </Section>
    </View>
  );
}

const line = (c: LedgerCounts) =>
  `${plural(c.shifts, 'shift')} · ${num(c.nights)} nights · ${num(c.weekendShifts)} weekend · ${num(c.holidayShifts)} holiday · ${num(c.unpopularShifts)} unpopular · wishes ${num(c.wishesHonoured)} kept, ${num(c.wishesRefused)} not · ${hours(c.hours)} of ${hours(c.contractHours)} · ${num(c.swaps)} swaps`;

function NumbersTable({ mine, average, partial }: { mine: LedgerCounts; average: LedgerCounts | null; partial: boolean }) {
  return (
    <View role="table" aria-label="Your counts beside the team’s average" testID="my-ledger-table">
      <View role="row" style={[styles.tableRow, styles.tableHead]}>
        <Body bold style={styles.cellLabel} role="columnheader">
          Count
        </Body>
        <Body bold style={styles.cell} role="columnheader">
          You
        </Body>
        {average ? (
          <Body bold style={styles.cell} role="columnheader">
            {partial ? 'Team*' : 'Team'}
          </Body>
        ) : null}
      </View>
      {TABLE.map((t) => (
        <View key={t.key} role="row" style={styles.tableRow} testID={`my-ledger-total-${t.key}`}>
          <Body style={styles.cellLabel} role="rowheader">
            {t.label}
          </Body>
          <Body style={styles.cell} role="cell">
            {t.unit ? hours(mine[t.key]) : num(mine[t.key])}
          </Body>
          {average ? (
            <Body style={styles.cell} role="cell" muted>
              {t.unit ? hours(average[t.key]) : num(average[t.key])}
            </Body>
          ) : null}
        </View>
      ))}
      {average && partial ? <Body muted>* over the rosters with a team average; yours over all of them.</Body> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg, maxWidth: 860, width: '100%' },
  stack: { gap: space.lg },
  row: { paddingVertical: space.sm, borderBottomWidth: 1, borderBottomColor: colors.line, gap: 2 },
  tableRow: { flexDirection: 'row', paddingVertical: space.xs, borderBottomWidth: 1, borderBottomColor: colors.line },
  tableHead: { borderBottomColor: colors.inkSoft },
  cellLabel: { flex: 2 },
  cell: { flex: 1, textAlign: 'right' },
});
