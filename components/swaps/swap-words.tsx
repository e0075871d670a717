/** Words and card styles the swap screens share: a shift in one line, a change's status and tone, a check's findings. */
import { StyleSheet, View } from 'react-native';
import { colors, radius, space } from '@/constants/theme';
import type { ChangeCheck, ShiftRef, SwapDto } from '@/shared/api/swaps';
import { Body } from '@/components/ui/typography';
import { Notice } from '@/components/ui/notice';
import { plainDay } from '@/components/staff/format';

/** "Tue 2 Mar · early 07:00–15:00" */
export const shiftWords = (s: Pick<ShiftRef, 'label' | 'startsLocal' | 'endsLocal'> | null) =>
  s ? `${plainDay(s.startsLocal.slice(0, 10))} · ${s.label} ${s.startsLocal.slice(11, 16)}–${s.endsLocal.slice(11, 16)}` : 'a shift no longer on the roster';

export const SWAP_STATUS_WORDS: Record<SwapDto['status'], string> = {
  proposed: 'Waiting for the colleague',
  accepted: 'Waiting for the coordinator',
  approved: 'Approved',
  refused: 'Refused by the coordinator',
  declined: 'Declined by the colleague',
  withdrawn: 'Withdrawn',
};

export const statusTone = (s: string): 'plain' | 'good' | 'warn' | 'bad' => (s === 'approved' ? 'good' : s === 'proposed' || s === 'accepted' || s === 'open' || s === 'taken' ? 'warn' : s === 'refused' || s === 'declined' ? 'bad' : 'plain');

/** What a change does to the roster, as the check said it: a hard-rule breach first, then the score. */
export function CheckWords({ check, testID }: { check: ChangeCheck; testID?: string }) {
  const [first, ...rest] = check.words;
  return (
    <View style={styles.words} testID={testID}>
      {check.ok ? <Body>{first}</Body> : <Notice>{`Cannot be proposed. ${first}`}</Notice>}
      {rest.map((w, i) => (
        <Body key={i} muted>
          {w}
        </Body>
      ))}
    </View>
  );
}

export const cardStyle = StyleSheet.create({
  card: { gap: space.xs, backgroundColor: colors.card, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.line, padding: space.md },
  head: { flexDirection: 'row', alignItems: 'center', gap: space.sm, flexWrap: 'wrap' },
  actions: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap', marginTop: space.xs },
  page: { gap: space.lg, maxWidth: 760, width: '100%' },
});

const styles = StyleSheet.create({ words: { gap: space.xs } });
