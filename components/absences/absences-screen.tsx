import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { router } from 'expo-router';
import { colors, radius, space } from '@/constants/theme';
import { ABSENCE_KIND_WORDS, ABSENCE_KINDS, absenceSettingsBody, type AbsenceDto, type AbsenceKindName, type AbsenceSettings, type AbsenceStatus } from '@/shared/api/absences';
import { useIsWide } from '@/hooks/use-is-wide';
import { useAbsences } from '@/hooks/api/get-absences';
import { useDecideAbsence } from '@/hooks/api/decide-absence';
import { useAbsenceConflicts, type AbsenceConflictDto } from '@/hooks/api/get-absence-conflicts';
import { useStartAbsenceCover } from '@/hooks/api/start-absence-cover';
import { useAbsenceSettings } from '@/hooks/api/get-absence-settings';
import { usePutAbsenceSettings } from '@/hooks/api/put-absence-settings';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body, Heading } from '@/components/ui/typography';
import { CoordinatorsOnly, LinkButton } from '@/components/people/inline-controls';
import { PersonPicker, type PickedPerson } from '@/components/pairings/person-picker';
import { Choices, Loadable, Panel } from '@/components/rosters/panel';
import { AbsenceCard } from './absence-card';
import { AbsenceForm } from './absence-form';
import { kindWords, spanWords } from './format';

/** Coordinators' absences: requests to decide, seats that need cover, every absence with filters, and the hours each kind credits. */
export function AbsencesScreen() {
  return (
    <CoordinatorsOnly what="absences">
      <Absences />
    </CoordinatorsOnly>
  );
}

function Absences() {
  const wide = useIsWide();
  const [adding, setAdding] = useState(false);
  const [added, setAdded] = useState<AbsenceDto | null>(null);
  return (
    <View style={styles.page}>
      <Heading>Absences</Heading>
      <Body muted>Leave, sickness, training and other time away. An approved absence keeps the person off every shift it touches and counts its hours toward theirs.</Body>
      <View style={[styles.columns, wide && styles.columnsWide]}>
        <View style={[styles.column, wide && styles.main]}>
          <Requests />
          <NeedsCover />
          <Panel title="Add an absence" lead="Entered by you, it is approved at once." right={adding ? null : <Button label="Add an absence" onPress={() => { setAdding(true); setAdded(null); }} testID="absence-add" />}>
            {adding ? <AbsenceForm mode="coordinator" onDone={(a) => { setAdded(a); setAdding(false); }} onCancel={() => setAdding(false)} /> : null}
            {added ? <Notice kind="info">{`Added: ${added.personName}, ${kindWords(added.kind).toLowerCase()}, ${spanWords(added)}.`}</Notice> : null}
          </Panel>
          <AllAbsences />
        </View>
        <View style={[styles.column, wide && styles.side]}>
          <CreditSettings />
          <Panel title="Import from a spreadsheet" lead="A CSV file with one absence a row: you see every row checked before anything is stored.">
            <LinkButton href="/absences/import" label="Import absences (CSV)" testID="absence-import-link" />
          </Panel>
        </View>
      </View>
    </View>
  );
}

