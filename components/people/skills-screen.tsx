import { useState } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { colors, space } from '@/constants/theme';
import { skillBody } from '@/shared/api/people';
import { useSkills, type SkillDto } from '@/hooks/api/get-skills';
import { useCreateSkill } from '@/hooks/api/create-skill';
import { useRenameSkill } from '@/hooks/api/rename-skill';
import { useDeleteSkill } from '@/hooks/api/delete-skill';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body, Heading } from '@/components/ui/typography';
import { Section } from '@/components/auth/section';
import { TextLink } from '@/components/auth/text-link';
import { checkForm, fieldError, formError, type FieldErrors } from '@/components/forms/form-errors';
import { CoordinatorsOnly } from './inline-controls';

/** The workspace's skills: seats ask for them, people hold them, CSV files name them. */
export function SkillsScreen() {
  return (
    <CoordinatorsOnly what="skills">
      <View style={styles.page}>
        <TextLink href="/people" label="← All people" />
        <Heading>Skills</Heading>
        <Body muted>Seats in a shift can ask for a skill; only people who hold it are considered for them.</Body>
        <AddSkill />
        <SkillList />
      </View>
    </CoordinatorsOnly>
  );
}

function AddSkill() {
  const create = useCreateSkill();
  const [name, setName] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const submit = () => {
    const checked = checkForm(skillBody, { name });
    setErrors(checked.errors ?? {});
    if (checked.data) create.mutate(checked.data, { onSuccess: () => setName('') });
  };
  return (
    <Section title="Add a skill">
      <TextField label="Skill name" value={name} onChangeText={setName} placeholder="e.g. Medication round" error={fieldError(errors, create.error, 'name')} onSubmitEditing={submit} testID="skill-name" />
      {formError(create.error, ['name']) ? <Notice>{formError(create.error, ['name'])!}</Notice> : null}
      <Button label="Add skill" onPress={submit} busy={create.isPending} testID="skill-add" />
    </Section>
  );
}

function SkillList() {
  const skills = useSkills();
  if (skills.isPending) return <ActivityIndicator color={colors.loom} accessibilityLabel="Loading skills" />;
  if (skills.error) return <Notice>{`Skills could not be loaded: ${skills.error.message}`}</Notice>;
  if (skills.data.length === 0) return <Notice kind="info">No skills yet. Add the first one above.</Notice>;
  return (
    <Section title={`Skills (${skills.data.length})`}>
      {skills.data.map((s) => (
        <SkillRow key={s.id} skill={s} />
      ))}
    </Section>
  );
}

function SkillRow({ skill }: { skill: SkillDto }) {
  const rename = useRenameSkill();
  const remove = useDeleteSkill();
  const [editing, setEditing] = useState(false);
  const [name, setName] = useState(skill.name);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [confirming, setConfirming] = useState(false);
  const holders = skill.people ?? 0;
  const save = () => {
    const checked = checkForm(skillBody, { name });
    setErrors(checked.errors ?? {});
    if (checked.data) rename.mutate({ id: skill.id, name: checked.data.name }, { onSuccess: () => setEditing(false) });
  };
  return (
    <View style={styles.row} testID={`skill-${skill.name}`}>
      {editing ? (
        <View style={styles.grow}>
          <TextField label={`New name for ${skill.name}`} value={name} onChangeText={setName} error={fieldError(errors, rename.error, 'name')} onSubmitEditing={save} autoFocus />
        </View>
      ) : (
        <View style={styles.grow}>
          <Body bold>{skill.name}</Body>
          <Body muted>{holders === 0 ? 'Nobody holds it yet' : `${holders} ${holders === 1 ? 'person holds' : 'people hold'} it`}</Body>
        </View>
      )}
      <View style={styles.buttons}>
        {editing ? (
          <>
            <Button label="Save" onPress={save} busy={rename.isPending} />
            <Button kind="quiet" label="Cancel" onPress={() => { setEditing(false); setName(skill.name); rename.reset(); }} />
          </>
        ) : confirming ? (
          <>
            <Button label="Delete" onPress={() => remove.mutate(skill.id)} busy={remove.isPending} />
            <Button kind="quiet" label="Keep" onPress={() => setConfirming(false)} />
          </>
        ) : (
          <>
            <Button kind="quiet" label="Rename" onPress={() => setEditing(true)} />
            <Button kind="quiet" label="Delete" onPress={() => setConfirming(true)} />
          </>
        )}
      </View>
      {confirming ? <Notice kind="caution">{holders > 0 ? `Deleting "${skill.name}" takes it off ${holders} ${holders === 1 ? 'person' : 'people'}, and seats that asked for it will take anyone.` : `Delete "${skill.name}"? Seats that asked for it will take anyone.`}</Notice> : null}
      {formError(rename.error, ['name']) ? <Notice>{formError(rename.error, ['name'])!}</Notice> : null}
      {remove.error ? <Notice>{remove.error.message}</Notice> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg, maxWidth: 760 },
  row: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.md, paddingVertical: space.md, borderTopWidth: 1, borderTopColor: colors.line },
  grow: { flex: 1, minWidth: 200, gap: 2 },
  buttons: { flexDirection: 'row', gap: space.sm },
});
