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

/** The smallest round step (1, 2, 2.5, 3, 4, 5, 6 or 8 × 10^k) at or above `raw`, whole numbers only (so counts get whole ticks). */
function niceStep(raw: number): number {
  if (raw <= 1) return 1;
  const magnitude = 10 ** Math.floor(Math.log10(raw));
  for (const m of magnitude >= 10 ? [1, 2, 2.5, 3, 4, 5, 6, 8, 10] : [1, 2, 3, 4, 5, 6, 8, 10]) if (m * magnitude >= raw) return m * magnitude;
  return 10 * magnitude;
}

/**
 * A top for the y axis that splits into SECTIONS round steps. `headroom` keeps the tallest bar
 * below the top by that share, so a value written on the bar stays inside the chart.
 */
export function axisTop(values: number[], headroom = 0): { maxValue: number; stepValue: number } {
  const step = niceStep((Math.max(0, ...values) * (1 + headroom)) / SECTIONS);
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
  const room = useChartWidth();
  // Room per row, shared by the two bars (2 px apart) and the gap to the next pair; the chart is as wide as its bars.
  const per = Math.min(110, (room - START) / Math.max(1, rows.length));
  const barWidth = Math.max(8, Math.min(28, Math.floor((per - 20) / 2)));
  const gap = Math.max(12, Math.min(44, per - 2 * barWidth - 2));
  const width = Math.min(room, START + rows.length * (2 * barWidth + 2 + gap));
  const labelRoom = 2 * barWidth + gap;
  const top = { fontFamily: fonts.body, fontSize: 10, color: colors.ink };
  const shown = (v: number) => String(Math.round(v * 10) / 10);
  const data = rows.flatMap((r) => [
    {
      value: r.first,
      label: r.label,
      frontColor: keys[0].color,
      spacing: 2,
      // The label's box starts at the first bar and spans the pair and the gap; moved back by half the gap it sits under both bars.
      labelWidth: labelRoom,
      labelTextStyle: { ...axis, fontSize: labelRoom < 60 ? 10 : 11, transform: [{ translateX: -(gap - 2) / 2 }] },
      topLabelComponent: () => <Body style={top}>{shown(r.first)}</Body>,
    },
    { value: r.second, frontColor: keys[1].color, spacing: gap, topLabelComponent: () => <Body style={top}>{shown(r.second)}</Body> },
  ]);
  return (
    <View testID={testID} accessibilityLabel={accessibilityLabel} style={{ gap: space.sm }}>
      <BarChart
        data={data}
        width={width}
        barWidth={barWidth}
        initialSpacing={START}
        noOfSections={SECTIONS}
        {...axisTop(rows.flatMap((r) => [r.first, r.second]), 0.1)}
        xAxisLabelTextStyle={axis}
        yAxisTextStyle={axis}
        yAxisColor={colors.line}
        xAxisColor={colors.line}
        rulesColor={colors.line}
        disableScroll={width < room}
        isAnimated={false}
      />
      <Legend kinds={keys as Kind[]} />
    </View>
  );
}

const START = 12;

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
  const room = useChartWidth();
  const width = Math.min(room, Math.max(200, START + series.length * 46 + 18));
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
        disableScroll={START + series.length * 46 < room}
        isAnimated={false}
      />
    </View>
  );
}
