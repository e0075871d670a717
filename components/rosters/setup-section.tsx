import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { colors, radius, space } from '@/constants/theme';
import { patternBody, updateShiftBody } from '@/shared/api/rosters';
import { useSkills } from '@/hooks/api/get-skills';
import { usePatterns } from '@/hooks/api/get-patterns';
import { usePreviewPattern, type PatternInput } from '@/hooks/api/preview-pattern';
import { useCreatePattern } from '@/hooks/api/create-pattern';
import { useDeletePattern } from '@/hooks/api/delete-pattern';
import { useShifts } from '@/hooks/api/get-shifts';
import { useUpdateShift } from '@/hooks/api/update-shift';
import type { RosterDto, ShiftDto } from '@/hooks/api/roster-types';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { DateField } from '@/components/ui/date-field';
import { TimeField } from '@/components/ui/time-field';
import { Body } from '@/components/ui/typography';
import { checkForm, fieldError, formError, type FieldErrors } from '@/components/forms/form-errors';
import { bodyResolver, messageFor } from '@/components/forms/schema-form';
import { useFormKit, withFormKit } from '@/components/forms/form-kit';
import { Choices, Loadable, Panel } from './panel';
import { dayWords, timeOf } from './format';

const WEEKDAYS = [
  { value: 'mon', label: 'Mon' },
  { value: 'tue', label: 'Tue' },
  { value: 'wed', label: 'Wed' },
  { value: 'thu', label: 'Thu' },
  { value: 'fri', label: 'Fri' },
  { value: 'sat', label: 'Sat' },
  { value: 'sun', label: 'Sun' },
] as const;
type Weekday = (typeof WEEKDAYS)[number]['value'];

/** Weekdays Monday first, whatever order they were saved in ("Mon Tue Sat"). */
export const weekdayWords = (days: string[]) =>
  WEEKDAYS.filter((w) => days.includes(w.value))
    .map((w) => w.label)
    .join(' ');

export function SetupSection({ roster }: { roster: RosterDto }) {
  return (
    <View style={styles.stack}>
      <PatternForm roster={roster} />
      <PatternList roster={roster} />
      <ShiftList roster={roster} />
    </View>
  );
}

function useSkillOptions() {
  const skills = useSkills();
  const options = [{ value: 'any', label: 'Anyone' }, ...(skills.data ?? []).map((s) => ({ value: String(s.id), label: s.name }))];
  const name = (id: number | null) => (id === null ? 'anyone' : (skills.data?.find((s) => s.id === id)?.name ?? `skill ${id}`));
  return { options, name, skills };
}

/** As typed: seat counts are text until the shared pattern schema reads them. */
interface PatternValues {
  label: string;
  weekdays: Weekday[];
  startTime: string;
  endTime: string;
  seats: Array<{ skill: string; count: string }>;
}
const toPattern = (v: PatternValues): PatternInput => ({ ...v, seats: v.seats.map((s) => ({ skillId: s.skill === 'any' ? null : Number(s.skill), count: Number(s.count) })) });
const patternResolver = bodyResolver(patternBody, toPattern);
const NEW_PATTERN: PatternValues = { label: '', weekdays: ['mon', 'tue', 'wed', 'thu', 'fri'], startTime: '07:00', endTime: '15:00', seats: [{ skill: 'any', count: '2' }] };

