import { useEffect } from 'react';
import { StyleSheet, View } from 'react-native';
import type { Resolver, UseFormReturn } from 'react-hook-form';
import { colors, space } from '@/constants/theme';
import { rulesBody } from '@/shared/api/rosters';
import { RULE_CATALOGUE, type ParamField, type RuleEntry } from '@/solver/roster/rules/catalogue-words';
import { useRules } from '@/hooks/api/get-rules';
import { usePutRules } from '@/hooks/api/put-rules';
import type { RosterDto, RuleSet } from '@/hooks/api/roster-types';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body } from '@/components/ui/typography';
import { useFormKit, withFormKit } from '@/components/forms/form-kit';
import { Choices, Loadable, Panel } from './panel';
import { SkillMixEditor, type SkillMixRequirement } from './skill-mix-editor';

/** The form keeps numbers as typed text; the resolver turns them into a rule set or names the field at fault. */
type RuleDraft = { mode: 'off' | 'soft' | 'hard'; weight: string; requirements?: SkillMixRequirement[] } & Record<string, unknown>;
type FormValues = Record<string, RuleDraft>;

const text = (x: unknown) => (x === undefined || x === null ? '' : String(x));

function toForm(rules: RuleSet): FormValues {
  const out: FormValues = {};
  for (const r of RULE_CATALOGUE) {
    const v = rules[r.id] as Record<string, unknown>;
    const draft: RuleDraft = { mode: v.enabled === false ? 'off' : v.hard ? 'hard' : 'soft', weight: text(v.weight) };
    for (const f of r.fields) draft[f.name] = text(v[f.name]);
    if (r.id === 'skillMix') draft.requirements = (v.requirements as SkillMixRequirement[] | undefined) ?? [];
    out[r.id] = draft;
  }
  return out;
}

/** "12" → 12; "" → undefined where the field may be left out; a readable message otherwise. */
function readNumber(raw: unknown, f: Pick<ParamField, 'min' | 'max' | 'optional'>): { value?: number; error?: string } {
  const s = text(raw).trim();
  if (s === '') return f.optional ? {} : { error: 'Enter a number.' };
  const n = Number(s.replace(',', '.'));
  if (!Number.isFinite(n)) return { error: `"${s}" is not a number.` };
  if (n < f.min || n > f.max) return { error: `Enter a number from ${f.min} to ${f.max}.` };
  return { value: n };
}

const WEIGHT: Pick<ParamField, 'min' | 'max'> = { min: 0, max: 10_000 };

/** Form text → rule set, with an error per field (`<rule>.<field>`) in the words the form shows. */
const resolver: Resolver<FormValues> = async (values) => {
  const errors: Record<string, Record<string, { type: string; message: string }>> = {};
  const rules: Record<string, Record<string, unknown>> = {};
  const fail = (id: string, field: string, message: string) => ((errors[id] ??= {})[field] = { type: 'validate', message });
  for (const r of RULE_CATALOGUE) {
    const d = values[r.id];
    const out: Record<string, unknown> = { enabled: d.mode !== 'off', hard: d.mode === 'hard' };
    const w = readNumber(d.weight, WEIGHT);
    if (w.error && d.mode === 'soft') fail(r.id, 'weight', w.error);
    out.weight = w.value ?? (r.defaults as { weight: number }).weight;
    for (const f of r.fields) {
      const v = readNumber(d[f.name], f);
      if (v.error) fail(r.id, f.name, v.error);
      else if (v.value !== undefined) out[f.name] = v.value;
    }
    if (r.id === 'skillMix') out.requirements = d.requirements ?? [];
    rules[r.id] = out;
  }
  if (Object.keys(errors).length) return { values: {}, errors: errors as never };
  // the shared schema is the last word (the server checks the same)
  const parsed = rulesBody.shape.rules.safeParse(rules);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const [id, field] = issue.path.map(String);
    return { values: {}, errors: { [id]: { [field ?? 'mode']: { type: 'schema', message: issue.message } } } as never };
  }
  return { values: parsed.data as unknown as FormValues, errors: {} };
};

export function RulesSection({ roster }: { roster: RosterDto }) {
  const rules = useRules(roster.id);
  return (
    <Loadable query={rules} label="Rules">
      {(data) => <RulesForm roster={roster} rules={data.rules} version={data.version} />}
    </Loadable>
  );
}

