import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { space } from '@/constants/theme';
import { useSetMyWeeklyWish } from '@/hooks/api/set-my-weekly-wish';
import { weeklyWishBody, type StaffWishKind } from '@/shared/api/staff';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Section } from '@/components/auth/section';
import { checkForm, type FieldErrors } from '@/components/forms/form-errors';
import { ChoiceChips } from './choice-chips';
import { WISH_CHOICES, WISH_WORDS } from './wish-kinds';

const WEEKDAYS = [
  { value: 'mon', label: 'Mon', long: 'Mondays' },
  { value: 'tue', label: 'Tue', long: 'Tuesdays' },
  { value: 'wed', label: 'Wed', long: 'Wednesdays' },
  { value: 'thu', label: 'Thu', long: 'Thursdays' },
  { value: 'fri', label: 'Fri', long: 'Fridays' },
  { value: 'sat', label: 'Sat', long: 'Saturdays' },
  { value: 'sun', label: 'Sun', long: 'Sundays' },
] as const;
type Weekday = (typeof WEEKDAYS)[number]['value'];

const WHOLE_DAY = '__day';
const isoOf = (day: string) => ((new Date(`${day}T12:00:00Z`).getUTCDay() + 6) % 7) + 1;

/**
 * "I can't do Tuesdays" or "avoid Sunday nights": one wish on that weekday, or on that kind of
 * shift on that weekday, all through the period, replacing what was said about those days or shifts.
 */
export function WeeklyWishForm({ rosterId, shifts }: { rosterId: number; shifts: Array<{ label: string; startsLocal: string }> }) {
  const weekly = useSetMyWeeklyWish();
  const [weekday, setWeekday] = useState<Weekday | null>(null);
  const [kindOfShift, setKindOfShift] = useState<string>(WHOLE_DAY);
  const [kind, setKind] = useState<StaffWishKind | null>(null);
  const [note, setNote] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [shown, setShown] = useState(false);
  const submit = () => {
    const checked = checkForm(weeklyWishBody, { weekday: weekday ?? undefined, shiftLabel: kindOfShift === WHOLE_DAY ? null : kindOfShift, kind: kind ?? undefined, note: note || null });
    setErrors(checked.errors ?? {});
    if (checked.data) weekly.mutate({ rosterId, ...checked.data }, { onSuccess: () => setNote('') });
  };
  const long = WEEKDAYS.find((d) => d.value === weekday)?.long;
  // The kinds of shift that run on the chosen weekday (their labels), in the order they start.
  const iso = weekday ? WEEKDAYS.findIndex((d) => d.value === weekday) + 1 : null;
  const labels = [...new Set([...shifts].filter((s) => iso !== null && isoOf(s.startsLocal.slice(0, 10)) === iso).sort((a, b) => a.startsLocal.slice(11).localeCompare(b.startsLocal.slice(11))).map((s) => s.label))];
  const shiftChoices = [{ value: WHOLE_DAY, label: 'The whole day' }, ...labels.map((l) => ({ value: l, label: `${l} shifts` }))];
  const what = long ? (kindOfShift === WHOLE_DAY ? `all ${long}` : `${kindOfShift} shifts on ${long}`) : '';
  if (!shown) return <Button kind="quiet" label="Same wish every week…" onPress={() => setShown(true)} testID="weekly-open" />;
  return (
    <Section title="Every week" lead="Same wish on one weekday all through this roster, for example “I cannot do Tuesdays”, or on one kind of shift that day, like “avoid Sunday nights”. It replaces what you said about those days or shifts.">
      <ChoiceChips label="Weekday" choices={WEEKDAYS} value={weekday} onChange={(d) => { setWeekday(d); setKindOfShift(WHOLE_DAY); }} testID="weekly-weekday" />
      {errors.weekday ? <Notice>Choose a weekday</Notice> : null}
      {weekday && labels.length ? <ChoiceChips label="Which shifts" choices={shiftChoices} value={kindOfShift} onChange={setKindOfShift} testID="weekly-shift-kind" /> : null}
      {errors.shiftLabel ? <Notice>{errors.shiftLabel}</Notice> : null}
      <ChoiceChips label="Wish for that weekday" choices={WISH_CHOICES} value={kind} onChange={setKind} testID="weekly-kind" />
      {errors.kind ? <Notice>{errors.kind}</Notice> : null}
      <TextField label="Note (optional)" value={note} onChangeText={setNote} maxLength={500} error={errors.note} testID="weekly-note" />
      {weekly.error ? <Notice>{weekly.error.message}</Notice> : null}
      {weekly.isSuccess ? <Notice kind="info">{`Saved: ${WISH_WORDS[weekly.variables.kind as StaffWishKind].label.toLowerCase()} on ${weekly.data.wishes.length} ${weekly.variables.shiftLabel ? `${weekly.variables.shiftLabel} shift` : 'day'}${weekly.data.wishes.length === 1 ? '' : 's'}.`}</Notice> : null}
      <View style={styles.row}>
        <Button label={long && kind ? `${WISH_WORDS[kind].label} ${what}` : 'Apply to every week'} onPress={submit} busy={weekly.isPending} testID="weekly-apply" />
        <Button kind="quiet" label="Close" onPress={() => setShown(false)} />
      </View>
    </Section>
  );
}

const styles = StyleSheet.create({ row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm } });
