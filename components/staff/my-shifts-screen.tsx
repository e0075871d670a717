import { useMemo, useState } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { MonthCalendar } from '@/components/ui/month-calendar';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { calendarTheme, colors, radius, space } from '@/constants/theme';
import { myShiftsQueryOptions } from '@/hooks/api/get-my-shifts';
import { useIsWide } from '@/hooks/use-is-wide';
import { useSession } from '@/hooks/api/get-session';
import type { MyShift } from '@/shared/api/staff';
import { WORKING_TIME_CAUTION } from '@/shared/caution';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body, Heading } from '@/components/ui/typography';
import { CalendarFeedSection } from './calendar-feed-section';
import { hoursLabel, localDateOf, plainLongDay } from './format';
import { OfflineNotice } from './offline-notice';
import { ShiftCard } from './shift-card';

const NEXT_SHOWN = 5;

/** A staff member's published shifts: the next ones first, a month calendar, and this week's hours. */
export function MyShiftsScreen() {
  const { data: session } = useSession();
  const wide = useIsWide();
  const [week, setWeek] = useState<string | undefined>(undefined);
  const [selected, setSelected] = useState<string | null>(null);
  const [showAll, setShowAll] = useState(false);
  const shifts = useQuery({ ...myShiftsQueryOptions(week), placeholderData: keepPreviousData });
  const zone = session?.workspace?.timeZone ?? shifts.data?.timeZone ?? 'UTC';

  const byDay = useMemo(() => {
    const map = new Map<string, MyShift[]>();
    for (const s of shifts.data?.shifts ?? []) {
      const day = localDateOf(s.startsAt, zone);
      map.set(day, [...(map.get(day) ?? []), s]);
    }
    return map;
  }, [shifts.data, zone]);

  if (shifts.isPending) return <ActivityIndicator color={colors.loom} accessibilityLabel="Loading your shifts" />;
  if (shifts.error) {
    return (
      <View style={styles.page}>
        <Heading>My shifts</Heading>
        <Notice>{shifts.error.message}</Notice>
        <Button kind="quiet" label="Try again" onPress={() => void shifts.refetch()} />
      </View>
    );
  }
  const data = shifts.data;
  const now = Date.now();
  const upcoming = data.shifts.filter((s) => Date.parse(s.endsAt) > now);
  const next = showAll ? upcoming : upcoming.slice(0, NEXT_SHOWN);
  const marked: Record<string, { marked?: boolean; dotColor?: string; selected?: boolean; selectedColor?: string }> = {};
  for (const day of byDay.keys()) marked[day] = { marked: true, dotColor: colors.thread };
  if (selected) marked[selected] = { ...(marked[selected] ?? {}), selected: true, selectedColor: colors.loom };
  const wk = data.week;
  const over = wk.contractedHours > 0 && wk.hours > wk.contractedHours;
  const share = wk.contractedHours > 0 ? Math.min(1, wk.hours / wk.contractedHours) : 0;
  const isThisWeek = week === undefined || (week >= wk.start && week <= wk.end && data.today >= wk.start && data.today <= wk.end);

  return (
    <View style={[styles.page, wide && styles.pageWide]}>
      <Heading>My shifts</Heading>
      <Body muted>{`${data.person.name} · times in ${zone}`}</Body>
      {data.savedAt ? <OfflineNotice savedAt={data.savedAt} timeZone={zone} /> : null}

      <View style={styles.card} testID="week-hours" accessibilityLabel={`${isThisWeek ? 'This week' : 'Week'}: ${wk.hours} hours of ${wk.contractedHours} contracted`}>
        <Body bold>{isThisWeek ? 'This week' : `Week of ${plainLongDay(wk.start)}`}</Body>
        <Heading level={2}>{`${hoursLabel(wk.hours)} of ${hoursLabel(wk.contractedHours)}`}</Heading>
        <View style={styles.bar} role="progressbar" aria-valuemin={0} aria-valuemax={wk.contractedHours} aria-valuenow={wk.hours}>
          <View style={[styles.barFill, { width: `${share * 100}%` }, over && styles.barOver]} />
        </View>
        <Body muted>{`${wk.shifts} shift${wk.shifts === 1 ? '' : 's'} from ${plainLongDay(wk.start)} to ${plainLongDay(wk.end)} against your contract.`}</Body>
        {over ? <Notice kind="caution">{`That is ${hoursLabel(wk.hours - wk.contractedHours)} over your contract. ${WORKING_TIME_CAUTION}`}</Notice> : null}
        {!isThisWeek ? <Button kind="quiet" label="Back to this week" onPress={() => { setWeek(undefined); setSelected(null); }} /> : null}
      </View>

      <View style={wide ? styles.columns : styles.stack}>
        <View style={[styles.section, wide && styles.column]} testID="next-shifts">
          <Heading level={2}>Next</Heading>
          {data.shifts.length === 0 ? (
            <Notice kind="info">No published shifts yet. When a coordinator publishes a roster with you on it, your shifts appear here and you get an e-mail.</Notice>
          ) : upcoming.length === 0 ? (
            <Notice kind="info">No upcoming shifts. Your earlier ones are on the month calendar.</Notice>
          ) : (
            next.map((s) => <ShiftCard key={s.seatId} shift={s} timeZone={zone} />)
          )}
          {upcoming.length > NEXT_SHOWN ? <Button kind="quiet" label={showAll ? 'Show fewer' : `Show all ${upcoming.length}`} onPress={() => setShowAll(!showAll)} /> : null}
        </View>

        <View style={[styles.section, wide && styles.column]}>
          <Heading level={2}>Month</Heading>
          <View style={styles.calendar} testID="shift-calendar">
            <MonthCalendar
              testID="month-calendar"
              firstDay={1}
              current={selected ?? upcoming[0]?.startsLocal.slice(0, 10) ?? data.today}
              markedDates={marked}
              onDayPress={(d: { dateString: string }) => {
                setSelected(d.dateString);
                setWeek(d.dateString);
              }}
              enableSwipeMonths
              theme={calendarTheme}
            />
          </View>
          {selected ? (
            <View style={styles.dayShifts} testID="day-shifts">
              <Body bold>{plainLongDay(selected)}</Body>
              {(byDay.get(selected) ?? []).length === 0 ? <Body muted>No shift on this day.</Body> : (byDay.get(selected) ?? []).map((s) => <ShiftCard key={s.seatId} shift={s} timeZone={zone} />)}
            </View>
          ) : (
            <Body muted>Tap a day to see its shifts and that week’s hours.</Body>
          )}
        </View>
      </View>

      <CalendarFeedSection />
    </View>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg, maxWidth: 760, width: '100%' },
  pageWide: { maxWidth: 1100 },
  stack: { gap: space.lg },
  columns: { flexDirection: 'row', gap: space.xl, alignItems: 'flex-start' },
  column: { flex: 1, minWidth: 0 },
  section: { gap: space.md },
  card: { backgroundColor: colors.card, borderRadius: radius.lg, padding: space.lg, gap: space.sm, borderWidth: 1, borderColor: colors.line },
  bar: { height: 10, borderRadius: 5, backgroundColor: colors.loomSoft, overflow: 'hidden' },
  barFill: { height: 10, borderRadius: 5, backgroundColor: colors.loom },
  barOver: { backgroundColor: colors.thread },
  calendar: { borderRadius: radius.lg, overflow: 'hidden', borderWidth: 1, borderColor: colors.line },
  dayShifts: { gap: space.sm },
});
