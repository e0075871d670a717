import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, radius, space } from '@/constants/theme';
import type { RuleSet } from '@/shared/roster/schema';
import { useSkills } from '@/hooks/api/get-skills';
import { usePatterns } from '@/hooks/api/get-patterns';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body } from '@/components/ui/typography';
import { Choices } from './panel';

export type SkillMixRequirement = RuleSet['skillMix']['requirements'][number];

/** Stored rules name skills by their roster id ("s3", server/rosters/ids.ts). */
const skillKey = (id: number) => `s${id}`;

/**
 * Skill-mix requirements in words ("At least 1 First aid on every night shift"), each added,
 * changed or removed in place; they are saved with the rest of the rules.
 */
export function SkillMixEditor({ rosterId, requirements, onChange }: { rosterId: number; requirements: SkillMixRequirement[]; onChange: (r: SkillMixRequirement[]) => void }) {
  const skills = useSkills();
  const patterns = usePatterns(rosterId);
  const [editing, setEditing] = useState<number | 'new' | null>(null);
  const skillName = (key: string) => skills.data?.find((s) => skillKey(s.id) === key)?.name ?? key;
  const labels = [...new Set((patterns.data ?? []).map((p) => p.label))];
  const words = (q: SkillMixRequirement) => `At least ${q.min} ${skillName(q.skill)} on every ${q.patternLabel ? `${q.patternLabel} ` : ''}shift`;
  return (
    <View style={styles.box} testID="skill-mix">
      <Body bold>Requirements</Body>
      {requirements.length === 0 ? <Body muted>None yet: any mix of skills is fine beyond each seat’s own skill.</Body> : null}
      {requirements.map((q, i) =>
        editing === i ? (
          <RequirementForm key={i} value={q} skills={skills.data ?? []} labels={labels} onSave={(v) => { onChange(requirements.map((x, j) => (j === i ? v : x))); setEditing(null); }} onCancel={() => setEditing(null)} />
        ) : (
          <View key={i} style={styles.line} testID={`skill-mix-${i}`}>
            <Body style={{ flex: 1, minWidth: 180 }}>{words(q)}</Body>
            <Button kind="quiet" label="Change" onPress={() => setEditing(i)} testID={`skill-mix-edit-${i}`} />
            <Button kind="quiet" label="Remove" onPress={() => onChange(requirements.filter((_, j) => j !== i))} testID={`skill-mix-remove-${i}`} />
          </View>
        ),
      )}
      {editing === 'new' ? (
        <RequirementForm skills={skills.data ?? []} labels={labels} onSave={(v) => { onChange([...requirements, v]); setEditing(null); }} onCancel={() => setEditing(null)} />
      ) : (
        <Button kind="quiet" label="Add a requirement" onPress={() => setEditing('new')} disabled={!skills.data?.length} testID="skill-mix-add" />
      )}
      {skills.data && skills.data.length === 0 ? <Body muted>Add skills under People → Skills first.</Body> : null}
      <Body muted>Changes here are kept when you save the rules below.</Body>
    </View>
  );
}

function RequirementForm({ value, skills, labels, onSave, onCancel }: { value?: SkillMixRequirement; skills: Array<{ id: number; name: string }>; labels: string[]; onSave: (v: SkillMixRequirement) => void; onCancel: () => void }) {
  const [skill, setSkill] = useState(value?.skill ?? (skills[0] ? skillKey(skills[0].id) : ''));
  const [min, setMin] = useState(String(value?.min ?? 1));
  const [label, setLabel] = useState(value?.patternLabel ?? '');
  const [problem, setProblem] = useState<string | null>(null);
  const save = () => {
    const n = Number(min.trim());
    if (!skill) return setProblem('Choose a skill');
    if (!Number.isInteger(n) || n < 1 || n > 100) return setProblem('At least: a whole number from 1 to 100');
    if (label.trim().length > 60) return setProblem('The pattern label is at most 60 characters');
    onSave({ skill, min: n, ...(label.trim() ? { patternLabel: label.trim() } : {}) });
  };
  return (
    <View style={styles.form} testID="skill-mix-form">
      <Body bold>Skill</Body>
      <Choices label="Skill" options={skills.map((s) => ({ value: skillKey(s.id), label: s.name }))} value={[skill]} onChange={(v) => setSkill(v[0])} testID="skill-mix-skill" />
      <View style={styles.row}>
        <View style={{ width: 140 }}>
          <TextField label="At least (people)" value={min} onChangeText={setMin} inputMode="numeric" testID="skill-mix-min" />
        </View>
        <View style={{ flex: 1, minWidth: 200 }}>
          <TextField label="Only on shifts labelled (blank = every shift)" value={label} onChangeText={setLabel} placeholder="night" testID="skill-mix-label" />
        </View>
      </View>
      {labels.length ? <Choices label="Pattern label" options={[{ value: '', label: 'Every shift' }, ...labels.map((l) => ({ value: l, label: l }))]} value={[label]} onChange={(v) => setLabel(v[0])} testID="skill-mix-labels" /> : null}
      {problem ? <Notice>{problem}</Notice> : null}
      <View style={styles.row}>
        <Button label={value ? 'Keep this change' : 'Add requirement'} onPress={save} testID="skill-mix-save" />
        <Button kind="quiet" label="Cancel" onPress={onCancel} />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  box: { gap: space.sm },
  line: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.xs },
  form: { gap: space.sm, padding: space.md, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.thread, backgroundColor: colors.white },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md, alignItems: 'flex-end' },
});
