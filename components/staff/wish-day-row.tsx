import { useEffect, useState } from 'react';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';
import { useSetMyWish } from '@/hooks/api/set-my-wish';
import { useDeleteMyWish } from '@/hooks/api/delete-my-wish';
import { myWishBody, type MyWish, type StaffWishKind } from '@/shared/api/staff';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body } from '@/components/ui/typography';
import { checkForm, type FieldErrors } from '@/components/forms/form-errors';
import { ApiError } from '@/hooks/api/api-client';
import { ChoiceChips } from './choice-chips';
import { plainDay, plainLongDay } from './format';
import { WISH_CHOICES, WISH_WORDS } from './wish-kinds';

interface ShiftTime {
  id: number;
  label: string;
  startsLocal: string;
  endsLocal: string;
}

/** One day of the period: its wish at a glance; tapped, an editor for the day or one of its shifts. */
export function WishDayRow(props: {
  rosterId: number;
  date: string;
  wish: MyWish | null;
  shifts: ShiftTime[];
  shiftWishes: Map<number, MyWish>;
  readOnly: boolean;
  open: boolean;
  onToggle: () => void;
}) {
  const { date, wish, shifts, shiftWishes, readOnly, open } = props;
  const ownShiftWishes = shifts.flatMap((s) => (shiftWishes.has(s.id) ? [{ shift: s, wish: shiftWishes.get(s.id)! }] : []));
  const summary = [wish ? WISH_WORDS[wish.kind].label : null, ...ownShiftWishes.map((x) => `${WISH_WORDS[x.wish.kind].label} ${x.shift.label}`)].filter(Boolean).join(' · ');
  return (
    <View style={[styles.row, open && styles.rowOpen]}>
      <Pressable
        role="button"
        aria-expanded={open}
        accessibilityLabel={`${plainLongDay(date)}: ${summary || 'no wish'}${readOnly ? '' : '. Tap to change'}`}
        onPress={props.onToggle}
        style={styles.head}
        testID={`wish-day-${date}`}
      >
        <Text style={styles.day}>{plainDay(date)}</Text>
        <View style={styles.badges}>
          {wish ? <Badge kind={wish.kind} text={WISH_WORDS[wish.kind].label} /> : null}
          {ownShiftWishes.map((x) => (
            <Badge key={x.shift.id} kind={x.wish.kind} text={`${WISH_WORDS[x.wish.kind].label}: ${x.shift.label}`} />
          ))}
          {!summary ? <Text style={styles.none}>{readOnly ? '—' : 'no wish'}</Text> : null}
        </View>
      </Pressable>
      {wish?.note && !open ? <Body muted style={styles.note}>{`“${wish.note}”`}</Body> : null}
      {open ? readOnly ? <ReadOnlyDetail wish={wish} shiftWishes={ownShiftWishes} /> : <DayEditor {...props} /> : null}
    </View>
  );
}

function Badge({ kind, text }: { kind: StaffWishKind; text: string }) {
  return (
    <View style={[styles.badge, { backgroundColor: WISH_WORDS[kind].soft, borderColor: WISH_WORDS[kind].tone }]}>
      <Text style={[styles.badgeText, { color: WISH_WORDS[kind].tone }]}>{text}</Text>
    </View>
  );
}

function ReadOnlyDetail({ wish, shiftWishes }: { wish: MyWish | null; shiftWishes: Array<{ shift: ShiftTime; wish: MyWish }> }) {
  return (
    <View style={styles.editor}>
      {!wish && shiftWishes.length === 0 ? <Body muted>You stated no wish for this day.</Body> : null}
      {wish ? <Body>{`Whole day: ${WISH_WORDS[wish.kind].label}${wish.note ? ` — “${wish.note}”` : ''}`}</Body> : null}
      {shiftWishes.map((x) => (
        <Body key={x.shift.id}>{`${x.shift.label} ${x.shift.startsLocal.slice(11)}–${x.shift.endsLocal.slice(11)}: ${WISH_WORDS[x.wish.kind].label}${x.wish.note ? ` — “${x.wish.note}”` : ''}`}</Body>
      ))}
    </View>
  );
}

