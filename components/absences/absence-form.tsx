import { useMemo } from 'react';
import { StyleSheet, View } from 'react-native';
import type { Resolver } from 'react-hook-form';
import { space } from '@/constants/theme';
import { ABSENCE_KIND_WORDS, ABSENCE_KINDS, createAbsenceBody, requestAbsenceBody, updateAbsenceBody, type AbsenceDto, type AbsenceKindName } from '@/shared/api/absences';
import { ApiError } from '@/hooks/api/api-client';
import { useCreateAbsence } from '@/hooks/api/create-absence';
import { useUpdateAbsence } from '@/hooks/api/update-absence';
import { useRequestMyAbsence } from '@/hooks/api/request-my-absence';
import { Button } from '@/components/ui/button';
import { DateField } from '@/components/ui/date-field';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { TimeField } from '@/components/ui/time-field';
import { Body } from '@/components/ui/typography';
import { formError } from '@/components/forms/form-errors';
import { bodyResolver, messageFor } from '@/components/forms/schema-form';
import { useFormKit, withFormKit } from '@/components/forms/form-kit';
import { PersonPicker, type PickedPerson } from '@/components/pairings/person-picker';
import { Choices } from '@/components/rosters/panel';

interface Values {
  person: PickedPerson | null;
  kind: AbsenceKindName;
  startDate: string;
  endDate: string;
  partDay: boolean;
  startTime: string;
  endTime: string;
  creditHours: string;
  note: string;
}

const FIELDS = ['personId', 'kind', 'startDate', 'endDate', 'startTime', 'endTime', 'creditHours', 'note', 'version'];
const KIND_OPTIONS = ABSENCE_KINDS.map((k) => ({ value: k, label: ABSENCE_KIND_WORDS[k] }));

const fromAbsence = (a: AbsenceDto): Values => ({
  person: { id: a.personId, name: a.personName },
  kind: a.kind,
  startDate: a.startDate,
  endDate: a.endDate,
  partDay: Boolean(a.startTime || a.endTime),
  startTime: a.startTime ?? '',
  endTime: a.endTime ?? '',
  creditHours: a.creditHours === null ? '' : String(a.creditHours),
  note: a.note ?? '',
});

function toBody(v: Values) {
  const credit = v.creditHours.trim().replace(',', '.');
  return {
    kind: v.kind,
    startDate: v.startDate.trim(),
    endDate: v.endDate.trim() || v.startDate.trim(),
    // Part-day times only when asked for: a blank time is the whole day at that end.
    startTime: v.partDay && v.startTime.trim() ? v.startTime.trim() : null,
    endTime: v.partDay && v.endTime.trim() ? v.endTime.trim() : null,
    creditHours: credit === '' ? null : Number(credit),
    note: v.note.trim() === '' ? null : v.note.trim(),
  };
}

type Mode = 'coordinator' | 'staff';

/**
 * Form text → the body of the endpoint the form sends to, checked with that endpoint's shared
 * schema; a coordinator's new absence also needs a person picked.
 */
function absenceResolver(mode: Mode, absence: AbsenceDto | undefined): Resolver<Values> {
  if (mode === 'staff') return bodyResolver(requestAbsenceBody, toBody) as unknown as Resolver<Values>;
  const withPerson = (v: Values) => ({ ...toBody(v), personId: v.person?.id, ...(absence ? { version: absence.version } : {}) });
  if (absence) return bodyResolver(updateAbsenceBody, withPerson) as unknown as Resolver<Values>;
  const check = bodyResolver(createAbsenceBody, withPerson) as unknown as Resolver<Values>;
  return async (values, context, options) => {
    const result = await check(values, context, options);
    if (values.person) return result;
    return { values: {}, errors: { ...result.errors, personId: { type: 'required', message: 'Choose a person' } } } as unknown as Awaited<ReturnType<Resolver<Values>>>;
  };
}

/**
 * Add or change an absence. `mode` decides who it is for and which endpoint takes it:
 * a coordinator's new or edited absence (approved at once), or the person's own request.
 */
export const AbsenceForm = withFormKit(function AbsenceForm({
  mode,
  absence,
  person,
  onDone,
  onCancel,
}: {
  mode: 'coordinator' | 'staff';
  absence?: AbsenceDto;
  /** Fixed person (their own screen); otherwise a picker. */
  person?: PickedPerson;
  onDone?: (a: AbsenceDto) => void;
  onCancel?: () => void;
}) {
  const { useForm, useWatch } = useFormKit();
  const create = useCreateAbsence();
  const update = useUpdateAbsence();
  const request = useRequestMyAbsence();
  const resolver = useMemo(() => absenceResolver(mode, absence), [mode, absence]);
  const form = useForm<Values>({
    defaultValues: absence ? fromAbsence(absence) : { person: person ?? null, kind: 'annual', startDate: '', endDate: '', partDay: false, startTime: '', endTime: '', creditHours: '', note: '' },
    resolver,
  });
  // The fields are controlled by the form's values, read as they change.
  const values = useWatch({ control: form.control }) as Values;
  const set = (patch: Partial<Values>) => {
    for (const [k, v] of Object.entries(patch)) form.setValue(k as keyof Values, v as never, { shouldDirty: true });
  };
  const errors = form.formState.errors;
  const mutation = mode === 'staff' ? request : absence ? update : create;
  const error = mutation.error;
  const fieldError = (name: string) => messageFor(errors, error, name);

  // The parsed body comes from the resolver, so it is already the endpoint's shape.
  const submit = form.handleSubmit((body) => {
    const parsed = body as unknown as ReturnType<typeof createAbsenceBody.parse>;
    if (mode === 'staff') {
      request.mutate(parsed as ReturnType<typeof requestAbsenceBody.parse>, { onSuccess: (a) => { set({ startDate: '', endDate: '', note: '' }); onDone?.(a); } });
    } else if (absence) {
      update.mutate({ id: absence.id, ...(parsed as unknown as ReturnType<typeof updateAbsenceBody.parse>) }, { onSuccess: (a) => onDone?.(a) });
    } else {
      create.mutate(parsed, { onSuccess: (a) => { set({ startDate: '', endDate: '', note: '', creditHours: '' }); onDone?.(a); } });
    }
  });
  const conflict = error instanceof ApiError && error.status === 409;
  const prefix = mode === 'staff' ? 'my-absence' : 'absence';

  return (
    <View style={styles.form} testID={`${prefix}-form`}>
      {mode === 'coordinator' && !person ? (
        <PersonPicker label="Person" value={values.person} onChange={(p) => set({ person: p })} error={fieldError('personId')} testID={`${prefix}-person`} />
      ) : null}
      <Body bold>Kind</Body>
      <Choices label="Kind of absence" options={KIND_OPTIONS} value={[values.kind]} onChange={(v) => set({ kind: v[0] })} testID={`${prefix}-kind`} />
      <View style={styles.row}>
        <DateField label="First day" value={values.startDate} onChange={(startDate) => set({ startDate, endDate: values.endDate || startDate })} error={fieldError('startDate')} testID={`${prefix}-start`} />
        <DateField label="Last day" value={values.endDate} onChange={(endDate) => set({ endDate })} minDate={/^\d{4}-\d{2}-\d{2}$/.test(values.startDate) ? values.startDate : undefined} error={fieldError('endDate')} testID={`${prefix}-end`} />
      </View>
      <Choices
        label="How much of the day"
        options={[{ value: 'whole', label: 'Whole days' }, { value: 'part', label: 'Part of a day' }]}
        value={[values.partDay ? 'part' : 'whole']}
        onChange={(v) => set({ partDay: v[0] === 'part' })}
        testID={`${prefix}-part`}
      />
      {values.partDay ? (
        <View style={styles.row}>
          <View style={styles.cell}>
            <TimeField label="From (on the first day)" value={values.startTime} onChange={(startTime) => set({ startTime })} error={fieldError('startTime')} testID={`${prefix}-start-time`} />
          </View>
          <View style={styles.cell}>
            <TimeField label="Until (on the last day)" value={values.endTime} onChange={(endTime) => set({ endTime })} error={fieldError('endTime')} testID={`${prefix}-end-time`} />
          </View>
        </View>
      ) : null}
      {mode === 'coordinator' ? (
        <View style={styles.cell}>
          <TextField
            label="Hours it credits (blank = the default for its kind)"
            value={values.creditHours}
            onChangeText={(creditHours) => set({ creditHours })}
            inputMode="decimal"
            placeholder="default"
            error={fieldError('creditHours')}
            testID={`${prefix}-credit`}
          />
        </View>
      ) : null}
      <TextField label="Note (optional)" value={values.note} onChangeText={(note) => set({ note })} maxLength={500} error={fieldError('note')} testID={`${prefix}-note`} />
      {conflict ? <Notice kind="caution">{`${error.message} Close the form and open it again to see their change; your values are still here.`}</Notice> : formError(error, FIELDS) ? <Notice>{formError(error, FIELDS)!}</Notice> : null}
      <View style={styles.row}>
        <Button label={mode === 'staff' ? 'Send request' : absence ? 'Save absence' : 'Add absence'} onPress={() => void submit()} busy={mutation.isPending} testID={`${prefix}-save`} />
        {onCancel ? <Button kind="quiet" label="Cancel" onPress={onCancel} /> : null}
      </View>
    </View>
  );
});

const styles = StyleSheet.create({
  form: { gap: space.md },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md, alignItems: 'flex-start' },
  cell: { flex: 1, minWidth: 200 },
});
