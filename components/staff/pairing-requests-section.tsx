import { useState } from 'react';
import { ActivityIndicator, Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';
import { useMyColleagues } from '@/hooks/api/get-my-colleagues';
import { useMyPairings } from '@/hooks/api/get-my-pairings';
import { useRequestMyPairing } from '@/hooks/api/request-my-pairing';
import { useWithdrawMyPairing } from '@/hooks/api/withdraw-my-pairing';
import { pairingRequestBody } from '@/shared/api/staff';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body } from '@/components/ui/typography';
import { Section } from '@/components/auth/section';
import { checkForm, type FieldErrors } from '@/components/forms/form-errors';
import { ChoiceChips } from './choice-chips';

const STATUS_WORDS = { requested: 'Waiting for a coordinator', approved: 'Agreed by a coordinator', declined: 'Not taken up' } as const;

/** Ask to work with, or apart from, a colleague; the reason goes to coordinators only. */
export function PairingRequestsSection() {
  const colleagues = useMyColleagues();
  const mine = useMyPairings();
  const ask = useRequestMyPairing();
  const withdraw = useWithdrawMyPairing();
  const [search, setSearch] = useState('');
  const [colleagueId, setColleagueId] = useState<number | null>(null);
  const [together, setTogether] = useState<'together' | 'apart' | null>(null);
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const chosen = colleagues.data?.find((c) => c.id === colleagueId) ?? null;
  const matches = (colleagues.data ?? []).filter((c) => search.trim() && c.name.toLowerCase().includes(search.trim().toLowerCase())).slice(0, 6);

  const submit = () => {
    const checked = checkForm(pairingRequestBody, { colleagueId: colleagueId ?? undefined, together: together === null ? undefined : together === 'together', reason });
    setErrors(checked.errors ?? {});
    if (checked.data) {
      ask.mutate(checked.data, {
        onSuccess: () => {
          setColleagueId(null);
          setSearch('');
          setTogether(null);
          setReason('');
        },
      });
    }
  };

  return (
    <Section title="Who you work with" lead="Ask to be rostered with a colleague, or apart from one. Only coordinators read your reason; your colleague is not told." testID="pairing-requests">
      {colleagues.error ? <Notice>{colleagues.error.message}</Notice> : null}
      {chosen ? (
        <View style={styles.chosen}>
          <Body bold>{chosen.name}</Body>
          <Button kind="quiet" label="Change" onPress={() => setColleagueId(null)} />
        </View>
      ) : (
        <View style={styles.picker}>
          <TextField label="Colleague" placeholder="Type a name" value={search} onChangeText={setSearch} autoComplete="off" error={errors.colleagueId} testID="pairing-search" />
          {matches.map((c) => (
            <Pressable key={c.id} role="button" accessibilityLabel={`Choose ${c.name}`} onPress={() => setColleagueId(c.id)} style={styles.match}>
              <Text style={styles.matchText}>{c.name}</Text>
            </Pressable>
          ))}
          {search.trim() && colleagues.data && matches.length === 0 ? <Body muted>No colleague by that name.</Body> : null}
        </View>
      )}
      <ChoiceChips
        label="Together or apart"
        choices={[
          { value: 'together', label: 'Work together' },
          { value: 'apart', label: 'Work apart' },
        ]}
        value={together}
        onChange={setTogether}
        testID="pairing-direction"
      />
      {errors.together ? <Notice>{errors.together}</Notice> : null}
      <TextField label="Why? (for coordinators only)" value={reason} onChangeText={setReason} maxLength={500} multiline error={errors.reason} testID="pairing-reason" />
      {/* The server's words in full (an existing request, an unknown colleague…), whatever field it names. */}
      {ask.error ? <Notice>{ask.error.message}</Notice> : null}
      <Button label="Send request" onPress={submit} busy={ask.isPending} testID="pairing-submit" />

      <View style={styles.list} testID="my-pairing-requests">
        <Body bold>Your requests</Body>
        {mine.isPending ? <ActivityIndicator color={colors.loom} accessibilityLabel="Loading your requests" /> : null}
        {mine.error ? <Notice>{mine.error.message}</Notice> : null}
        {mine.data?.length === 0 ? <Body muted>None yet.</Body> : null}
        {mine.data?.map((p) => (
          <View key={p.id} style={styles.item} testID={`pairing-request-${p.id}`}>
            <View style={styles.itemText}>
              <Body bold>{`${p.together ? 'With' : 'Apart from'} ${p.colleague.name}`}</Body>
              <Body muted>{`${STATUS_WORDS[p.status]} · asked ${new Date(p.createdAt).toLocaleDateString()}`}</Body>
            </View>
            {p.status === 'requested' ? <Button kind="quiet" label="Withdraw" onPress={() => withdraw.mutate(p.id)} busy={withdraw.isPending && withdraw.variables === p.id} /> : null}
          </View>
        ))}
        {withdraw.error ? <Notice>{withdraw.error.message}</Notice> : null}
      </View>
    </Section>
  );
}

const styles = StyleSheet.create({
  picker: { gap: space.xs },
  chosen: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', gap: space.md, padding: space.md, backgroundColor: colors.loomSoft, borderRadius: radius.md },
  match: { minHeight: 44, justifyContent: 'center', paddingHorizontal: space.md, borderWidth: 1, borderColor: colors.line, borderRadius: radius.sm, backgroundColor: colors.white },
  matchText: { fontFamily: fonts.body, fontSize: 16, color: colors.ink },
  list: { gap: space.sm, marginTop: space.md },
  item: { flexDirection: 'row', alignItems: 'center', gap: space.md, flexWrap: 'wrap', borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.sm },
  itemText: { flex: 1, minWidth: 180, gap: 2 },
});