function DayEditor({ rosterId, date, wish, shifts, shiftWishes, onToggle }: Parameters<typeof WishDayRow>[0]) {
  const set = useSetMyWish();
  const del = useDeleteMyWish();
  // "day" or a shift id: what this wish is about.
  const [target, setTarget] = useState<string>('day');
  const current = target === 'day' ? wish : (shiftWishes.get(Number(target)) ?? null);
  const [kind, setKind] = useState<StaffWishKind | null>(current?.kind ?? null);
  const [note, setNote] = useState(current?.note ?? '');
  const [errors, setErrors] = useState<FieldErrors>({});
  useEffect(() => {
    setKind(current?.kind ?? null);
    setNote(current?.note ?? '');
    setErrors({});
  }, [target]); // eslint-disable-line react-hooks/exhaustive-deps

  const save = () => {
    const values = target === 'day' ? { date, kind: kind ?? undefined, note: note || null } : { shiftId: Number(target), kind: kind ?? undefined, note: note || null };
    const checked = checkForm(myWishBody, values);
    setErrors(checked.errors ?? {});
    if (checked.data) set.mutate({ rosterId, ...checked.data }, { onSuccess: onToggle });
  };
  const error = set.error ?? del.error;
  return (
    <View style={styles.editor} testID={`wish-editor-${date}`}>
      {shifts.length > 0 ? (
        <ChoiceChips
          label="About"
          choices={[{ value: 'day', label: 'Whole day' }, ...shifts.map((s) => ({ value: String(s.id), label: `${s.label} ${s.startsLocal.slice(11)}` }))]}
          value={target}
          onChange={setTarget}
        />
      ) : null}
      <ChoiceChips label="Your wish" choices={WISH_CHOICES} value={kind} onChange={setKind} testID={`wish-kind-${date}`} />
      {kind ? <Body muted>{WISH_WORDS[kind].hint}</Body> : null}
      {errors.kind ? <Notice>{errors.kind}</Notice> : null}
      <TextField label="Note for your coordinator (optional)" value={note} onChangeText={setNote} maxLength={500} error={errors.note ?? (set.error instanceof ApiError ? set.error.fieldMessage('note') : undefined)} testID={`wish-note-${date}`} />
      {/* The server's own words (over the cannot limit, past the deadline…): nothing was saved. */}
      {error ? <Notice>{error.message}</Notice> : null}
      <View style={styles.actions}>
        <Button label="Save" onPress={save} busy={set.isPending} disabled={!kind} testID={`wish-save-${date}`} />
        {current ? <Button kind="quiet" label="Clear" onPress={() => del.mutate({ rosterId, wishId: current.id }, { onSuccess: onToggle })} busy={del.isPending} /> : null}
        <Button kind="quiet" label="Close" onPress={onToggle} />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  row: { borderTopWidth: 1, borderTopColor: colors.line, paddingVertical: space.xs },
  rowOpen: { backgroundColor: colors.paper, borderRadius: radius.sm },
  head: { flexDirection: 'row', alignItems: 'center', minHeight: 44, gap: space.md, paddingHorizontal: space.xs },
  day: { fontFamily: fonts.bodyBold, fontSize: 16, color: colors.ink, width: 96 },
  badges: { flex: 1, flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  badge: { borderRadius: radius.sm, borderWidth: 1, paddingHorizontal: space.sm, paddingVertical: 2 },
  badgeText: { fontFamily: fonts.bodyBold, fontSize: 13 },
  none: { fontFamily: fonts.body, color: colors.inkSoft, fontSize: 14 },
  note: { paddingHorizontal: space.xs, fontSize: 14 },
  editor: { gap: space.sm, padding: space.sm },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
});
