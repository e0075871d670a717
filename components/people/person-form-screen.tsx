import { useEffect, useState, type ComponentProps } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { router } from 'expo-router';
import type { UseFormReturn } from 'react-hook-form';
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
import { formError } from '@/components/forms/form-errors';
import { bodyResolver, messageFor } from '@/components/forms/schema-form';
import { useFormKit, withFormKit } from '@/components/forms/form-kit';
import { PersonAbsencesSection } from '@/components/absences/person-absences-section';
import { Chip, CoordinatorsOnly } from './inline-controls';
import { TermsSection } from './terms-section';

/** As typed: hours are text until the schema reads them; names are the request body's. */
interface Values {
  name: string;
  email: string;
  contractedHours: string;
  skillIds: number[];
}
const EMPTY: Values = { name: '', email: '', contractedHours: '', skillIds: [] };
const fromPerson = (p: PersonDto): Values => ({ name: p.name, email: p.email ?? '', contractedHours: String(p.contractedHours), skillIds: p.skillIds });
const toBody = (v: Values) => ({
  name: v.name,
  email: v.email.trim() === '' ? null : v.email,
  contractedHours: v.contractedHours.trim() === '' ? Number.NaN : Number(v.contractedHours.trim().replace(',', '.')),
  skillIds: v.skillIds,
});
const resolver = bodyResolver(createPersonBody, toBody);
const FIELDS = ['name', 'email', 'contractedHours', 'skillIds', 'version'];
type PersonForm = UseFormReturn<Values, unknown, ReturnType<typeof createPersonBody.parse>>;

export const NewPersonScreen = withFormKit(function NewPersonScreen() {
  const { useForm } = useFormKit();
  const create = useCreatePerson();
  const form = useForm({ defaultValues: EMPTY, resolver });
  // The list says who was added, so the tap is seen to have worked.
  const submit = form.handleSubmit((body) => create.mutate(body, { onSuccess: (person) => router.replace({ pathname: '/people', params: { added: person.name } }) }));
  return (
    <CoordinatorsOnly what="people">
      <View style={styles.page}>
        <TextLink href="/people" label="← All people" />
        <Heading>Add a person</Heading>
        <PersonFields form={form} error={create.error} onSubmit={() => void submit()} />
        {isBillingRefusal(create.error) ? <PlanLimitPrompt error={create.error} /> : formError(create.error, FIELDS) ? <Notice>{formError(create.error, FIELDS)!}</Notice> : null}
        <Button label="Add person" onPress={() => void submit()} busy={create.isPending} testID="person-save" />
      </View>
    </CoordinatorsOnly>
  );
});

export function EditPersonScreen({ id }: { id: number }) {
  return (
    <CoordinatorsOnly what="people">
      <EditPerson id={id} />
    </CoordinatorsOnly>
  );
}

const EditPerson = withFormKit(function EditPerson({ id }: { id: number }) {
  const { useForm } = useFormKit();
  const person = usePerson(id);
  const update = useUpdatePerson();
  const remove = useDeletePerson();
  const form = useForm({ defaultValues: EMPTY, resolver });
  // The version the form was filled from; the save sends it, so a newer save elsewhere is a 409.
  const [version, setVersion] = useState<number | null>(null);
  const [saved, setSaved] = useState(false);
  const [confirmDelete, setConfirmDelete] = useState(false);
  useEffect(() => {
    if (person.data && version === null) {
      form.reset(fromPerson(person.data));
      setVersion(person.data.version);
    }
  }, [person.data, version, form]);
  // Any change after a save takes the "Saved." away.
  useEffect(() => {
    const sub = form.watch(() => setSaved(false));
    return () => sub.unsubscribe();
  }, [form]);

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
  if (version === null) return null;

  const conflict = update.error instanceof ApiError && update.error.status === 409;
  const save = (withVersion: number) =>
    form.handleSubmit((body) =>
      update.mutate(
        { id, ...body, version: withVersion },
        {
          onSuccess: (p) => {
            setVersion(p.version);
            form.reset(fromPerson(p));
            setSaved(true);
          },
        },
      ),
    )();
  const takeTheirs = async () => {
    const fresh = await person.refetch();
    if (fresh.data) {
      form.reset(fromPerson(fresh.data));
      setVersion(fresh.data.version);
      update.reset();
    }
  };
  const keepMine = async () => {
    const fresh = await person.refetch();
    if (fresh.data) void save(fresh.data.version);
  };

  return (
    <View style={styles.page}>
      <TextLink href="/people" label="← All people" />
      <Heading>{person.data.name}</Heading>
      <PersonFields form={form} error={conflict ? null : update.error} onSubmit={() => void save(version)} />
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
      <Button label="Save changes" onPress={() => void save(version)} busy={update.isPending} testID="person-save" />

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
});

function PersonFields({ form, error, onSubmit }: { form: PersonForm; error: unknown; onSubmit: () => void }) {
  const { Controller } = useFormKit();
  const skills = useSkills();
  const errors = form.formState.errors;
  const text = (name: 'name' | 'email' | 'contractedHours', label: string, testID: string, extra: Partial<ComponentProps<typeof TextField>> = {}) => (
    <Controller
      control={form.control}
      name={name}
      render={({ field }) => (
        <TextField label={label} value={field.value} onChangeText={field.onChange} onBlur={field.onBlur} error={messageFor(errors, error, name)} onSubmitEditing={onSubmit} testID={testID} {...extra} />
      )}
    />
  );
  return (
    <View style={styles.fields}>
      {text('name', 'Name', 'person-name')}
      {text('email', 'E-mail (optional)', 'person-email', { autoCapitalize: 'none', inputMode: 'email' })}
      {text('contractedHours', 'Contracted hours per week', 'person-hours', { inputMode: 'decimal', placeholder: 'e.g. 37.5' })}
      <View style={styles.skills} role="group" aria-label="Skills">
        <Body bold>Skills</Body>
        {skills.isPending ? (
          <ActivityIndicator color={colors.loom} />
        ) : skills.error ? (
          <Notice>{`Skills could not be loaded: ${skills.error.message}`}</Notice>
        ) : skills.data.length === 0 ? (
          <Body muted>No skills yet. Add them under People → Skills.</Body>
        ) : (
          <Controller
            control={form.control}
            name="skillIds"
            render={({ field }) => (
              <View style={styles.chips}>
                {skills.data.map((s) => (
                  <Chip
                    key={s.id}
                    label={s.name}
                    selected={field.value.includes(s.id)}
                    onPress={() => field.onChange(field.value.includes(s.id) ? field.value.filter((x) => x !== s.id) : [...field.value, s.id])}
                    testID={`person-skill-${s.name}`}
                  />
                ))}
              </View>
            )}
          />
        )}
        {messageFor(errors, error, 'skillIds') ? <Notice>{messageFor(errors, error, 'skillIds')!}</Notice> : null}
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
