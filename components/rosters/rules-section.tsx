import { useEffect, useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, space } from '@/constants/theme';
import { WORKING_TIME_CAUTION } from '@/shared/caution';
import { rulesBody, TERM_LABELS } from '@/shared/api/rosters';
import { useRules } from '@/hooks/api/get-rules';
import { usePutRules } from '@/hooks/api/put-rules';
import type { RosterDto, RuleSet } from '@/hooks/api/roster-types';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body } from '@/components/ui/typography';
import { Choices, Loadable, Panel } from './parts';
import { SkillMixEditor, type SkillMixRequirement } from './skill-mix-editor';

type RuleKey = keyof RuleSet;

/** What each rule's numbers mean, and where the default comes from (DESIGN.md, Model). */
const RULES: Array<{ key: RuleKey; unit: string; source: string; fields: Array<{ name: string; label: string }> }> = [
  { key: 'coverage', unit: 'per open seat', source: 'common practice', fields: [] },
  { key: 'minRest', unit: 'per short rest', source: 'Directive 2003/88/EC Art. 3: 11 h', fields: [{ name: 'hours', label: 'Minimum rest (hours)' }] },
  { key: 'weeklyRest', unit: 'per shift over', source: 'Art. 5: 24 h per 7 days', fields: [{ name: 'days', label: 'In any (days)' }, { name: 'maxShifts', label: 'At most (shifts)' }] },
  { key: 'maxHoursPer7Days', unit: 'per hour over', source: 'Art. 6: 48 h average', fields: [{ name: 'hours', label: 'Hours in any 7 days' }] },
  { key: 'nightShiftLength', unit: 'per long night', source: 'Art. 8: 8 h', fields: [{ name: 'hours', label: 'Longest night (hours)' }] },
  { key: 'maxConsecutiveDays', unit: 'per shift over', source: 'common practice', fields: [{ name: 'days', label: 'Days in a row' }] },
  { key: 'maxNightsInRow', unit: 'per night over', source: 'common practice', fields: [{ name: 'nights', label: 'Nights in a row' }] },
  { key: 'contractedHours', unit: 'per hour outside the tolerance', source: 'common practice', fields: [{ name: 'toleranceHours', label: 'Tolerance (hours)' }] },
  { key: 'fairNights', unit: 'per night over a fair share', source: 'common practice', fields: [] },
  { key: 'fairWeekends', unit: 'per weekend shift over a fair share', source: 'common practice', fields: [] },
  { key: 'skillMix', unit: 'per person short', source: 'common practice', fields: [] },
];

type Draft = Record<string, Record<string, string | boolean | unknown>>;

const toDraft = (rules: RuleSet): Draft =>
  Object.fromEntries(Object.entries(rules).map(([k, v]) => [k, Object.fromEntries(Object.entries(v as Record<string, unknown>).map(([f, x]) => [f, typeof x === 'number' ? String(x) : x]))]));
const fromDraft = (draft: Draft) =>
  Object.fromEntries(Object.entries(draft).map(([k, v]) => [k, Object.fromEntries(Object.entries(v).map(([f, x]) => [f, typeof x === 'string' && f !== 'skill' ? (x.trim() === '' ? NaN : Number(x)) : x]))]));

export function RulesSection({ roster }: { roster: RosterDto }) {
  const rules = useRules(roster.id);
  return (
    <Loadable query={rules} label="Rules">
      {(data) => <RulesForm roster={roster} rules={data.rules} version={data.version} />}
    </Loadable>
  );
}

function RulesForm({ roster, rules, version }: { roster: RosterDto; rules: RuleSet; version: number }) {
  const put = usePutRules();
  const [draft, setDraft] = useState<Draft>(() => toDraft(rules));
  const [seen, setSeen] = useState(version);
  const [problem, setProblem] = useState<string | null>(null);
  // A newer version from the server (after a save here) replaces the draft; a conflict keeps the draft.
  useEffect(() => {
    if (version !== seen && !put.isError) {
      setDraft(toDraft(rules));
      setSeen(version);
    }
  }, [version, rules, seen, put.isError]);
  const set = (key: string, field: string, value: unknown) => setDraft({ ...draft, [key]: { ...draft[key], [field]: value } });
  const save = () => {
    const parsed = rulesBody.safeParse({ rules: fromDraft(draft), version: seen });
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      const [, key, field] = issue.path.map(String);
      setProblem(`${TERM_LABELS[key] ?? key}${field ? ` (${field})` : ''}: ${issue.message === 'Invalid input: expected number, received NaN' ? 'enter a number' : issue.message}`);
      return;
    }
    setProblem(null);
    put.mutate({ rosterId: roster.id, rules: parsed.data.rules, version: parsed.data.version }, { onSuccess: (d) => { setSeen(d.version); setDraft(toDraft(d.rules)); } });
  };
  const conflict = put.error && 'status' in put.error && (put.error as { status: number }).status === 409;
  return (
    <Panel title="Rules" lead="Hard rules can never be broken; a soft rule costs its weight in points each time it is.">
      <Notice kind="caution">{WORKING_TIME_CAUTION}</Notice>
      {RULES.map(({ key, unit, source, fields }) => {
        const r = draft[key] as Record<string, unknown>;
        const hard = r.hard === true;
        return (
          <View key={key} style={styles.rule} testID={`rule-${key}`}>
            <Body bold>{TERM_LABELS[key]}</Body>
            <Body muted>{`Default from ${source}.`}</Body>
            <Choices
              label={TERM_LABELS[key]}
              options={[{ value: 'off', label: 'Off' }, { value: 'soft', label: 'Soft' }, { value: 'hard', label: 'Hard' }]}
              value={[r.enabled === false ? 'off' : hard ? 'hard' : 'soft']}
              onChange={(v) => setDraft({ ...draft, [key]: { ...r, enabled: v[0] !== 'off', hard: v[0] === 'hard' } })}
            />
            <View style={styles.fields}>
              {!hard && r.enabled !== false ? (
                <View style={styles.field}>
                  <TextField label={`Weight (points ${unit})`} value={String(r.weight ?? '')} onChangeText={(x) => set(key, 'weight', x)} inputMode="decimal" />
                </View>
              ) : null}
              {fields.map((f) => (
                <View key={f.name} style={styles.field}>
                  <TextField label={f.label} value={String(r[f.name] ?? '')} onChangeText={(x) => set(key, f.name, x)} inputMode="decimal" />
                </View>
              ))}
            </View>
            {key === 'skillMix' ? (
              <SkillMixEditor rosterId={roster.id} requirements={(r.requirements as SkillMixRequirement[] | undefined) ?? []} onChange={(requirements) => setDraft({ ...draft, skillMix: { ...r, requirements } })} />
            ) : null}
          </View>
        );
      })}
      {problem ? <Notice>{problem}</Notice> : null}
      {put.error ? <Notice>{conflict ? `${put.error.message} Your changes are still in the form.` : put.error.message}</Notice> : null}
      {put.isSuccess ? <Notice kind="info">Rules saved. Solve again to apply them.</Notice> : null}
      <Button label="Save rules" onPress={save} busy={put.isPending} disabled={roster.status === 'published'} testID="rules-save" />
    </Panel>
  );
}

const styles = StyleSheet.create({
  rule: { gap: space.sm, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.md },
  fields: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  field: { minWidth: 150, flex: 1, maxWidth: 260 },
});