const PatternForm = withFormKit(function PatternForm({ roster }: { roster: RosterDto }) {
  const { Controller, useFieldArray, useForm } = useFormKit();
  const { options, name } = useSkillOptions();
  const preview = usePreviewPattern();
  const create = useCreatePattern();
  const form = useForm({ defaultValues: NEW_PATTERN, resolver: patternResolver });
  const seats = useFieldArray({ control: form.control, name: 'seats' });
  const frozen = roster.status === 'published';
  const names = ['label', 'weekdays', 'startTime', 'endTime', 'seats', 'count', 'skillId'];
  const error = create.error ?? preview.error;
  const messageOf = (field: string) => messageFor(form.formState.errors, error, field);
  const seatsError = form.formState.errors.seats?.message ?? form.formState.errors.seats?.root?.message ?? messageOf('seats');
  // The same check for both buttons: the parsed pattern or the messages on the fields.
  const showPreview = form.handleSubmit((pattern) => preview.mutate({ rosterId: roster.id, pattern }));
  const save = form.handleSubmit((pattern) => create.mutate({ rosterId: roster.id, pattern }, { onSuccess: () => { form.setValue('label', ''); preview.reset(); } }));
  // A published roster is frozen: the form would only lead to a refused save.
  if (frozen) return <Panel title="Add a shift pattern" testID="pattern-frozen"><Notice kind="info">The roster is published and frozen. Reopen it (Publish) to add or change shift patterns.</Notice></Panel>;
  return (
    <Panel title="Add a shift pattern" lead="A recurring shift: the weekdays it runs, its times, and how many seats of which skill. It makes dated shifts over the whole period.">
      <Controller control={form.control} name="label" render={({ field }) => <TextField label="Pattern label" value={field.value} onChangeText={field.onChange} onBlur={field.onBlur} placeholder="early, late, night…" error={messageOf('label')} testID="pattern-label" />} />
      <Body bold>Weekdays</Body>
      <Controller control={form.control} name="weekdays" render={({ field }) => <Choices label="Weekdays" multi options={[...WEEKDAYS]} value={field.value} onChange={field.onChange} testID="pattern-weekdays" />} />
      {messageOf('weekdays') ? <Notice>{messageOf('weekdays')!}</Notice> : null}
      <View style={styles.row}>
        <View style={styles.cell}>
          <Controller control={form.control} name="startTime" render={({ field }) => <TimeField label="Starts" value={field.value} onChange={field.onChange} error={messageOf('startTime')} testID="pattern-start" />} />
        </View>
        <View style={styles.cell}>
          <Controller control={form.control} name="endTime" render={({ field }) => <TimeField label="Ends (earlier = next day)" value={field.value} onChange={field.onChange} error={messageOf('endTime')} testID="pattern-end" />} />
        </View>
      </View>
      <Body bold>Seats by skill</Body>
      {seats.fields.map((s, i) => (
        <View key={s.id} style={styles.seatRow}>
          <View style={{ flex: 1, minWidth: 200 }}>
            <Controller control={form.control} name={`seats.${i}.skill`} render={({ field }) => <Choices label={`Skill for seat group ${i + 1}`} options={options} value={[field.value]} onChange={(v) => field.onChange(v[0])} />} />
          </View>
          <View style={{ width: 110 }}>
            <Controller
              control={form.control}
              name={`seats.${i}.count`}
              render={({ field }) => <TextField label={`How many (group ${i + 1})`} value={field.value} onChangeText={field.onChange} onBlur={field.onBlur} inputMode="numeric" error={form.formState.errors.seats?.[i]?.count?.message} />}
            />
          </View>
          {seats.fields.length > 1 ? <Button kind="quiet" label="Remove" onPress={() => seats.remove(i)} /> : null}
        </View>
      ))}
      {seatsError ? <Notice>{seatsError}</Notice> : null}
      <Button kind="quiet" label="Add seats with another skill" onPress={() => seats.append({ skill: 'any', count: '1' })} />
      {formError(error, names) ? <Notice>{formError(error, names)!}</Notice> : null}
      <View style={styles.row}>
        <Button kind="quiet" label="Preview shifts" onPress={() => void showPreview()} busy={preview.isPending} testID="pattern-preview" />
        <Button label="Save pattern" disabled={frozen} onPress={() => void save()} busy={create.isPending} testID="pattern-save" />
      </View>
      {preview.data ? (
        <View style={styles.preview} testID="pattern-preview-list" aria-label="Preview of generated shifts">
          <Body bold>{`${preview.data.length} shift${preview.data.length === 1 ? '' : 's'}, ${preview.data.reduce((n, s) => n + s.seats.length, 0)} seats over the period`}</Body>
          {preview.data.slice(0, 8).map((s, i) => (
            <Body key={i} muted>{`${dayWords(s.startsLocal)} ${timeOf(s.startsLocal)}–${timeOf(s.endsLocal)}${s.endsLocal.slice(0, 10) !== s.startsLocal.slice(0, 10) ? ' (next day)' : ''} · ${s.seats.map((x) => name(x.skillId)).join(', ')}`}</Body>
          ))}
          {preview.data.length > 8 ? <Body muted>{`… and ${preview.data.length - 8} more`}</Body> : null}
        </View>
      ) : null}
      {create.isSuccess ? <Notice kind="info">{`Pattern “${create.data.label}” saved; its shifts are in the list below.`}</Notice> : null}
    </Panel>
  );
});

