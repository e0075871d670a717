import { View, useWindowDimensions } from 'react-native';
import { BarChart } from '@/components/ui/bar-chart';
import { colors, fonts, space } from '@/constants/theme';
import type { LedgerAnswer, LedgerCounts, LedgerPeriod } from '@/shared/api/ledger';
import { Body } from '@/components/ui/typography';

export interface Kind {
  key: keyof LedgerCounts;
  label: string;
  color: string;
}

/** The kinds stacked in each bar, with their colours and words (the key under every chart). */
export const KINDS: Kind[] = [
  { key: 'nights', label: 'Nights', color: colors.loom },
  { key: 'weekendShifts', label: 'Weekend shifts', color: colors.thread },
  { key: 'holidayShifts', label: 'Public holidays', color: colors.danger },
  { key: 'unpopularShifts', label: 'Unpopular shifts', color: '#8C7A5B' },
];

/** Wishes kept and not, stacked the same way. */
export const WISH_KINDS: Kind[] = [
  { key: 'wishesHonoured', label: 'Wishes kept', color: colors.ok },
  { key: 'wishesRefused', label: 'Wishes not kept', color: colors.danger },
];

const axis = { color: colors.inkSoft, fontFamily: fonts.body, fontSize: 11 };
const SECTIONS = 4;

/** The chart width for the screen: the page column less its padding, never wider than 700. */
function useChartWidth() {
  const { width } = useWindowDimensions();
  return Math.min(700, width >= 1024 ? width - 420 : width - 110);
}

/** A top for the y axis that splits into SECTIONS whole steps, so small counts get whole-number ticks. */
export function axisTop(values: number[]): { maxValue: number; stepValue: number } {
  const step = Math.max(1, Math.ceil(Math.max(0, ...values) / SECTIONS));
  return { maxValue: step * SECTIONS, stepValue: step };
}

const shortName = (name: string) => name.split(' ')[0];

/** "2027-03-22" → "22/3": a period named by its first day on the x axis. */
export const periodLabel = (period: LedgerPeriod | undefined) => (period ? `${Number(period.start.slice(8, 10))}/${Number(period.start.slice(5, 7))}` : '');

export function Legend({ kinds = KINDS }: { kinds?: Kind[] }) {
  return (
    <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
      {kinds.map((k) => (
        <View key={k.label} style={{ flexDirection: 'row', alignItems: 'center', gap: space.xs }}>
          <View style={{ width: 12, height: 12, borderRadius: 3, backgroundColor: k.color }} />
          <Body muted>{k.label}</Body>
        </View>
      ))}
    </View>
  );
}

/** One stacked bar per person: nights, weekend, holiday and unpopular shifts across the range. */
export function PeopleChart({ ledger }: { ledger: LedgerAnswer }) {
  const width = useChartWidth();
  const rows = ledger.people.filter((p) => p.totals.shifts > 0);
  const barWidth = Math.max(14, Math.min(36, width / Math.max(1, rows.length) - 12));
  return (
    <View testID="ledger-people-chart" accessibilityLabel={`Per person: ${rows.map((p) => `${p.name} ${p.totals.nights} nights, ${p.totals.weekendShifts} weekend, ${p.totals.holidayShifts} holiday`).join('; ')}`}>
      <BarChart
        stackData={rows.map((p) => ({ label: shortName(p.name), stacks: KINDS.map((k) => ({ value: p.totals[k.key], color: k.color })) }))}
        width={width}
        barWidth={barWidth}
        spacing={10}
        noOfSections={SECTIONS}
        {...axisTop(rows.map((p) => KINDS.reduce((n, k) => n + p.totals[k.key], 0)))}
        xAxisLabelTextStyle={{ ...axis, width: barWidth + 10 }}
        yAxisTextStyle={axis}
        yAxisColor={colors.line}
        xAxisColor={colors.line}
        rulesColor={colors.line}
        disableScroll={rows.length * (barWidth + 10) < width}
        isAnimated={false}
      />
    </View>
  );
}

export interface PairRow {
  label: string;
  first: number;
  second: number;
}

