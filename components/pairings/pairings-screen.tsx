import { useEffect, useState } from 'react';
import { ActivityIndicator, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';
import { pairingBody, updatePairingBody } from '@/shared/api/rosters';
import { ApiError } from '@/hooks/api/api-client';
import { useIsWide } from '@/hooks/use-is-wide';
import { usePairings, type PairingDto } from '@/hooks/api/get-pairings';
import { useCreatePairing } from '@/hooks/api/create-pairing';
import { useUpdatePairing } from '@/hooks/api/update-pairing';
import { useDeletePairing } from '@/hooks/api/delete-pairing';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body, Heading } from '@/components/ui/typography';
import { Section } from '@/components/auth/section';
import { checkForm, formError, type FieldErrors } from '@/components/forms/form-errors';
import { Chip, CoordinatorsOnly, Tag } from '@/components/people/inline-controls';
import { PersonPicker, type PickedPerson } from './person-picker';

type Kind = 'together' | 'apart' | 'never';
const KINDS: Array<{ kind: Kind; label: string }> = [
  { kind: 'together', label: 'Together' },
  { kind: 'apart', label: 'Apart' },
  { kind: 'never', label: 'Never together' },
];

const kindOf = (p: Pick<PairingDto, 'score' | 'neverTogether'>): Kind => (p.neverTogether ? 'never' : p.score >= 0 ? 'together' : 'apart');
const strengthOf = (p: Pick<PairingDto, 'score'>) => String(Math.abs(p.score));
/** The score the solver sees: points when both are on the same shift (positive together, negative apart); "never" is a hard rule. */
function scoreFields(kind: Kind, strength: string): { score: number; neverTogether: boolean } {
  const n = strength.trim() === '' ? Number.NaN : Math.abs(Number(strength.replace(',', '.')));
  if (kind === 'never') return { score: Number.isNaN(n) ? 0 : -n, neverTogether: true };
  return { score: kind === 'together' ? n : -n, neverTogether: false };
}
export function describeScore(p: Pick<PairingDto, 'score' | 'neverTogether'>): string {
  if (p.neverTogether) return 'never on the same shift';
  if (p.score === 0) return 'no preference';
  return p.score > 0 ? `together, +${p.score} points` : `apart, ${p.score} points`;
}

/** Coordinators: who works well with whom, as scores the solver weighs; staff requests wait here for a decision. */
export function PairingsScreen() {
  return (
    <CoordinatorsOnly what="pairings">
      <View style={styles.page}>
        <View style={styles.head}>
          <Heading>Pairings</Heading>
          <Body muted>A pairing gives points when two people work the same shift: positive to keep them together (a mentor and a trainee), negative to keep them apart. "Never together" is a hard rule the roster always keeps.</Body>
        </View>
        <Requests />
        <AddPairing />
        <PairingTable />
      </View>
    </CoordinatorsOnly>
  );
}

function Requests() {
  const requests = usePairings({ status: 'requested' });
  if (requests.isPending) return <ActivityIndicator color={colors.loom} accessibilityLabel="Loading requests" />;
  if (requests.error) return <Notice>{`Requests could not be loaded: ${requests.error.message}`}</Notice>;
  return (
    <Section title={`Requests from staff (${requests.data.length})`} lead={requests.data.length === 0 ? 'No requests are waiting. Staff can ask to work with or apart from a colleague from their phones.' : 'Only approved pairings reach the roster. The reason is visible to coordinators only.'} testID="pairing-requests">
      {requests.data.map((r) => (
        <RequestRow key={r.id} request={r} />
      ))}
    </Section>
  );
}

function RequestRow({ request }: { request: PairingDto }) {
  const update = useUpdatePairing();
  const decide = (status: 'approved' | 'declined') => update.mutate({ id: request.id, status, version: request.version });
  const conflict = update.error instanceof ApiError && update.error.status === 409;
  return (
    <View style={styles.request} testID={`request-${request.personAName}-${request.personBName}`}>
      <View style={styles.grow}>
        <Text style={styles.pair}>{`${request.personAName} & ${request.personBName}`}</Text>
        <Text style={styles.muted}>{`${request.requestedByName ? `Asked by ${request.requestedByName}` : 'Requested'}: ${describeScore(request)}`}</Text>
        {request.reason ? <Text style={styles.reason}>{`“${request.reason}”`}</Text> : <Text style={styles.muted}>No reason given.</Text>}
      </View>
      <View style={styles.buttons}>
        <Button label="Approve" onPress={() => decide('approved')} busy={update.isPending && update.variables?.status === 'approved'} disabled={update.isPending} testID="request-approve" />
        <Button kind="quiet" label="Decline" onPress={() => decide('declined')} busy={update.isPending && update.variables?.status === 'declined'} disabled={update.isPending} testID="request-decline" />
      </View>
      {update.error ? <Notice kind={conflict ? 'caution' : 'error'}>{conflict ? 'Someone else decided on this request first; the list now shows what they chose.' : update.error.message}</Notice> : null}
    </View>
  );
}