function Requests() {
  const requests = useAbsences({ status: 'requested' });
  const decide = useDecideAbsence();
  const [reasonFor, setReasonFor] = useState<number | null>(null);
  const [reason, setReason] = useState('');
  return (
    <Panel title="Requests" lead="Staff ask for time away from their phones; they get an e-mail with your answer." testID="absence-requests">
      <Loadable query={requests} label="Requests">
        {(items) =>
          items.length === 0 ? (
            <Body muted>No requests waiting.</Body>
          ) : (
            <View style={styles.list}>
              {items.map((a) => (
                <View key={a.id} style={styles.request} testID={`absence-request-${a.id}`}>
                  <Body bold>{`${a.personName} · ${kindWords(a.kind)}`}</Body>
                  <Body>{spanWords(a)}</Body>
                  {a.note ? <Body muted>{`“${a.note}”`}</Body> : null}
                  {reasonFor === a.id ? <TextField label="Reason for declining (sent to them; optional)" value={reason} onChangeText={setReason} maxLength={500} testID={`absence-reason-${a.id}`} /> : null}
                  <View style={styles.row}>
                    <Button label="Approve" onPress={() => decide.mutate({ id: a.id, decision: 'approve', version: a.version })} busy={decide.isPending && decide.variables?.id === a.id && decide.variables.decision === 'approve'} testID={`absence-approve-${a.id}`} />
                    <Button
                      kind="quiet"
                      label={reasonFor === a.id ? 'Decline with this reason' : 'Decline'}
                      onPress={() => decide.mutate({ id: a.id, decision: 'decline', version: a.version, reason: reasonFor === a.id && reason.trim() ? reason.trim() : null }, { onSuccess: () => { setReasonFor(null); setReason(''); } })}
                      busy={decide.isPending && decide.variables?.id === a.id && decide.variables.decision === 'decline'}
                      testID={`absence-decline-${a.id}`}
                    />
                    {reasonFor === a.id ? null : <Button kind="quiet" label="Give a reason…" onPress={() => { setReasonFor(a.id); setReason(''); }} />}
                  </View>
                  {decide.error && decide.variables?.id === a.id ? <Notice>{decide.error.message}</Notice> : null}
                </View>
              ))}
            </View>
          )
        }
      </Loadable>
    </Panel>
  );
}

function NeedsCover() {
  const conflicts = useAbsenceConflicts();
  const cover = useStartAbsenceCover();
  const byRoster = new Map<number, AbsenceConflictDto[]>();
  for (const c of conflicts.data ?? []) byRoster.set(c.rosterId, [...(byRoster.get(c.rosterId) ?? []), c]);
  return (
    <Panel title="Needs cover" lead="Seats of solved or published rosters that an approved absence takes away." testID="absence-conflicts">
      <Loadable query={conflicts} label="Seats that need cover">
        {(items) =>
          items.length === 0 ? (
            <Body muted>Every rostered seat is still covered.</Body>
          ) : (
            <View style={styles.list}>
              {[...byRoster.entries()].map(([rosterId, list]) => (
                <View key={rosterId} style={styles.request} testID={`cover-roster-${rosterId}`}>
                  <Body bold>{list[0].rosterName}</Body>
                  {list.map((c) => (
                    <Body key={`${c.absenceId}-${c.seatId}`}>{`• ${c.message}`}</Body>
                  ))}
                  <Button
                    label="Re-solve keeping the rest"
                    onPress={() => cover.mutate(rosterId, { onSuccess: () => router.push(`/rosters/${rosterId}?section=solve`) })}
                    busy={cover.isPending && cover.variables === rosterId}
                    testID={`cover-resolve-${rosterId}`}
                  />
                  <Body muted>Every other seat stays as it is; only these seats get new people.</Body>
                  {cover.error && cover.variables === rosterId ? <Notice>{cover.error.message}</Notice> : null}
                </View>
              ))}
            </View>
          )
        }
      </Loadable>
    </Panel>
  );
}

const STATUS_OPTIONS: Array<{ value: AbsenceStatus | 'all'; label: string }> = [
  { value: 'all', label: 'All' },
  { value: 'approved', label: 'Approved' },
  { value: 'requested', label: 'Waiting' },
  { value: 'declined', label: 'Declined' },
];

function AllAbsences() {
  const [person, setPerson] = useState<PickedPerson | null>(null);
  const [status, setStatus] = useState<AbsenceStatus | 'all'>('all');
  const list = useAbsences({ personId: person?.id, status: status === 'all' ? undefined : status });
  return (
    <Panel title="All absences" testID="absence-list">
      <View style={styles.filters}>
        <PersonPicker label="Only for" value={person} onChange={setPerson} testID="absence-filter-person" />
        <Choices label="Status" options={STATUS_OPTIONS} value={[status]} onChange={(v) => setStatus(v[0])} testID="absence-filter-status" />
      </View>
      <Loadable query={list} label="Absences">
        {(items) =>
          items.length === 0 ? (
            <Body muted>{person || status !== 'all' ? 'No absence matches.' : 'No absences yet.'}</Body>
          ) : (
            <View style={styles.list}>
              {items.map((a) => (
                <AbsenceCard key={a.id} absence={a} />
              ))}
            </View>
          )
        }
      </Loadable>
    </Panel>
  );
}