function PatternList({ roster }: { roster: RosterDto }) {
  const patterns = usePatterns(roster.id);
  const remove = useDeletePattern();
  const { name } = useSkillOptions();
  return (
    <Panel title="Shift patterns">
      <Loadable query={patterns} label="Shift patterns">
        {(items) =>
          items.length === 0 ? (
            <Body muted>No patterns yet.</Body>
          ) : (
            <View style={{ gap: space.sm }}>
              {items.map((p) => (
                <View key={p.id} style={styles.line}>
                  <View style={{ flex: 1, minWidth: 200 }}>
                    <Body bold>{p.label}</Body>
                    <Body muted>{`${weekdayWords(p.weekdays)} · ${p.startTime}–${p.endTime} · ${p.seats.map((s) => `${s.count} × ${name(s.skillId)}`).join(', ')}`}</Body>
                  </View>
                  <Button kind="quiet" label={`Delete ${p.label}`} disabled={roster.status === 'published'} onPress={() => remove.mutate({ rosterId: roster.id, patternId: p.id })} busy={remove.isPending && remove.variables?.patternId === p.id} />
                </View>
              ))}
              {remove.error ? <Notice>{remove.error.message}</Notice> : null}
            </View>
          )
        }
      </Loadable>
    </Panel>
  );
}

function ShiftList({ roster }: { roster: RosterDto }) {
  const shifts = useShifts(roster.id);
  const [limit, setLimit] = useState(21);
  const [editing, setEditing] = useState<number | null>(null);
  const { name } = useSkillOptions();
  return (
    <Panel title="Shifts" lead="Every dated shift. Open one to change its times, label or seats.">
      <Loadable query={shifts} label="Shifts">
        {(items) =>
          items.length === 0 ? (
            <Notice kind="info">No shifts yet: add a shift pattern above.</Notice>
          ) : (
            <View style={{ gap: space.xs }} testID="shift-list">
              <Body muted>{`${items.length} shifts, ${items.reduce((n, s) => n + s.seats.length, 0)} seats`}</Body>
              {items.slice(0, limit).map((s) =>
                editing === s.id ? (
                  <ShiftEditor key={s.id} roster={roster} shift={s} onDone={() => setEditing(null)} />
                ) : (
                  <Pressable key={s.id} role="button" accessibilityLabel={`Edit the ${s.label} shift on ${dayWords(s.startsLocal)}`} onPress={() => setEditing(s.id)} style={styles.shift}>
                    <Body style={{ flex: 1 }}>{`${dayWords(s.startsLocal)} · ${s.label} · ${timeOf(s.startsLocal)}–${timeOf(s.endsLocal)}`}</Body>
                    <Body muted>{s.seats.map((x) => name(x.skillId)).join(', ')}</Body>
                  </Pressable>
                ),
              )}
              {items.length > limit ? <Button kind="quiet" label={`Show ${Math.min(42, items.length - limit)} more`} onPress={() => setLimit(limit + 42)} /> : null}
            </View>
          )
        }
      </Loadable>
    </Panel>
  );
}

