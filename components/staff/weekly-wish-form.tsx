import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { space } from '@/constants/theme';
import { useSetMyWeeklyWish } from '@/hooks/api/set-my-weekly-wish';
import { weeklyWishBody, type StaffWishKind } from '@/shared/api/staff';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Section } from '@/components/auth/section';
import { checkForm, type FieldErrors } from '@/components/auth/form-errors';
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

/** "I can't do Tuesdays": one wish on that weekday all through the period, replacing those days' wishes. */
export function WeeklyWishForm({ rosterId }: { rosterId: number }) {
  const weekly = useSetMyWeeklyWish();
  const [weekday, setWeekday] = useState<Weekday | null>(null);
  const [kind, setKind] = useState<StaffWishKind | null>(null);
  const [note, setNote] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [shown, setShown] = useState(false);
  const submit = () => {
    const checked = checkForm(weeklyWishBody, { weekday: weekday ?? undefined, kind: kind ?? undefined, note: note || null });
    setErrors(checked.errors ?? {});
    if (checked.data) weekly.mutate({ rosterId, ...checked.data }, { onSuccess: () => setNote('') });
  };
  const long = WEEKDAYS.find((d) => d.value === weekday)?.long;
  if (!shown) return <Button kind="quiet" label="Same wish every week…" onPress={() => setShown(true)} testID="weekly-open" />;
  return (
    <Section title="Every week" lead="Same wish on one weekday all through this roster, for example “I cannot do Tuesdays”. It replaces what you said about those days.">
      <ChoiceChips label="Weekday" choices={WEEKDAYS} value={weekday} onChange={setWeekday} testID="weekly-weekday" />
      {errors.weekday ? <Notice>Choose a weekday</Notice> : null}
      <ChoiceChips label="Wish for that weekday" choices={WISH_CHOICES} value={kind} onChange={setKind} testID="weekly-kind" />
      {errors.kind ? <Notice>{errors.kind}</Notice> : null}
      <TextField label="Note (optional)" value={note} onChangeText={setNote} maxLength={500} error={errors.note} testID="weekly-note" />
      {weekly.error ? <Notice>{weekly.error.message}</Notice> : null}
      {weekly.isSuccess ? <Notice kind="info">{`Saved: ${WISH_WORDS[weekly.variables.kind as StaffWishKind].label.toLowerCase()} on ${weekly.data.wishes.length} day${weekly.data.wishes.length === 1 ? '' : 's'}.`}</Notice> : null}
      <View style={styles.row}>
        <Button label={long && kind ? `${WISH_WORDS[kind].label} all ${long}` : 'Apply to every week'} onPress={submit} busy={weekly.isPending} testID="weekly-apply" />
        <Button kind="quiet" label="Close" onPress={() => setShown(false)} />
      </View>
    </Section>
  );
}

const styles = StyleSheet.create({ row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm } });
