import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, radius, space } from '@/constants/theme';
import { WORKING_TIME_CAUTION } from '@/shared/caution';
import { TERM_KINDS, termSchema, localDateSchema, type Term, type TermKind, type Weekday } from '@/shared/roster/schema';
import { ApiError } from '@/hooks/api/api-client';
import { useTerms, type TermDto } from '@/hooks/api/get-terms';
import { useCreateTerm } from '@/hooks/api/create-term';
import { useUpdateTerm } from '@/hooks/api/update-term';
import { useDeleteTerm } from '@/hooks/api/delete-term';
import { useRosters } from '@/hooks/api/get-rosters';
import { useQuery } from '@tanstack/react-query';
import { patternsQueryOptions } from '@/hooks/api/get-patterns';
import { Button } from '@/components/ui/button';
import { DateField } from '@/components/ui/date-field';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { TimeField } from '@/components/ui/time-field';
import { Body } from '@/components/ui/typography';
import { Section } from '@/components/auth/section';
import { Choices, Loadable } from '@/components/rosters/panel';
import { Chip } from './inline-controls';

/** The kinds as a coordinator picks them; the list's own words come from the server (describeTerm). */
const KIND_LABELS: Record<TermKind, string> = {
  noNights: 'No nights',
  maxNights: 'Nights per period',
  maxWeekends: 'Weekends per period',
  daysOff: 'Fixed days off',
  maxShiftsPerWeek: 'Shifts a week',
  minHours: 'Hours at least',
  maxHours: 'Hours at most',
  earliestStart: 'Earliest start',
  latestEnd: 'Latest end',
  allowedPatterns: 'Only some shifts',
};
const KIND_HELP: Record<TermKind, string> = {
  noNights: 'Never on a night shift.',
  maxNights: 'At most this many night shifts in a roster period.',
  maxWeekends: 'At most this many weekends worked in a period (a shift starting on Saturday or Sunday counts).',
  daysOff: 'No shift starting on these weekdays.',
  maxShiftsPerWeek: 'At most this many shifts starting in each week, Monday to Sunday.',
  minHours: 'At least this many hours over the period, absence hours included, whatever the contract says.',
  maxHours: 'At most this many hours over the period, absence hours included.',
  earliestStart: 'No shift starting before this time of day.',
  latestEnd: 'Every shift over by this time on the day it starts (a shift past midnight breaks it).',
  allowedPatterns: 'Only shifts whose pattern label is one of these.',
};
const UNIT: Record<TermKind, string> = {
  minHours: 'hour short',
  maxHours: 'hour over',
  noNights: 'night',
  maxNights: 'night over',
  maxWeekends: 'weekend over',
  daysOff: 'shift',
  maxShiftsPerWeek: 'shift over',
  earliestStart: 'shift',
  latestEnd: 'shift',
  allowedPatterns: 'shift outside',
};
const WEEKDAYS: Array<{ value: Weekday; label: string }> = [
  { value: 'mon', label: 'Mon' },
  { value: 'tue', label: 'Tue' },
  { value: 'wed', label: 'Wed' },
  { value: 'thu', label: 'Thu' },
  { value: 'fri', label: 'Fri' },
  { value: 'sat', label: 'Sat' },
  { value: 'sun', label: 'Sun' },
];

interface Draft {
  kind: TermKind;
  hours: string;
  count: string;
  weekdays: Weekday[];
  time: string;
  labels: string;
  hard: boolean;
  weight: string;
  effectiveFrom: string;
}
const today = () => new Date().toISOString().slice(0, 10);
const emptyDraft = (): Draft => ({ kind: 'noNights', hours: '', count: '', weekdays: [], time: '', labels: '', hard: true, weight: '10', effectiveFrom: today() });
const fromTerm = (t: TermDto): Draft => {
  const term = t.term as Term & Partial<{ hours: number; count: number; weekdays: Weekday[]; time: string; labels: string[] }>;
  return {
    kind: term.kind,
    hours: term.hours === undefined ? '' : String(term.hours),
    count: term.count === undefined ? '' : String(term.count),
    weekdays: term.weekdays ?? [],
    time: term.time ?? '',
    labels: (term.labels ?? []).join(', '),
    hard: term.hard,
    weight: String(term.weight),
    effectiveFrom: t.effectiveFrom,
  };
};
const num = (s: string) => (s.trim() === '' ? Number.NaN : Number(s.trim().replace(',', '.')));

/** Only the kind's own parameters go to the schema, so a leftover field of another kind never travels. */
function toTerm(d: Draft): unknown {
  const base = { kind: d.kind, hard: d.hard, weight: d.hard ? 10 : num(d.weight) };
  switch (d.kind) {
    case 'minHours':
    case 'maxHours':
      return { ...base, hours: num(d.hours) };
    case 'maxNights':
    case 'maxWeekends':
    case 'maxShiftsPerWeek':
      return { ...base, count: num(d.count) };
    case 'daysOff':
      return { ...base, weekdays: d.weekdays };
    case 'earliestStart':
    case 'latestEnd':
      return { ...base, time: d.time.trim() };
    case 'allowedPatterns':
      return { ...base, labels: d.labels.split(',').map((l) => l.trim()).filter(Boolean) };
    default:
      return base;
  }
}

type Errors = Partial<Record<'hours' | 'count' | 'weekdays' | 'time' | 'labels' | 'weight' | 'effectiveFrom', string>>;
const NUMBER_WORDS = (m: string) => (/expected number, received NaN/.test(m) ? 'Enter a number' : m);

function check(d: Draft): { term: Term; effectiveFrom: string } | Errors {
  const errors: Errors = {};
  const term = termSchema.safeParse(toTerm(d));
  if (!term.success) for (const i of term.error.issues) errors[String(i.path[0]) as keyof Errors] ??= NUMBER_WORDS(i.message);
  if (d.kind === 'daysOff' && d.weekdays.length === 0) errors.weekdays = 'Pick at least one weekday';
  if (d.kind === 'allowedPatterns' && !d.labels.trim()) errors.labels = 'Name at least one pattern label';
  const from = localDateSchema.safeParse(d.effectiveFrom.trim());
  if (!from.success) errors.effectiveFrom = 'Enter a date as YYYY-MM-DD';
  return term.success && from.success && Object.keys(errors).length === 0 ? { term: term.data, effectiveFrom: from.data } : errors;
}

/** A person's own terms beside the roster-wide rules: listed in words; each can be added, changed or removed. */
export function TermsSection({ personId, personName }: { personId: number; personName: string }) {
  const terms = useTerms(personId);
  const [adding, setAdding] = useState(false);
  const [editing, setEditing] = useState<number | null>(null);
  return (
    <Section title="Terms" lead={`Rules for ${personName} alone, beside each roster’s rules: no nights, fixed days off, hour bounds… A roster uses every term in force on its days.`} testID="terms-section">
      <Notice kind="caution">{WORKING_TIME_CAUTION}</Notice>
      <Loadable query={terms} label="Terms">
        {(items) => (
          <View style={styles.list}>
            {items.length === 0 ? <Body muted>No terms: only the roster’s rules apply.</Body> : null}
            {items.map((t) =>
              editing === t.id ? (
                <TermForm key={t.id} personId={personId} term={t} onDone={() => setEditing(null)} />
              ) : (
                <TermLine key={t.id} personId={personId} term={t} onEdit={() => { setEditing(t.id); setAdding(false); }} />
              ),
            )}
          </View>
        )}
      </Loadable>
      {adding ? <TermForm personId={personId} onDone={() => setAdding(false)} /> : <Button kind="quiet" label="Add a term" onPress={() => { setAdding(true); setEditing(null); }} testID="term-add" />}
    </Section>
  );
}

function TermLine({ personId, term, onEdit }: { personId: number; term: TermDto; onEdit: () => void }) {
  const remove = useDeleteTerm();
  const [confirm, setConfirm] = useState(false);
  return (
    <View style={styles.line} testID={`term-${term.id}`}>
      <View style={{ flex: 1, minWidth: 200, gap: 2 }}>
        <Body bold>{term.words}</Body>
        <Body muted>{`In force from ${term.effectiveFrom}`}</Body>
      </View>
      <View style={styles.row}>
        <Button kind="quiet" label="Change" onPress={onEdit} testID={`term-edit-${term.id}`} />
        {confirm ? (
          <>
            <Button label="Remove it" onPress={() => remove.mutate({ personId, termId: term.id })} busy={remove.isPending} testID={`term-delete-confirm-${term.id}`} />
            <Button kind="quiet" label="Keep" onPress={() => setConfirm(false)} />
          </>
        ) : (
          <Button kind="quiet" label="Remove" onPress={() => setConfirm(true)} testID={`term-delete-${term.id}`} />
        )}
      </View>
      {remove.error ? <Notice>{remove.error.message}</Notice> : null}
    </View>
  );
}

/** Pattern labels of the newest roster, offered as quick picks for "only some shifts". */
function usePatternLabels(): string[] {
  const rosters = useRosters();
  const newest = rosters.data?.items[0]?.id ?? 0;
  // No roster yet: nothing to ask for.
  const patterns = useQuery({ ...patternsQueryOptions(newest), enabled: newest > 0 });
  return newest ? [...new Set((patterns.data ?? []).map((p) => p.label))] : [];
}

function TermForm({ personId, term, onDone }: { personId: number; term?: TermDto; onDone: () => void }) {
  const create = useCreateTerm();
  const update = useUpdateTerm();
  const labelsKnown = usePatternLabels();
  const [draft, setDraft] = useState<Draft>(() => (term ? fromTerm(term) : emptyDraft()));
  const [errors, setErrors] = useState<Errors>({});
  const set = (patch: Partial<Draft>) => setDraft({ ...draft, ...patch });
  const mutation = term ? update : create;
  const server = mutation.error instanceof ApiError ? mutation.error : null;
  const err = (name: keyof Errors) => errors[name] ?? server?.fieldMessage(name);
  const save = () => {
    const checked = check(draft);
    if (!('term' in checked)) return setErrors(checked);
    setErrors({});
    if (term) update.mutate({ personId, termId: term.id, term: checked.term, effectiveFrom: checked.effectiveFrom, version: term.version }, { onSuccess: onDone });
    else create.mutate({ personId, ...checked }, { onSuccess: onDone });
  };
  const labels = draft.labels.split(',').map((l) => l.trim()).filter(Boolean);
  const toggleLabel = (l: string) => set({ labels: (labels.includes(l) ? labels.filter((x) => x !== l) : [...labels, l]).join(', ') });
  const k = draft.kind;
  return (
    <View style={styles.form} testID={term ? `term-form-${term.id}` : 'term-form'}>
      <Body bold>Kind</Body>
      <Choices label="Kind of term" options={TERM_KINDS.map((x) => ({ value: x, label: KIND_LABELS[x] }))} value={[k]} onChange={(v) => set({ kind: v[0] })} testID="term-kind" />
      <Body muted>{KIND_HELP[k]}</Body>
      {k === 'minHours' || k === 'maxHours' ? (
        <View style={styles.cell}>
          <TextField label="Hours over the period" value={draft.hours} onChangeText={(hours) => set({ hours })} inputMode="decimal" error={err('hours')} testID="term-hours" />
        </View>
      ) : null}
      {k === 'maxNights' || k === 'maxWeekends' || k === 'maxShiftsPerWeek' ? (
        <View style={styles.cell}>
          <TextField label={k === 'maxNights' ? 'Nights at most' : k === 'maxWeekends' ? 'Weekends at most' : 'Shifts a week at most'} value={draft.count} onChangeText={(count) => set({ count })} inputMode="numeric" error={err('count')} testID="term-count" />
        </View>
      ) : null}
      {k === 'daysOff' ? (
        <View style={{ gap: space.xs }}>
          <Choices label="Days off" multi options={WEEKDAYS} value={draft.weekdays} onChange={(weekdays) => set({ weekdays })} testID="term-weekdays" />
          {err('weekdays') ? <Notice>{err('weekdays')!}</Notice> : null}
        </View>
      ) : null}
      {k === 'earliestStart' || k === 'latestEnd' ? (
        <View style={styles.cell}>
          <TimeField label={k === 'earliestStart' ? 'Not starting before' : 'Over by'} value={draft.time} onChange={(time) => set({ time })} error={err('time')} testID="term-time" />
        </View>
      ) : null}
      {k === 'allowedPatterns' ? (
        <View style={{ gap: space.xs }}>
          <TextField label="Pattern labels, separated by commas" value={draft.labels} onChangeText={(l) => set({ labels: l })} placeholder="early, late" error={err('labels')} testID="term-labels" />
          {labelsKnown.length ? (
            <View style={styles.chips}>
              {labelsKnown.map((l) => (
                <Chip key={l} label={l} selected={labels.includes(l)} onPress={() => toggleLabel(l)} />
              ))}
            </View>
          ) : null}
        </View>
      ) : null}
      <Choices label="Hard or soft" options={[{ value: 'hard', label: 'Hard: never broken' }, { value: 'soft', label: 'Soft: costs points' }]} value={[draft.hard ? 'hard' : 'soft']} onChange={(v) => set({ hard: v[0] === 'hard' })} testID="term-hardness" />
      {!draft.hard ? (
        <View style={styles.cell}>
          <TextField label={`Weight (points a ${UNIT[k]})`} value={draft.weight} onChangeText={(weight) => set({ weight })} inputMode="decimal" error={err('weight')} testID="term-weight" />
        </View>
      ) : null}
      <View style={styles.cell}>
        <DateField label="In force from" value={draft.effectiveFrom} onChange={(effectiveFrom) => set({ effectiveFrom })} error={err('effectiveFrom')} testID="term-from" />
      </View>
      {mutation.error && !(server && server.fields.length && server.fields.every((f) => /\.(hours|count|weekdays|time|labels|weight|effectiveFrom)$/.test(f.path))) ? <Notice>{mutation.error.message}</Notice> : null}
      <View style={styles.row}>
        <Button label={term ? 'Save term' : 'Add term'} onPress={save} busy={mutation.isPending} testID="term-save" />
        <Button kind="quiet" label="Cancel" onPress={onDone} />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.sm },
  line: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.sm },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  form: { gap: space.md, padding: space.md, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.thread, backgroundColor: colors.white },
  cell: { maxWidth: 360 },
  chips: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
});
