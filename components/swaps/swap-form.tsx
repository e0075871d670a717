import { useEffect, useState } from 'react';
import { ActivityIndicator, View } from 'react-native';
import { colors, space } from '@/constants/theme';
import type { SwapProposal } from '@/shared/api/swaps';
import { useSwapOptions } from '@/hooks/api/get-swap-options';
import { useCheckSwap } from '@/hooks/api/check-swap';
import { useProposeSwap } from '@/hooks/api/propose-swap';
import { ChoiceChips } from '@/components/staff/choice-chips';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body } from '@/components/ui/typography';
import { CheckWords, shiftWords } from './swap-words';

/**
 * Pick one of my shifts, a colleague and (for a swap) one of theirs on the same roster. The
 * change is checked as soon as it is complete, so a swap that breaks a hard rule is never sent:
 * the button stays off and the reason is on screen.
 */
export function SwapForm() {
  const options = useSwapOptions();
  const check = useCheckSwap();
  const propose = useProposeSwap();
  const [kind, setKind] = useState<'swap' | 'giveaway'>('swap');
  const [mine, setMine] = useState<string | null>(null);
  const [colleague, setColleague] = useState<string | null>(null);
  const [theirs, setTheirs] = useState<string | null>(null);
  const [sent, setSent] = useState(false);
  const myShift = options.data?.mine.find((s) => String(s.seatId) === mine);
  const them = options.data?.colleagues.find((c) => String(c.id) === colleague);
  const theirShifts = them?.shifts.filter((s) => s.rosterId === myShift?.rosterId) ?? [];
  const body: SwapProposal | null =
    mine && colleague && (kind === 'giveaway' || theirs) ? { kind, mySeatId: Number(mine), colleagueId: Number(colleague), ...(kind === 'swap' ? { theirSeatId: Number(theirs) } : {}) } : null;
  const key = JSON.stringify(body);
  const { mutate: runCheck, reset } = check;
  useEffect(() => {
    reset();
    if (body) runCheck(body);
  }, [key, runCheck, reset]); // body is keyed by its JSON

  if (options.isPending) return <ActivityIndicator color={colors.loom} accessibilityLabel="Loading your shifts" />;
  if (options.error) return <Notice>{options.error.message}</Notice>;
  if (options.data.mine.length === 0) return <Body muted>You have no shifts to come on a published roster.</Body>;
  return (
    <View style={{ gap: space.md }} testID="swap-form">
      <ChoiceChips label="What to do" choices={[{ value: 'swap', label: 'Swap with a colleague' }, { value: 'giveaway', label: 'Give a shift away' }]} value={kind} onChange={(v) => { setKind(v); setTheirs(null); setSent(false); }} testID="swap-kind" />
      <Body bold>Your shift</Body>
      <ChoiceChips label="Your shift" choices={options.data.mine.map((s) => ({ value: String(s.seatId), label: shiftWords(s) }))} value={mine} onChange={(v) => { setMine(v); setTheirs(null); setSent(false); }} testID="swap-mine" />
      <Body bold>Colleague</Body>
      <ChoiceChips label="Colleague" choices={options.data.colleagues.map((c) => ({ value: String(c.id), label: c.name }))} value={colleague} onChange={(v) => { setColleague(v); setTheirs(null); setSent(false); }} testID="swap-colleague" />
      {kind === 'swap' && colleague && mine ? (
        <>
          <Body bold>{`${them?.name ?? 'Their'}'s shift you take`}</Body>
          {theirShifts.length === 0 ? <Body muted>{`${them?.name} has no shifts to come on this roster.`}</Body> : <ChoiceChips label="Their shift" choices={theirShifts.map((s) => ({ value: String(s.seatId), label: shiftWords(s) }))} value={theirs} onChange={(v) => { setTheirs(v); setSent(false); }} testID="swap-theirs" />}
        </>
      ) : null}
      {check.isPending ? <ActivityIndicator color={colors.loom} accessibilityLabel="Checking the rules" /> : null}
      {check.error ? <Notice>{check.error.message}</Notice> : null}
      {check.data ? <CheckWords check={check.data} testID="swap-check" /> : null}
      <Button
        label={kind === 'swap' ? 'Propose this swap' : 'Offer this shift'}
        disabled={!body || !check.data?.ok || sent}
        busy={propose.isPending}
        onPress={() => body && propose.mutate(body, { onSuccess: () => setSent(true) })}
        testID="swap-propose"
      />
      {propose.error ? <Notice>{propose.error.message}</Notice> : null}
      {sent ? <Notice kind="info">{`Sent to ${them?.name}. Once they accept, your coordinator approves it.`}</Notice> : null}
    </View>
  );
}