/**
 * Two bars side by side for each row, with a key below: hours worked beside contracted hours,
 * your count beside the team's average. Values ride on the bars, so the figures read without the axis.
 */
export function PairChart({ rows, keys, testID, accessibilityLabel }: { rows: PairRow[]; keys: [Kind | { label: string; color: string }, Kind | { label: string; color: string }]; testID?: string; accessibilityLabel?: string }) {
  const width = useChartWidth();
  const barWidth = Math.max(10, Math.min(22, (width - 40) / Math.max(1, rows.length) / 2 - 10));
  const gap = Math.max(14, Math.min(36, (width - 40) / Math.max(1, rows.length) - 2 * barWidth - 2));
  const top = { fontFamily: fonts.body, fontSize: 10, color: colors.ink };
  const shown = (v: number) => String(Math.round(v * 10) / 10);
  const data = rows.flatMap((r) => [
    { value: r.first, label: r.label, frontColor: keys[0].color, spacing: 2, labelWidth: 2 * barWidth + gap, topLabelComponent: () => <Body style={top}>{shown(r.first)}</Body> },
    { value: r.second, frontColor: keys[1].color, spacing: gap, topLabelComponent: () => <Body style={top}>{shown(r.second)}</Body> },
  ]);
  return (
    <View testID={testID} accessibilityLabel={accessibilityLabel} style={{ gap: space.sm }}>
      <BarChart
        data={data}
        width={width}
        barWidth={barWidth}
        initialSpacing={12}
        noOfSections={SECTIONS}
        {...axisTop(rows.flatMap((r) => [r.first, r.second]))}
        xAxisLabelTextStyle={axis}
        yAxisTextStyle={axis}
        yAxisColor={colors.line}
        xAxisColor={colors.line}
        rulesColor={colors.line}
        disableScroll={rows.length * (2 * barWidth + gap + 2) < width}
        isAnimated={false}
      />
      <Legend kinds={keys as Kind[]} />
    </View>
  );
}

/** Hours worked beside contracted hours, per person. */
export function HoursChart({ ledger }: { ledger: LedgerAnswer }) {
  const rows = ledger.people.filter((p) => p.totals.shifts > 0 || p.totals.contractHours > 0);
  return (
    <PairChart
      testID="ledger-hours-chart"
      accessibilityLabel={`Hours against contract: ${rows.map((p) => `${p.name} ${p.totals.hours} of ${p.totals.contractHours} h`).join('; ')}`}
      rows={rows.map((p) => ({ label: shortName(p.name), first: p.totals.hours, second: p.totals.contractHours }))}
      keys={HOURS_KEYS}
    />
  );
}

export const HOURS_KEYS: [{ label: string; color: string }, { label: string; color: string }] = [
  { label: 'Hours worked', color: colors.loom },
  { label: 'Contracted hours', color: colors.line },
];

/** Counts period by period (each published roster a bar), stacked by kind. */
export function PeriodsChart({
  periods,
  series,
  kinds = KINDS,
  testID,
  accessibilityLabel,
}: {
  periods: LedgerPeriod[];
  series: Array<{ rosterId: number } & LedgerCounts>;
  kinds?: Kind[];
  testID?: string;
  accessibilityLabel?: string;
}) {
  const width = useChartWidth();
  const label = (rosterId: number) => periodLabel(periods.find((x) => x.rosterId === rosterId));
  return (
    <View testID={testID} accessibilityLabel={accessibilityLabel}>
      <BarChart
        stackData={series.map((c) => ({ label: label(c.rosterId), stacks: kinds.map((k) => ({ value: c[k.key], color: k.color })) }))}
        width={width}
        barWidth={28}
        spacing={18}
        noOfSections={SECTIONS}
        {...axisTop(series.map((c) => kinds.reduce((n, k) => n + c[k.key], 0)))}
        xAxisLabelTextStyle={{ ...axis, width: 46 }}
        yAxisTextStyle={axis}
        yAxisColor={colors.line}
        xAxisColor={colors.line}
        rulesColor={colors.line}
        disableScroll={series.length * 46 < width}
        isAnimated={false}
      />
    </View>
  );
}