type CreditDraft = Record<AbsenceKindName, { mode: 'contracted' | 'hours'; hours: string }>;
const toDraft = (s: AbsenceSettings): CreditDraft =>
  Object.fromEntries(ABSENCE_KINDS.map((k) => [k, s.credits[k] === 'contracted' ? { mode: 'contracted', hours: '' } : { mode: 'hours', hours: String(s.credits[k]) }])) as CreditDraft;

function CreditSettings() {
  const settings = useAbsenceSettings();
  return (
    <Panel title="Hours each kind credits" lead="What an absence counts toward contracted hours and the weekly-hours rules when you leave its hours blank." testID="absence-settings">
      <Loadable query={settings} label="The credit settings">
        {(data) => <CreditForm settings={data} />}
      </Loadable>
    </Panel>
  );
}

function CreditForm({ settings }: { settings: AbsenceSettings }) {
  const put = usePutAbsenceSettings();
  const [draft, setDraft] = useState<CreditDraft>(() => toDraft(settings));
  const [problem, setProblem] = useState<string | null>(null);
  const save = () => {
    const credits = Object.fromEntries(ABSENCE_KINDS.map((k) => [k, draft[k].mode === 'contracted' ? 'contracted' : draft[k].hours.trim() === '' ? Number.NaN : Number(draft[k].hours.replace(',', '.'))]));
    const parsed = absenceSettingsBody.safeParse({ credits });
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      const kind = String(issue.path[1]) as AbsenceKindName;
      setProblem(`${ABSENCE_KIND_WORDS[kind] ?? kind}: enter hours a day from 0 to 24`);
      return;
    }
    setProblem(null);
    put.mutate(parsed.data, { onSuccess: (s) => setDraft(toDraft(s)) });
  };
  return (
    <View style={styles.list}>
      {ABSENCE_KINDS.map((k) => (
        <View key={k} style={styles.setting} testID={`credit-${k}`}>
          <Body bold>{ABSENCE_KIND_WORDS[k]}</Body>
          <Choices
            label={`${ABSENCE_KIND_WORDS[k]} credits`}
            options={[{ value: 'contracted', label: 'Contracted day' }, { value: 'hours', label: 'Set hours' }]}
            value={[draft[k].mode]}
            onChange={(v) => setDraft({ ...draft, [k]: { mode: v[0], hours: draft[k].hours || '0' } })}
          />
          {draft[k].mode === 'hours' ? (
            <TextField label={`Hours a day (${ABSENCE_KIND_WORDS[k].toLowerCase()})`} value={draft[k].hours} onChangeText={(hours) => setDraft({ ...draft, [k]: { mode: 'hours', hours } })} inputMode="decimal" testID={`credit-${k}-hours`} />
          ) : (
            <Body muted>The person’s contracted week ÷ 5, for each working day away.</Body>
          )}
        </View>
      ))}
      {problem ? <Notice>{problem}</Notice> : null}
      {put.error ? <Notice>{put.error.message}</Notice> : null}
      {put.isSuccess ? <Notice kind="info">Saved. Absences without their own hours now credit these.</Notice> : null}
      <Button label="Save credits" onPress={save} busy={put.isPending} testID="credit-save" />
    </View>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg, width: '100%', maxWidth: 1180 },
  columns: { gap: space.lg },
  columnsWide: { flexDirection: 'row', alignItems: 'flex-start' },
  column: { gap: space.lg },
  main: { flex: 3, minWidth: 0 },
  side: { flex: 2, minWidth: 0 },
  list: { gap: space.sm },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  filters: { gap: space.md },
  request: { gap: space.xs, padding: space.md, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.white },
  setting: { gap: space.xs, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.sm },
});
