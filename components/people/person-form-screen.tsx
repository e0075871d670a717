import { useEffect, useState } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { router } from 'expo-router';
import { colors, space } from '@/constants/theme';
import { createPersonBody, type PersonDto } from '@/shared/api/people';
import { ApiError } from '@/hooks/api/api-client';
import { usePerson } from '@/hooks/api/get-person';
import { useSkills } from '@/hooks/api/get-skills';
import { useCreatePerson } from '@/hooks/api/create-person';
import { useUpdatePerson } from '@/hooks/api/update-person';
import { useDeletePerson } from '@/hooks/api/delete-person';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { isBillingRefusal, PlanLimitPrompt } from '@/components/billing/plan-limit-prompt';
import { TextField } from '@/components/ui/text-field';
import { Body, Heading } from '@/components/ui/typography';
import { Section } from '@/components/auth/section';
import { TextLink } from '@/components/auth/text-link';
import { checkForm, fieldError, formError, type FieldErrors } from '@/components/forms/form-errors';
import { PersonAbsencesSection } from '@/components/absences/person-absences-section';
import { Chip, CoordinatorsOnly } from './parts';
import { TermsSection } from './terms-section';

interface Values {
  name: string;
  email: string;
  hours: string;
  skillIds: number[];
}
const fromPerson = (p: PersonDto): Values => ({ name: p.name, email: p.email ?? '', hours: String(p.contractedHours), skillIds: p.skillIds });
const toBody = (v: Values) => ({ name: v.name, email: v.email.trim() === '' ? null : v.email, contractedHours: v.hours.trim() === '' ? Number.NaN : Number(v.hours.trim().replace(',', '.')), skillIds: v.skillIds });
const FIELDS = ['name', 'email', 'contractedHours', 'skillIds', 'version'];

export function NewPersonScreen() {
  const create = useCreatePerson();
  const [values, setValues] = useState<Values>({ name: '', email: '', hours: '', skillIds: [] });
  const [errors, setErrors] = useState<FieldErrors>({});
  const submit = () => {
    const checked = checkForm(createPersonBody, toBody(values));
    setErrors(checked.errors ?? {});
    // The list says who was added, so the tap is seen to have worked.
    if (checked.data) create.mutate(checked.data, { onSuccess: (person) => router.replace({ pathname: '/people', params: { added: person.name } }) });
  };
  return (
    <CoordinatorsOnly what="people">
      <View style={styles.page}>
        <TextLink href="/people" label="← All people" />
        <Heading>Add a person</Heading>
        <PersonFields values={values} onChange={setValues} errors={errors} error={create.error} onSubmit={submit} />
        {isBillingRefusal(create.error) ? <PlanLimitPrompt error={create.error} /> : formError(create.error, FIELDS) ? <Notice>{formError(create.error, FIELDS)!}</Notice> : null}
        <Button label="Add person" onPress={submit} busy={create.isPending} testID="person-save" />
      </View>
    </CoordinatorsOnly>
  );
}

export function EditPersonScreen({ id }: { id: number }) {
  return (
    <CoordinatorsOnly what="people">
      <EditPerson id={id} />
    </CoordinatorsOnly>
  );
}

