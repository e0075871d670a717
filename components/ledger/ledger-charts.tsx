import { View, useWindowDimensions } from 'react-native';
import { BarChart } from 'react-native-gifted-charts';
import { colors, fonts, space } from '@/constants/theme';
import type { LedgerAnswer, LedgerCounts } from '@/shared/api/ledger';
import { Body } from '@/components/ui/typography';

/** The kinds stacked in each bar, with their colours and words (the key under every chart). */
export const KINDS: Array<{ key: keyof LedgerCounts; label: string; color: string }> = [
  { key: 'nights', label: 'Nights', color: colors.loom },
  { key: 'weekendShifts', label: 'Weekend shifts', color: colors.thread },
  { key: 'holidayShifts', label: 'Public holidays', color: colors.danger },
  { key: 'unpopularShifts', label: 'Unpopular shifts', color: '#8C7A5B' },
];

const axis = { color: colors.inkSoft, fontFamily: fonts.body, fontSize: 11 };

/** The chart width for the screen: the page column less its padding, never wider than 700. */
function useChartWidth() {
  const { width } = useWindowDimensions();
  return Math.min(700, width >= 1024 ? width - 420 : width - 110);
}

const shortName = (name: string) => name.split(' ')[0];

export function Legend() {
  return (
    <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
      {KINDS.map((k) => (
        <View key={k.key} style={{ flexDirection: 'row', alignItems: 'center', gap: space.xs }}>
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
        noOfSections={4}
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

/** Hours worked beside contracted hours, per person. */
export function HoursChart({ ledger }: { ledger: LedgerAnswer }) {
  const width = useChartWidth();
  const rows = ledger.people.filter((p) => p.totals.shifts > 0 || p.totals.contractHours > 0);
  const data = rows.flatMap((p) => [
    { value: p.totals.hours, label: shortName(p.name), frontColor: colors.loom, spacing: 2, labelWidth: 50 },
    { value: p.totals.contractHours, frontColor: colors.line },
  ]);
  return (
    <View testID="ledger-hours-chart" accessibilityLabel={`Hours against contract: ${rows.map((p) => `${p.name} ${p.totals.hours} of ${p.totals.contractHours} h`).join('; ')}`}>
      <BarChart data={data} width={width} barWidth={12} spacing={24} noOfSections={4} xAxisLabelTextStyle={axis} yAxisTextStyle={axis} yAxisColor={colors.line} xAxisColor={colors.line} rulesColor={colors.line} isAnimated={false} />
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
        {[
          { label: 'Hours worked', color: colors.loom },
          { label: 'Contracted hours', color: colors.line },
        ].map((k) => (
          <View key={k.label} style={{ flexDirection: 'row', alignItems: 'center', gap: space.xs }}>
            <View style={{ width: 12, height: 12, borderRadius: 3, backgroundColor: k.color }} />
            <Body muted>{k.label}</Body>
          </View>
        ))}
      </View>
    </View>
  );
}

/** The team, or one person, period by period (each published roster a bar). */
export function PeriodsChart({ ledger, personId, testID }: { ledger: LedgerAnswer; personId: number | null; testID?: string }) {
  const width = useChartWidth();
  const person = personId === null ? null : ledger.people.find((p) => p.personId === personId);
  const series = person ? person.byPeriod : ledger.team.byPeriod;
  const label = (rosterId: number) => {
    const p = ledger.periods.find((x) => x.rosterId === rosterId);
    return p ? p.start.slice(5).replace('-', '/') : '';
  };
  return (
    <View testID={testID}>
      <BarChart
        stackData={series.map((c) => ({ label: label(c.rosterId), stacks: KINDS.map((k) => ({ value: c[k.key], color: k.color })) }))}
        width={width}
        barWidth={28}
        spacing={18}
        noOfSections={4}
        xAxisLabelTextStyle={{ ...axis, width: 46 }}
        yAxisTextStyle={axis}
        yAxisColor={colors.line}
        xAxisColor={colors.line}
        rulesColor={colors.line}
        isAnimated={false}
      />
    </View>
  );
}