/** One of three kinds: radios in a radiogroup with a name a screen reader can say. */
function KindChips({ value, onChange, label, testID }: { value: Kind; onChange: (k: Kind) => void; label: string; testID?: string }) {
  return (
    <View style={styles.chips} role="radiogroup" aria-label={label}>
      {KINDS.map((k) => (
        <Chip key={k.kind} role="radio" label={k.label} selected={value === k.kind} onPress={() => onChange(k.kind)} testID={testID ? `${testID}-${k.kind}` : undefined} />
      ))}
    </View>
  );
}

function AddPairing() {
  const create = useCreatePairing();
  const [a, setA] = useState<PickedPerson | null>(null);
  const [b, setB] = useState<PickedPerson | null>(null);
  const [kind, setKind] = useState<Kind>('together');
  const [strength, setStrength] = useState('3');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [added, setAdded] = useState<string | null>(null);
  const submit = () => {
    setAdded(null);
    const checked = checkForm(pairingBody, { personAId: a?.id, personBId: b?.id, ...scoreFields(kind, strength) });
    const e: FieldErrors = { ...(checked.errors ?? {}) };
    if (!a) e.personAId = 'Choose the first person';
    if (!b) e.personBId = 'Choose the second person';
    setErrors(e);
    if (checked.data && a && b) {
      create.mutate(checked.data, {
        onSuccess: (p) => {
          setAdded(`Added: ${p.personAName} & ${p.personBName}, ${describeScore(p)}.`);
          setA(null);
          setB(null);
        },
      });
    }
  };
  const serverField = (name: string) => (create.error instanceof ApiError ? create.error.fieldMessage(name) : undefined);
  return (
    <Section title="Add a pairing">
      <View style={styles.pickers}>
        <PersonPicker label="First person" value={a} onChange={setA} error={errors.personAId ? 'Choose the first person' : serverField('personAId')} testID="pairing-a" />
        <PersonPicker label="Second person" value={b} onChange={setB} error={errors.personBId ?? serverField('personBId')} testID="pairing-b" />
      </View>
      <KindChips value={kind} onChange={setKind} label="Kind of pairing" testID="pairing-kind" />
      {kind !== 'never' ? (
        <View style={styles.strength}>
          <TextField label="Strength in points" value={strength} onChangeText={setStrength} inputMode="decimal" error={errors.score} testID="pairing-strength" />
        </View>
      ) : null}
      {formError(create.error, ['personAId', 'personBId', 'score']) ? <Notice>{formError(create.error, ['personAId', 'personBId', 'score'])!}</Notice> : null}
      {added ? <Notice kind="info">{added}</Notice> : null}
      <View style={styles.start}>
        <Button label="Add pairing" onPress={submit} busy={create.isPending} testID="pairing-add" />
      </View>
    </Section>
  );
}

function PairingTable() {
  const [search, setSearch] = useState('');
  const [q, setQ] = useState('');
  useEffect(() => {
    const t = setTimeout(() => setQ(search.trim()), 250);
    return () => clearTimeout(t);
  }, [search]);
  const pairings = usePairings({ q: q || undefined });
  const rows = (pairings.data ?? []).filter((p) => p.status !== 'requested');
  return (
    <Section title="All pairings" testID="pairing-table">
      <TextField label="Search by name" value={search} onChangeText={setSearch} placeholder="e.g. Priya" testID="pairing-search" />
      {pairings.isPending ? (
        <ActivityIndicator color={colors.loom} accessibilityLabel="Loading pairings" />
      ) : pairings.error ? (
        <Notice>{`Pairings could not be loaded: ${pairings.error.message}`}</Notice>
      ) : rows.length === 0 ? (
        <Notice kind="info">{q ? `No pairing includes "${q}".` : 'No pairings yet. Add one above, or approve a request from staff.'}</Notice>
      ) : (
        <View role="table" aria-label="Pairings">
          {rows.map((p) => (
            <PairingRow key={`${p.id}-${p.version}`} pairing={p} />
          ))}
        </View>
      )}
    </Section>
  );
}