const RulesForm = withFormKit(function RulesForm({ roster, rules, version }: { roster: RosterDto; rules: RuleSet; version: number }) {
  const { useForm } = useFormKit();
  const put = usePutRules();
  const form = useForm<FormValues>({ defaultValues: toForm(rules), resolver, mode: 'onSubmit' });
  // A newer version from the server (after a save here) replaces the form; a conflict keeps what was typed.
  useEffect(() => {
    if (!put.isError) form.reset(toForm(rules));
  }, [version, rules, put.isError, form]);
  const save = form.handleSubmit((parsed) => put.mutate({ rosterId: roster.id, rules: parsed as unknown as RuleSet, version }));
  const conflict = put.error && 'status' in put.error && (put.error as { status: number }).status === 409;
  const errorCount = Object.keys(form.formState.errors).length;
  return (
    <Panel title="Rules" lead="Hard rules can never be broken; a soft rule costs its weight in points each time it is.">
      {RULE_CATALOGUE.map((r) => (
        <RuleRow key={r.id} rule={r} form={form} rosterId={roster.id} />
      ))}
      {errorCount ? <Notice>{`${errorCount === 1 ? 'One rule needs' : `${errorCount} rules need`} a correction; see the messages above.`}</Notice> : null}
      {put.error ? <Notice>{conflict ? `${put.error.message} Your changes are still in the form.` : put.error.message}</Notice> : null}
      {put.isSuccess && !form.formState.isDirty ? <Notice kind="info">Rules saved. Solve again to apply them.</Notice> : null}
      <Button label="Save rules" onPress={save} busy={put.isPending} disabled={roster.status === 'published'} testID="rules-save" />
    </Panel>
  );
});

function RuleRow({ rule, form, rosterId }: { rule: RuleEntry; form: UseFormReturn<FormValues>; rosterId: number }) {
  const { Controller } = useFormKit();
  const mode = form.watch(`${rule.id}.mode`);
  const errors = (form.formState.errors[rule.id] ?? {}) as Record<string, { message?: string } | undefined>;
  return (
    <View style={styles.rule} testID={`rule-${rule.id}`}>
      <Body bold>{rule.name}</Body>
      <Body muted>{`${describe(rule, form.watch(rule.id))} Source: ${rule.sourceText}.`}</Body>
      <Controller
        control={form.control}
        name={`${rule.id}.mode`}
        render={({ field }) => (
          <Choices
            label={rule.name}
            options={[{ value: 'off', label: 'Off' }, { value: 'soft', label: 'Soft' }, { value: 'hard', label: 'Hard' }]}
            value={[field.value]}
            onChange={(v) => field.onChange(v[0])}
          />
        )}
      />
      {errors.mode?.message ? <Notice>{errors.mode.message}</Notice> : null}
      <View style={styles.fields}>
        {mode === 'soft' ? <NumberField form={form} name={`${rule.id}.weight`} label={`Weight (points ${rule.unit})`} error={errors.weight?.message} /> : null}
        {rule.fields.map((f) => (
          <NumberField key={f.name} form={form} name={`${rule.id}.${f.name}`} label={f.label} error={errors[f.name]?.message} />
        ))}
      </View>
      {rule.id === 'skillMix' ? (
        <Controller
          control={form.control}
          name="skillMix.requirements"
          render={({ field }) => <SkillMixEditor rosterId={rosterId} requirements={(field.value as SkillMixRequirement[] | undefined) ?? []} onChange={field.onChange} />}
        />
      ) : null}
    </View>
  );
}

/** The catalogue's description with each `field` read as its value in the form ("In every 7 consecutive days"). */
function describe(rule: RuleEntry, draft: RuleDraft): string {
  return rule.description.replace(/`(\w+)`/g, (_, name: string) => {
    if (!rule.fields.some((f) => f.name === name)) return 'the required number of';
    const v = text(draft?.[name]).trim();
    if (!v) return name === 'referenceDays' ? 'a reference period' : 'the value below';
    return /hours/i.test(name) ? `${v} h` : v;
  });
}

function NumberField({ form, name, label, error }: { form: UseFormReturn<FormValues>; name: string; label: string; error?: string }) {
  const { Controller } = useFormKit();
  return (
    <View style={styles.field}>
      <Controller
        control={form.control}
        name={name as `${string}.weight`}
        render={({ field }) => <TextField label={label} value={text(field.value)} onChangeText={field.onChange} onBlur={field.onBlur} inputMode="decimal" error={error} />}
      />
    </View>
  );
}

const styles = StyleSheet.create({
  rule: { gap: space.sm, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.md },
  fields: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  field: { minWidth: 150, flex: 1, maxWidth: 260 },
});
