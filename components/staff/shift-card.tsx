import { StyleSheet, View } from 'react-native';
import { colors, radius, space } from '@/constants/theme';
import type { MyShift } from '@/shared/api/staff';
import { Body } from '@/components/ui/typography';
import { dayLabel, hoursLabel, localDateOf, timeLabel } from './format';

/** One published shift: when (in the workspace's zone), which, and who else is on it. */
export function ShiftCard({ shift, timeZone }: { shift: MyShift; timeZone: string }) {
  const start = `${dayLabel(shift.startsAt, timeZone)}, ${timeLabel(shift.startsAt, timeZone)}`;
  const endsNextDay = localDateOf(shift.endsAt, timeZone) !== localDateOf(shift.startsAt, timeZone);
  const end = endsNextDay ? `${dayLabel(shift.endsAt, timeZone)} ${timeLabel(shift.endsAt, timeZone)}` : timeLabel(shift.endsAt, timeZone);
  const who = shift.coworkers.length ? `With ${shift.coworkers.join(', ')}` : 'No one else on this shift';
  return (
    <View style={[styles.card, shift.night && styles.night]} testID={`shift-${shift.seatId}`} accessibilityLabel={`${shift.label} shift, ${start} to ${end}. ${who}.`}>
      <View style={styles.top}>
        <Body bold style={styles.when}>{`${start} – ${end}`}</Body>
        <Body muted>{hoursLabel(shift.hours)}</Body>
      </View>
      <Body>{`${shift.label.charAt(0).toUpperCase()}${shift.label.slice(1)} shift · ${shift.rosterName}`}</Body>
      <Body muted>{who}</Body>
    </View>
  );
}

const styles = StyleSheet.create({
  card: { backgroundColor: colors.card, borderRadius: radius.md, padding: space.md, gap: 2, borderWidth: 1, borderColor: colors.line, borderLeftWidth: 4, borderLeftColor: colors.loom },
  night: { borderLeftColor: colors.ink },
  top: { flexDirection: 'row', justifyContent: 'space-between', gap: space.sm, flexWrap: 'wrap' },
  when: { flexShrink: 1 },
});