function ShiftEditor({ roster, shift, onDone }: { roster: RosterDto; shift: ShiftDto; onDone: () => void }) {
  const update = useUpdateShift();
  const { options } = useSkillOptions();
  const [label, setLabel] = useState(shift.label);
  const [startsLocal, setStarts] = useState(shift.startsLocal);
  const [endsLocal, setEnds] = useState(shift.endsLocal);
  const [seats, setSeats] = useState(shift.seats.map((s) => (s.skillId === null ? 'any' : String(s.skillId))));
  const [errors, setErrors] = useState<FieldErrors>({});
  const save = () => {
    const checked = checkForm(updateShiftBody, { label, startsLocal, endsLocal, seats: seats.map((s) => ({ skillId: s === 'any' ? null : Number(s) })), version: shift.version });
    setErrors(checked.errors ?? {});
    if (checked.data) update.mutate({ rosterId: roster.id, shiftId: shift.id, changes: checked.data }, { onSuccess: onDone });
  };
  const names = ['label', 'startsLocal', 'endsLocal', 'seats'];
  return (
    <View style={styles.editor} testID={`shift-editor-${shift.id}`}>
      <TextField label="Shift label" value={label} onChangeText={setLabel} error={fieldError(errors, update.error, 'label')} />
      <View style={styles.row}>
        <View style={styles.cell}>
          <DateField label="Start day" value={startsLocal.slice(0, 10)} onChange={(d) => setStarts(`${d}T${startsLocal.slice(11, 16)}`)} minDate={roster.periodStart} maxDate={roster.periodEnd} testID={`shift-${shift.id}-start-day`} />
          <TimeField label="Start time" value={startsLocal.slice(11, 16)} onChange={(t) => setStarts(`${startsLocal.slice(0, 10)}T${t}`)} error={fieldError(errors, update.error, 'startsLocal')} testID={`shift-${shift.id}-start-time`} />
        </View>
        <View style={styles.cell}>
          <DateField label="End day" value={endsLocal.slice(0, 10)} onChange={(d) => setEnds(`${d}T${endsLocal.slice(11, 16)}`)} minDate={roster.periodStart} testID={`shift-${shift.id}-end-day`} />
          <TimeField label="End time" value={endsLocal.slice(11, 16)} onChange={(t) => setEnds(`${endsLocal.slice(0, 10)}T${t}`)} error={fieldError(errors, update.error, 'endsLocal')} testID={`shift-${shift.id}-end-time`} />
        </View>
      </View>
      {seats.map((s, i) => (
        <View key={i} style={styles.seatRow}>
          <View style={{ flex: 1, minWidth: 200 }}>
            <Choices label={`Seat ${i + 1} skill`} options={options} value={[s]} onChange={(v) => setSeats(seats.map((x, j) => (j === i ? v[0] : x)))} />
          </View>
          {seats.length > 1 ? <Button kind="quiet" label={`Remove seat ${i + 1}`} onPress={() => setSeats(seats.filter((_, j) => j !== i))} /> : null}
        </View>
      ))}
      <Button kind="quiet" label="Add a seat" onPress={() => setSeats([...seats, 'any'])} />
      {formError(update.error, names) ? <Notice>{formError(update.error, names)!}</Notice> : null}
      <View style={styles.row}>
        <Button label="Save shift" onPress={save} busy={update.isPending} disabled={roster.status === 'published'} />
        <Button kind="quiet" label="Cancel" onPress={onDone} />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  stack: { gap: space.lg },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md, alignItems: 'flex-end' },
  cell: { flex: 1, minWidth: 150 },
  seatRow: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md, alignItems: 'flex-end' },
  preview: { gap: 2, padding: space.md, borderRadius: radius.sm, backgroundColor: colors.loomSoft },
  line: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.md, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.sm },
  shift: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, paddingVertical: space.sm, minHeight: 44, alignItems: 'center', borderTopWidth: 1, borderTopColor: colors.line },
  editor: { gap: space.md, padding: space.md, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.thread, backgroundColor: colors.white },
});