/** One pairing, editable in place; keyed by version so a fresh copy from the server resets it. */
function PairingRow({ pairing }: { pairing: PairingDto }) {
  const wide = useIsWide();
  const update = useUpdatePairing();
  const remove = useDeletePairing();
  const [kind, setKind] = useState<Kind>(kindOf(pairing));
  const [strength, setStrength] = useState(strengthOf(pairing));
  const [error, setError] = useState<string | null>(null);
  const [confirming, setConfirming] = useState(false);
  const fields = scoreFields(kind, strength);
  const changed = fields.neverTogether !== pairing.neverTogether || (!fields.neverTogether && fields.score !== pairing.score);
  const save = () => {
    const checked = checkForm(updatePairingBody, { ...fields, version: pairing.version });
    if (!checked.data) return setError(checked.errors.score ?? 'Check the strength');
    setError(null);
    update.mutate({ id: pairing.id, ...checked.data });
  };
  const conflict = update.error instanceof ApiError && update.error.status === 409;
  const label = `${pairing.personAName} & ${pairing.personBName}`;
  return (
    <View role="row" style={[styles.pRow, wide && styles.pRowWide]} testID={`pairing-${pairing.personAName}-${pairing.personBName}`}>
      <View role="cell" style={styles.pNames}>
        <Text style={styles.pair}>{label}</Text>
        <View style={styles.tags}>
          {pairing.status === 'declined' ? <Tag tone="bad">declined request</Tag> : <Tag tone={pairing.neverTogether ? 'bad' : pairing.score >= 0 ? 'good' : 'warn'}>{describeScore(pairing)}</Tag>}
        </View>
        {pairing.reason ? <Text style={styles.muted}>{`Reason given: “${pairing.reason}”`}</Text> : null}
      </View>
      <View role="cell" style={styles.pEdit}>
        <KindChips value={kind} onChange={setKind} label={`Kind of pairing for ${label}`} />
        {kind !== 'never' ? (
          <View style={styles.strength}>
            <TextField label={`Points for ${label}`} value={strength} onChangeText={setStrength} inputMode="decimal" error={error ?? undefined} />
          </View>
        ) : null}
      </View>
      <View role="cell" style={styles.buttons}>
        {pairing.status === 'declined' ? <Button kind="quiet" label="Approve after all" onPress={() => update.mutate({ id: pairing.id, status: 'approved', version: pairing.version })} busy={update.isPending} /> : null}
        <Button label="Save" onPress={save} disabled={!changed} busy={update.isPending} />
        {confirming ? (
          <>
            <Button label="Delete" onPress={() => remove.mutate(pairing.id)} busy={remove.isPending} />
            <Button kind="quiet" label="Keep" onPress={() => setConfirming(false)} />
          </>
        ) : (
          <Button kind="quiet" label="Delete" onPress={() => setConfirming(true)} />
        )}
      </View>
      {update.error ? <Notice kind={conflict ? 'caution' : 'error'}>{conflict ? `${update.error.message}` : update.error.message}</Notice> : null}
      {remove.error ? <Notice>{remove.error.message}</Notice> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg },
  head: { gap: space.xs, maxWidth: 820 },
  grow: { flex: 1, minWidth: 220, gap: 2 },
  start: { alignItems: 'flex-start' },
  request: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md, alignItems: 'center', paddingVertical: space.md, borderTopWidth: 1, borderTopColor: colors.line },
  pair: { fontFamily: fonts.bodyBold, fontSize: 16, color: colors.ink },
  muted: { fontFamily: fonts.body, fontSize: 14, color: colors.inkSoft },
  reason: { fontFamily: fonts.body, fontSize: 15, color: colors.ink, fontStyle: 'italic' },
  buttons: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' },
  chips: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  pickers: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  strength: { maxWidth: 200 },
  tags: { flexDirection: 'row', gap: space.xs },
  pRow: { gap: space.md, paddingVertical: space.md, borderTopWidth: 1, borderTopColor: colors.line },
  pRowWide: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center' },
  pNames: { flex: 2, minWidth: 220, gap: space.xs },
  pEdit: { flex: 3, minWidth: 280, gap: space.sm, borderRadius: radius.sm },
});
