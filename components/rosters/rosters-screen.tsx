import { Link } from 'expo-router';
import { Pressable, StyleSheet, View } from 'react-native';
import { colors, radius, space } from '@/constants/theme';
import { createRosterBody } from '@/shared/api/rosters';
import { useSession } from '@/hooks/api/get-session';
import { useRosters } from '@/hooks/api/get-rosters';
import { useCreateRoster } from '@/hooks/api/create-roster';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { isBillingRefusal, PlanLimitPrompt } from '@/components/billing/plan-limit-prompt';
import { TextField } from '@/components/ui/text-field';
import { DateField } from '@/components/ui/date-field';
import { Body, Heading } from '@/components/ui/typography';
import { formError } from '@/components/forms/form-errors';
import { bodyResolver, messageFor } from '@/components/forms/schema-form';
import { useFormKit, withFormKit } from '@/components/forms/form-kit';
import { Loadable, Panel, Pill } from './panel';
import { periodWords } from './format';

const statusWords = { draft: 'draft', solved: 'solved', published: 'published' } as const;
const statusTone = { draft: 'plain', solved: 'warn', published: 'good' } as const;

/** Coordinators: every roster of the workspace, newest period first, and a form to start one. */
export function RostersScreen() {
  const { data: session } = useSession();
  if (session && session.role !== 'admin' && session.role !== 'coordinator') return <Notice>Only coordinators and admins plan rosters.</Notice>;
  return (
    <View style={styles.page}>
      <Heading>Rosters</Heading>
      <RosterList />
      {/* Waits for the session so a new roster starts in the workspace's time zone, not a guess. */}
      {session ? <CreateRoster timeZone={session.workspace?.timeZone} /> : null}
    </View>
  );
}

function RosterList() {
  const rosters = useRosters();
  return (
    <Loadable query={rosters} label="Rosters">
      {(page) =>
        page.items.length === 0 ? (
          <Notice kind="info">No rosters yet. Start one below: a name, the period it covers and its time zone.</Notice>
        ) : (
          <View style={styles.list} role="list" aria-label="Rosters">
            {page.items.map((r) => (
              <Link key={r.id} href={`/rosters/${r.id}`} asChild>
                <Pressable role="link" accessibilityLabel={`Open roster ${r.name}`} style={({ pressed, hovered }: { pressed: boolean; hovered?: boolean }) => [styles.item, (pressed || hovered) && styles.itemHover]} testID={`roster-${r.id}`}>
                  <View style={{ flex: 1, gap: 2 }}>
                    <Body bold>{r.name}</Body>
                    <Body muted>{`${periodWords(r.periodStart, r.periodEnd)} · ${r.timeZone}`}</Body>
                  </View>
                  <Pill tone={statusTone[r.status]}>{statusWords[r.status]}</Pill>
                </Pressable>
              </Link>
            ))}
          </View>
        )
      }
    </Loadable>
  );
}

interface NewRoster {
  name: string;
  periodStart: string;
  periodEnd: string;
  timeZone: string;
}
const NAMES = ['name', 'periodStart', 'periodEnd', 'timeZone'] as const;
const resolver = bodyResolver(createRosterBody, (v: NewRoster) => v);

const CreateRoster = withFormKit(function CreateRoster({ timeZone }: { timeZone?: string }) {
  const { Controller, useForm } = useFormKit();
  const create = useCreateRoster();
  const form = useForm({ defaultValues: { name: '', periodStart: '', periodEnd: '', timeZone: timeZone ?? 'Europe/London' }, resolver });
  const submit = form.handleSubmit((body) => create.mutate(body, { onSuccess: () => form.reset({ ...form.getValues(), name: '', periodStart: '', periodEnd: '' }) }));
  const error = (name: (typeof NAMES)[number]) => messageFor(form.formState.errors, create.error, name);
  const periodStart = form.watch('periodStart');
  return (
    <Panel title="Start a roster" lead="The period's first and last day, and the time zone its shift times are in.">
      <Controller control={form.control} name="name" render={({ field }) => <TextField label="Name" value={field.value} onChangeText={field.onChange} onBlur={field.onBlur} error={error('name')} testID="roster-name" />} />
      <View style={styles.row}>
        <View style={styles.cell}>
          <Controller control={form.control} name="periodStart" render={({ field }) => <DateField label="First day" value={field.value} onChange={field.onChange} error={error('periodStart')} testID="roster-start" />} />
        </View>
        <View style={styles.cell}>
          <Controller
            control={form.control}
            name="periodEnd"
            render={({ field }) => <DateField label="Last day" value={field.value} onChange={field.onChange} minDate={/^\d{4}-\d{2}-\d{2}$/.test(periodStart) ? periodStart : undefined} error={error('periodEnd')} testID="roster-end" />}
          />
        </View>
      </View>
      <Controller
        control={form.control}
        name="timeZone"
        render={({ field }) => <TextField label="Time zone (IANA, e.g. Europe/London)" value={field.value} onChangeText={field.onChange} onBlur={field.onBlur} autoCapitalize="none" error={error('timeZone')} testID="roster-zone" />}
      />
      {isBillingRefusal(create.error) ? <PlanLimitPrompt error={create.error} /> : formError(create.error, [...NAMES]) ? <Notice>{formError(create.error, [...NAMES])!}</Notice> : null}
      {create.isSuccess ? <Notice kind="info">{`Roster “${create.data.name}” created. Open it above to add shift patterns.`}</Notice> : null}
      <Button label="Create roster" onPress={() => void submit()} busy={create.isPending} testID="roster-create" />
    </Panel>
  );
});

const styles = StyleSheet.create({
  page: { gap: space.lg, maxWidth: 1000 },
  list: { gap: space.sm },
  item: { flexDirection: 'row', alignItems: 'center', gap: space.md, padding: space.lg, borderRadius: radius.md, backgroundColor: colors.card, borderWidth: 1, borderColor: colors.line, minHeight: 56 },
  itemHover: { backgroundColor: colors.loomSoft },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  cell: { flex: 1, minWidth: 150 },
});
