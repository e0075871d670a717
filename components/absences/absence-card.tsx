import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { absenceTones, colors, radius, space } from '@/constants/theme';
import type { AbsenceDto } from '@/shared/api/absences';
import { useDeleteAbsence } from '@/hooks/api/delete-absence';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body } from '@/components/ui/typography';
import { Tag } from '@/components/people/inline-controls';
import { AbsenceForm } from './absence-form';
import { creditWords, kindWords, spanWords, STATUS_WORDS } from './format';

/** One absence in a coordinator's list: what, when, what it credits, who asked and decided; edit or remove it in place. */
export function AbsenceCard({ absence: a, showName = true }: { absence: AbsenceDto; showName?: boolean }) {
  const [editing, setEditing] = useState(false);
  const [confirm, setConfirm] = useState(false);
  const remove = useDeleteAbsence();
  if (editing) {
    return (
      <View style={[styles.card, styles.editing]} testID={`absence-${a.id}`}>
        <Body bold>{`Change ${a.personName}’s absence`}</Body>
        <AbsenceForm mode="coordinator" absence={a} onDone={() => setEditing(false)} onCancel={() => setEditing(false)} />
      </View>
    );
  }
  // A coordinator's own entry is asked and approved by the same person: say it once.
  const who =
    a.requestedByName && a.requestedByName === a.decidedByName
      ? `entered by ${a.requestedByName}`
      : [a.requestedByName ? `asked by ${a.requestedByName}` : null, a.decidedByName ? `${a.status === 'declined' ? 'declined' : 'approved'} by ${a.decidedByName}` : null].filter(Boolean).join(', ');
  return (
    <View style={styles.card} testID={`absence-${a.id}`}>
      <View style={styles.head}>
        <Body bold style={{ flex: 1, minWidth: 160 }}>{showName ? `${a.personName} · ${kindWords(a.kind)}` : kindWords(a.kind)}</Body>
        <Tag tone={absenceTones[a.status]}>{STATUS_WORDS[a.status]}</Tag>
      </View>
      <Body>{spanWords(a)}</Body>
      <Body muted>{`${a.status === 'approved' ? creditWords(a) : `would ${creditWords(a)}`}${who ? ` · ${who}` : ''}`}</Body>
      {a.note ? <Body muted>{`Note: ${a.note}`}</Body> : null}
      {a.declineReason ? <Body muted>{`Reason given: ${a.declineReason}`}</Body> : null}
      <View style={styles.row}>
        <Button kind="quiet" label="Change" onPress={() => setEditing(true)} testID={`absence-edit-${a.id}`} />
        {confirm ? (
          <>
            <Button label="Remove it" onPress={() => remove.mutate(a.id)} busy={remove.isPending} testID={`absence-delete-confirm-${a.id}`} />
            <Button kind="quiet" label="Keep" onPress={() => setConfirm(false)} />
          </>
        ) : (
          <Button kind="quiet" label="Remove" onPress={() => setConfirm(true)} testID={`absence-delete-${a.id}`} />
        )}
      </View>
      {remove.error ? <Notice>{remove.error.message}</Notice> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.xs, padding: space.md, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.white },
  editing: { borderColor: colors.thread, gap: space.md },
  head: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, marginTop: space.xs },
});