function EditPerson({ id }: { id: number }) {
  const person = usePerson(id);
  const update = useUpdatePerson();
  const remove = useDeletePerson();
  const [values, setValues] = useState<Values | null>(null);
  // The version the form was filled from; the save sends it, so a newer save elsewhere is a 409.
  const [version, setVersion] = useState<number | null>(null);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [saved, setSaved] = useState(false);
  const [confirmDelete, setConfirmDelete] = useState(false);
  useEffect(() => {
    if (person.data && values === null) {
      setValues(fromPerson(person.data));
      setVersion(person.data.version);
    }
  }, [person.data, values]);

  if (!Number.isInteger(id) || id <= 0) return <Notice>This is not a person's address.</Notice>;
  if (person.isPending) return <ActivityIndicator color={colors.loom} accessibilityLabel="Loading" />;
  if (person.error) {
    return (
      <View style={styles.page}>
        <TextLink href="/people" label="← All people" />
        <Notice>{person.error instanceof ApiError && person.error.status === 404 ? 'This person is not in your workspace (any more).' : `The person could not be loaded: ${person.error.message}`}</Notice>
      </View>
    );
  }
  if (!values || version === null) return null;

  const conflict = update.error instanceof ApiError && update.error.status === 409;
  const save = (withVersion = version) => {
    setSaved(false);
    const checked = checkForm(createPersonBody, toBody(values));
    setErrors(checked.errors ?? {});
    if (!checked.data) return;
    update.mutate(
      { id, ...checked.data, version: withVersion },
      {
        onSuccess: (p) => {
          setVersion(p.version);
          setValues(fromPerson(p));
          setSaved(true);
        },
      },
    );
  };
  const takeTheirs = async () => {
    const fresh = await person.refetch();
    if (fresh.data) {
      setValues(fromPerson(fresh.data));
      setVersion(fresh.data.version);
      update.reset();
    }
  };
  const keepMine = async () => {
    const fresh = await person.refetch();
    if (fresh.data) save(fresh.data.version);
  };

  return (
    <View style={styles.page}>
      <TextLink href="/people" label="← All people" />
      <Heading>{person.data.name}</Heading>
      <PersonFields values={values} onChange={(v) => { setValues(v); setSaved(false); }} errors={errors} error={conflict ? null : update.error} onSubmit={() => save()} />
      {conflict ? (
        <View style={styles.conflict} testID="person-conflict">
          <Notice kind="caution">{update.error!.message}</Notice>
          <View style={styles.row}>
            <Button kind="quiet" label="Show their version" onPress={() => void takeTheirs()} />
            <Button kind="quiet" label="Save mine over theirs" onPress={() => void keepMine()} />
          </View>
        </View>
      ) : formError(update.error, FIELDS) ? (
        <Notice>{formError(update.error, FIELDS)!}</Notice>
      ) : null}
      {saved ? <Notice kind="info">Saved.</Notice> : null}
      <Button label="Save changes" onPress={() => save()} busy={update.isPending} testID="person-save" />

      <TermsSection personId={id} personName={person.data.name} />
      <PersonAbsencesSection personId={id} personName={person.data.name} />

      <Section title="Remove from the workspace" lead="Their pairings, wishes and seats in unpublished rosters go with them.">
        {confirmDelete ? (
          <View style={styles.row}>
            <Button label={`Remove ${person.data.name}`} onPress={() => remove.mutate(id, { onSuccess: () => router.replace('/people') })} busy={remove.isPending} testID="person-delete-confirm" />
            <Button kind="quiet" label="Keep" onPress={() => setConfirmDelete(false)} />
          </View>
        ) : (
          <Button kind="quiet" label="Remove this person" onPress={() => setConfirmDelete(true)} testID="person-delete" />
        )}
        {remove.error ? <Notice>{remove.error.message}</Notice> : null}
      </Section>
    </View>
  );
}

function PersonFields({ values, onChange, errors, error, onSubmit }: { values: Values; onChange: (v: Values) => void; errors: FieldErrors; error: unknown; onSubmit: () => void }) {
  const skills = useSkills();
  const set = (patch: Partial<Values>) => onChange({ ...values, ...patch });
  const toggle = (sid: number) => set({ skillIds: values.skillIds.includes(sid) ? values.skillIds.filter((x) => x !== sid) : [...values.skillIds, sid] });
  return (
    <View style={styles.fields}>
      <TextField label="Name" value={values.name} onChangeText={(name) => set({ name })} error={fieldError(errors, error, 'name')} onSubmitEditing={onSubmit} testID="person-name" />
      <TextField label="E-mail (optional)" value={values.email} onChangeText={(email) => set({ email })} autoCapitalize="none" inputMode="email" error={fieldError(errors, error, 'email')} onSubmitEditing={onSubmit} testID="person-email" />
      <TextField label="Contracted hours per week" value={values.hours} onChangeText={(hours) => set({ hours })} inputMode="decimal" placeholder="e.g. 37.5" error={fieldError(errors, error, 'contractedHours')} onSubmitEditing={onSubmit} testID="person-hours" />
      <View style={styles.skills} role="group" aria-label="Skills">
        <Body bold>Skills</Body>
        {skills.isPending ? (
          <ActivityIndicator color={colors.loom} />
        ) : skills.error ? (
          <Notice>{`Skills could not be loaded: ${skills.error.message}`}</Notice>
        ) : skills.data.length === 0 ? (
          <Body muted>No skills yet. Add them under People → Skills.</Body>
        ) : (
          <View style={styles.chips}>
            {skills.data.map((s) => (
              <Chip key={s.id} label={s.name} selected={values.skillIds.includes(s.id)} onPress={() => toggle(s.id)} testID={`person-skill-${s.name}`} />
            ))}
          </View>
        )}
        {fieldError(errors, error, 'skillIds') ? <Notice>{fieldError(errors, error, 'skillIds')!}</Notice> : null}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg, maxWidth: 640 },
  fields: { gap: space.lg },
  skills: { gap: space.sm },
  chips: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  conflict: { gap: space.sm },
});
