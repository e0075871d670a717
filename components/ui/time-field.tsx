import { useState } from 'react';
import { Pressable, ScrollView, StyleSheet, Text, TextInput, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';
import { fieldStyles as styles } from './date-field';

const TIME = /^([01]\d|2[0-3]):([0-5]\d)$/;
const pad = (n: number) => String(n).padStart(2, '0');

interface TimeFieldProps {
  label: string;
  /** HH:mm, or whatever the person has typed so far. */
  value: string;
  onChange: (value: string) => void;
  error?: string;
  /** Minutes between the offered times (typed times may be any minute). */
  step?: 15 | 30 | 60;
  disabled?: boolean;
  testID?: string;
}

/**
 * A time input: typed HH:mm is accepted as is, and a list of times (every `step` minutes)
 * opens beside it, with the current hour in view, for thumbs on a phone.
 */
export function TimeField({ label, value, onChange, error, step = 30, disabled, testID }: TimeFieldProps) {
  const [open, setOpen] = useState(false);
  const times: string[] = [];
  for (let m = 0; m < 24 * 60; m += step) times.push(`${pad(Math.floor(m / 60))}:${pad(m % 60)}`);
  const hour = TIME.test(value) ? Number(value.slice(0, 2)) : 7;
  return (
    <View style={styles.field}>
      <Text style={styles.label}>{label}</Text>
      <View style={styles.row}>
        <TextInput
          accessibilityLabel={`${label} (HH:mm)`}
          aria-invalid={Boolean(error)}
          value={value}
          onChangeText={onChange}
          placeholder="HH:mm"
          placeholderTextColor={colors.inkSoft}
          inputMode="numeric"
          editable={!disabled}
          style={[styles.input, error ? styles.inputError : null]}
          testID={testID}
        />
        <Pressable
          role="button"
          accessibilityLabel={open ? `Close the times for ${label}` : `Pick ${label} from a list of times`}
          aria-expanded={open}
          disabled={disabled}
          onPress={() => setOpen(!open)}
          style={[styles.toggle, open && styles.toggleOn, disabled && { opacity: 0.5 }]}
          testID={testID ? `${testID}-times-toggle` : undefined}
        >
          <Text style={[styles.toggleText, open && { color: colors.white }]}>{open ? 'Close' : 'Times'}</Text>
        </Pressable>
      </View>
      {open ? (
        <ScrollView
          style={own.list}
          contentContainerStyle={own.listInner}
          role="list"
          aria-label={`Times for ${label}`}
          testID={testID ? `${testID}-times` : undefined}
        >
          {/* Hours as rows so a whole day fits in a few lines; the row of the current hour comes first in view. */}
          {Array.from({ length: 24 }, (_, h) => (h + Math.max(0, hour - 1)) % 24).map((h) => (
            <View key={h} style={own.hourRow}>
              {times
                .filter((t) => Number(t.slice(0, 2)) === h)
                .map((t) => (
                  <Pressable
                    key={t}
                    role="button"
                    aria-pressed={t === value}
                    accessibilityLabel={t}
                    onPress={() => {
                      onChange(t);
                      setOpen(false);
                    }}
                    style={[own.time, t === value && own.timeOn]}
                  >
                    <Text style={[own.timeText, t === value && { color: colors.white }]}>{t}</Text>
                  </Pressable>
                ))}
            </View>
          ))}
        </ScrollView>
      ) : null}
      {error ? (
        <Text role="alert" style={styles.error}>
          {error}
        </Text>
      ) : null}
    </View>
  );
}

const own = StyleSheet.create({
  list: { maxHeight: 220, borderWidth: 1, borderColor: colors.line, borderRadius: radius.sm, backgroundColor: colors.card },
  listInner: { padding: space.xs, gap: space.xs },
  hourRow: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  time: { minHeight: 40, minWidth: 64, paddingHorizontal: space.sm, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.line, alignItems: 'center', justifyContent: 'center', backgroundColor: colors.white },
  timeOn: { backgroundColor: colors.loom, borderColor: colors.loom },
  timeText: { fontFamily: fonts.body, fontSize: 15, color: colors.ink },
});
