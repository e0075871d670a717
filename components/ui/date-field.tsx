import { useState } from 'react';
import { Pressable, StyleSheet, Text, TextInput, View } from 'react-native';
import { MonthCalendar } from '@/components/ui/month-calendar';
import { calendarTheme, colors, fonts, radius, space } from '@/constants/theme';

const ISO_DATE = /^\d{4}-\d{2}-\d{2}$/;

interface DateFieldProps {
  label: string;
  /** YYYY-MM-DD, or whatever the person has typed so far. */
  value: string;
  onChange: (value: string) => void;
  error?: string;
  /** Bounds of the month view (YYYY-MM-DD); typed dates outside them are left to the form's schema. */
  minDate?: string;
  maxDate?: string;
  disabled?: boolean;
  testID?: string;
}

/**
 * A date input that takes typed ISO dates and also opens a month view (react-native-calendars).
 * The typed text is the value: the calendar only writes YYYY-MM-DD into it, so a half-typed
 * date is never thrown away and the form's zod schema gives the message.
 */
export function DateField({ label, value, onChange, error, minDate, maxDate, disabled, testID }: DateFieldProps) {
  const [open, setOpen] = useState(false);
  const valid = ISO_DATE.test(value);
  return (
    <View style={styles.field}>
      <Text style={styles.label}>{label}</Text>
      <View style={styles.row}>
        <TextInput
          accessibilityLabel={`${label} (YYYY-MM-DD)`}
          aria-invalid={Boolean(error)}
          value={value}
          onChangeText={onChange}
          placeholder="YYYY-MM-DD"
          placeholderTextColor={colors.inkSoft}
          inputMode="numeric"
          editable={!disabled}
          style={[styles.input, error ? styles.inputError : null]}
          testID={testID}
        />
        <Pressable
          role="button"
          accessibilityLabel={open ? `Close the calendar for ${label}` : `Pick ${label} from a calendar`}
          aria-expanded={open}
          disabled={disabled}
          onPress={() => setOpen(!open)}
          style={[styles.toggle, open && styles.toggleOn, disabled && { opacity: 0.5 }]}
          testID={testID ? `${testID}-calendar-toggle` : undefined}
        >
          <Text style={[styles.toggleText, open && { color: colors.white }]}>{open ? 'Close' : 'Calendar'}</Text>
        </Pressable>
      </View>
      {open ? (
        <View style={styles.calendar} testID={testID ? `${testID}-calendar` : undefined}>
          <MonthCalendar
            firstDay={1}
            current={valid ? value : (minDate ?? undefined)}
            minDate={minDate}
            maxDate={maxDate}
            enableSwipeMonths
            markedDates={valid ? { [value]: { selected: true, selectedColor: colors.loom } } : {}}
            onDayPress={(d: { dateString: string }) => {
              onChange(d.dateString);
              setOpen(false);
            }}
            theme={calendarTheme}
          />
        </View>
      ) : null}
      {error ? (
        <Text role="alert" style={styles.error}>
          {error}
        </Text>
      ) : null}
    </View>
  );
}

export const fieldStyles = StyleSheet.create({
  field: { gap: space.xs },
  label: { fontFamily: fonts.bodyBold, color: colors.ink, fontSize: 15 },
  row: { flexDirection: 'row', gap: space.xs, alignItems: 'stretch' },
  input: {
    flex: 1,
    minWidth: 0,
    minHeight: 48,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radius.sm,
    paddingHorizontal: space.md,
    backgroundColor: colors.white,
    fontFamily: fonts.body,
    fontSize: 16,
    color: colors.ink,
  },
  inputError: { borderColor: colors.danger },
  toggle: { minHeight: 48, minWidth: 48, paddingHorizontal: space.md, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.loom, alignItems: 'center', justifyContent: 'center', backgroundColor: colors.white },
  toggleOn: { backgroundColor: colors.loom },
  toggleText: { fontFamily: fonts.bodyBold, color: colors.loom, fontSize: 14 },
  calendar: { borderWidth: 1, borderColor: colors.line, borderRadius: radius.sm, overflow: 'hidden', maxWidth: 380 },
  error: { color: colors.danger, fontFamily: fonts.body, fontSize: 14 },
});
const styles = fieldStyles;
