import { useState } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { absenceTones, colors, radius, space } from '@/constants/theme';
import type { AbsenceDto } from '@/shared/api/absences';
import { useMyAbsences } from '@/hooks/api/get-my-absences';
import { useWithdrawMyAbsence } from '@/hooks/api/withdraw-my-absence';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body, Heading } from '@/components/ui/typography';
import { Section } from '@/components/auth/section';
import { Tag } from '@/components/people/inline-controls';
import { AbsenceForm } from '@/components/absences/absence-form';
import { kindWords, spanWords, STATUS_WORDS } from '@/components/absences/format';

/** Staff ask for time away from their phone and follow each request until it is decided. */
export function TimeAwayScreen() {
  const mine = useMyAbsences();
  const [sent, setSent] = useState<AbsenceDto | null>(null);
  const today = new Date().toISOString().slice(0, 10);
  const items = mine.data ?? [];
  const upcoming = items.filter((a) => a.endDate >= today);
  const past = items.filter((a) => a.endDate < today);
  return (
    <View style={styles.page}>
      <Heading>Time away</Heading>
      <Body muted>Ask for leave, training or other time away. Your coordinator approves or declines it and you get an e-mail; while it waits you can withdraw it.</Body>
      <Section title="Ask for time away" testID="time-away-request">
        <AbsenceForm mode="staff" onDone={setSent} />
        {sent ? <Notice kind="info">{`Sent: ${kindWords(sent.kind).toLowerCase()}, ${spanWords(sent)}. It waits for your coordinator.`}</Notice> : null}
      </Section>
      {mine.isPending ? <ActivityIndicator color={colors.loom} accessibilityLabel="Loading your time away" /> : null}
      {mine.error ? <Notice>{mine.error.message}</Notice> : null}
      {mine.data ? (
        <View style={styles.section} testID="time-away-list">
          <Heading level={2}>Yours</Heading>
          {upcoming.length === 0 ? <Body muted>Nothing coming up.</Body> : upcoming.map((a) => <MyAbsence key={a.id} absence={a} />)}
          {past.length > 0 ? (
            <>
              <Heading level={3}>Earlier</Heading>
              {past.map((a) => (
                <MyAbsence key={a.id} absence={a} />
              ))}
            </>
          ) : null}
        </View>
      ) : null}
    </View>
  );
}

function MyAbsence({ absence: a }: { absence: AbsenceDto }) {
  const withdraw = useWithdrawMyAbsence();
  return (
    <View style={styles.card} testID={`my-absence-${a.id}`}>
      <View style={styles.head}>
        <Body bold style={{ flex: 1 }}>{kindWords(a.kind)}</Body>
        <Tag tone={absenceTones[a.status]}>{STATUS_WORDS[a.status]}</Tag>
      </View>
      <Body>{spanWords(a)}</Body>
      {a.note ? <Body muted>{`Your note: ${a.note}`}</Body> : null}
      {a.status === 'declined' && a.declineReason ? <Body muted>{`Reason: ${a.declineReason}`}</Body> : null}
      {a.status !== 'requested' && a.decidedByName ? <Body muted>{`${a.status === 'approved' ? 'Approved' : 'Declined'} by ${a.decidedByName}`}</Body> : null}
      {a.status === 'requested' ? <Button kind="quiet" label="Withdraw request" onPress={() => withdraw.mutate(a.id)} busy={withdraw.isPending} testID={`my-absence-withdraw-${a.id}`} /> : null}
      {withdraw.error ? <Notice>{withdraw.error.message}</Notice> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg, maxWidth: 760, width: '100%' },
  section: { gap: space.md },
  card: { gap: space.xs, backgroundColor: colors.card, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.line, padding: space.md },
  head: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
});
