import { useState } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { colors, radius, space } from '@/constants/theme';
import { useSeatAlternatives } from '@/hooks/api/get-seat-alternatives';
import { useRecordPickedAlternative } from '@/hooks/api/record-picked-alternative';
import { usePutPin } from '@/hooks/api/put-pin';
import { useDeletePin } from '@/hooks/api/delete-pin';
import type { RosterDto, SeatAlternative, SeatContestAnswer } from '@/hooks/api/roster-types';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body } from '@/components/ui/typography';
import { Pill } from './panel';
import { points } from './format';

const signed = (x: number) => (Math.abs(x) < 0.05 ? '0.0' : `${x > 0 ? '+' : ''}${points(x)}`);
const share = (p: number) => (p >= 0.995 ? 'over 99\u00a0%' : p < 0.01 ? 'under 1\u00a0%' : `${Math.round(p * 100)}\u00a0%`);
const change = (x: number) => (Math.abs(x) < 0.05 ? 'no change' : `${signed(x)} points`);

/** The figures of one alternative in words: what was found, and at most what the bound allows. */
export function alternativeWords(a: SeatAlternative): string {
  const who = a.name ?? 'the seat left open';
  if (!a.evaluated) {
    if (a.impossible) return `No roster keeps every hard rule with ${who} here (proved).`;
    return `Not tried in the time allowed${a.scoreChangeAtMost === null ? '.' : `; at most ${signed(a.scoreChangeAtMost)} (bound).`}`;
  }
  if (!a.feasible) {
    return a.impossible ? `No roster keeps every hard rule with ${who} here.` : `No roster keeping every hard rule was found with ${who} here${a.breaks[0] ? `: ${a.breaks[0]}` : '.'}`;
  }
  const moved = a.otherSeatsMoved ? ` ${a.otherSeatsMoved} other seat${a.otherSeatsMoved === 1 ? '' : 's'} change.` : ' No other seat changes.';
  if (a.exact) return `Best roster with ${who} here: ${change(a.scoreChange ?? 0)} (exact).${moved}`;
  const bound = a.scoreChangeAtMost === null ? '' : `; at most ${signed(a.scoreChangeAtMost)} (bound)`;
  return `Best roster found with ${who} here: ${change(a.scoreChange ?? 0)}${bound}.${moved}`;
}

/** The methods by name, behind a toggle: worth knowing, not worth leading with. */
function MethodDetail({ words }: { words: string }) {
  const [open, setOpen] = useState(false);
  if (!words) return null;
  return (
    <View style={{ gap: space.xs }}>
      <Button kind="quiet" label={open ? 'Hide the method' : 'How this was worked out'} onPress={() => setOpen(!open)} testID="seat-panel-method-toggle" />
      {open ? <Body muted style={{ fontSize: 13 }} testID="seat-panel-method-detail">{words}</Body> : null}
    </View>
  );
}

/** How much of the model's weight keeps the holder here, as a bar with the same words for screen readers. */
function ContestMeter({ contest, holder }: { contest: SeatContestAnswer; holder: string | null }) {
  const p = holder === null ? contest.holderProbability : contest.holderOnShiftProbability;
  const label = `${share(p)} of good rosters ${holder === null ? 'leave this seat open' : `put ${holder} on this shift`}${contest.exact ? '' : ' (approximate)'}`;
  return (
    <View style={styles.meter} role="meter" aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(p * 100)} aria-label={label} testID="seat-panel-meter">
      <View style={[styles.meterFill, { width: `${Math.max(2, Math.round(p * 100))}%`, backgroundColor: p >= 0.9 ? colors.ok : p >= 0.5 ? colors.loom : colors.thread }]} />
    </View>
  );
}

/** One seat: who is on it, who else could be and at what score change (max-marginals), how contested it is; pin or unpin. */
export function SeatPanel({ roster, runId, seatId }: { roster: RosterDto; runId: number; seatId: number }) {
  const details = useSeatAlternatives(runId, seatId);
  const pin = usePutPin();
  const unpin = useDeletePin();
  // picking an alternative is an edit the weight suggestion learns from (server/learning)
  const picked = useRecordPickedAlternative();
  const [all, setAll] = useState(false);
  const frozen = roster.status === 'published';
  const error = pin.error ?? unpin.error;
  const d = details.data;
  return (
    <View style={styles.panel} testID="seat-panel" role="region" aria-label="Seat details">
      {details.error ? (
        <View style={{ gap: space.sm }}>
          <Notice>{`Seat details could not be loaded: ${details.error.message}`}</Notice>
          <Button kind="quiet" label="Try again" onPress={() => void details.refetch()} testID="seat-panel-retry" />
        </View>
      ) : !d ? (
        <View style={styles.loading} aria-busy testID="seat-panel-loading">
          <ActivityIndicator color={colors.loom} accessibilityLabel="Working out the alternatives for this seat" />
          <Body muted>Working out the alternatives: each choice is tried in a whole roster, so this takes a moment.</Body>
        </View>
      ) : (
        <View style={{ gap: space.sm }}>
          <Body bold>{`${d.current.name ?? 'Open'} · ${d.shift.words} · ${d.skill ?? 'any skill'}`}</Body>
          {d.contest && d.contest.holderProbability < 1 ? <ContestMeter contest={d.contest} holder={d.current.name} /> : null}
          <Body muted testID="seat-panel-contested">{d.contested}</Body>
          {d.pinned ? <Pill tone="good">{`Pinned to ${d.pinned.personId === null ? 'open' : (d.alternatives.find((a) => a.personId === d.pinned!.personId)?.name ?? d.current.name ?? 'this person')}`}</Pill> : null}
          <View style={styles.actions}>
            {d.pinned ? (
              <Button kind="quiet" label="Unpin this seat" onPress={() => unpin.mutate({ rosterId: roster.id, seatId })} busy={unpin.isPending} disabled={frozen} testID="seat-unpin" />
            ) : (
              <Button label={`Pin ${d.current.name ?? 'open'} here`} onPress={() => pin.mutate({ rosterId: roster.id, seatId, personId: d.current.personId })} busy={pin.isPending} disabled={frozen} testID="seat-pin" />
            )}
          </View>
          {pin.isSuccess || unpin.isSuccess ? <Notice kind="info">{pin.isSuccess ? 'Pinned. The next run keeps this seat as it is; solve again to use it.' : 'Unpinned. The next run may change this seat.'}</Notice> : null}
          {error ? <Notice>{error.message}</Notice> : null}
          {d.ignoredPinsWords ? <Notice kind="info">{d.ignoredPinsWords}</Notice> : null}
          <Body bold>Alternatives</Body>
          <Body muted style={{ fontSize: 13 }} testID="seat-panel-method">{d.methodWords}</Body>
          <MethodDetail words={d.methodDetail} />
          {d.alternatives.length === 0 ? <Body muted>Nobody else may take this seat (skills, pins and "cannot" wishes leave no other choice).</Body> : null}
          {d.alternatives.slice(0, all ? undefined : 6).map((a) => {
            const words = alternativeWords(a);
            return (
              <View key={a.personId ?? 'open'} style={styles.alt} role="group" aria-label={words} testID={`seat-panel-alt-${a.personId ?? 'open'}`}>
                <Body style={{ flex: 1, minWidth: 140 }}>{a.name ?? 'Leave open'}</Body>
                {a.feasible ? (
                  <Pill tone={(a.scoreChange ?? 0) >= -0.05 ? 'good' : 'warn'}>{change(a.scoreChange ?? 0)}</Pill>
                ) : a.evaluated || a.impossible ? (
                  <Pill tone="bad">breaks a hard rule</Pill>
                ) : (
                  <Pill>not tried</Pill>
                )}
                {a.feasible && !frozen ? <Button kind="quiet" label={a.name ? `Pin ${a.name}` : 'Pin it open'} onPress={() => { pin.mutate({ rosterId: roster.id, seatId, personId: a.personId }); picked.mutate({ rosterId: roster.id, runId, seatId, personId: a.personId }); }} disabled={pin.isPending} /> : null}
                <Body muted style={{ width: '100%', fontSize: 13 }}>{words}</Body>
              </View>
            );
          })}
          {!all && d.alternatives.length > 6 ? <Button kind="quiet" label={`Show all ${d.alternatives.length} alternatives`} onPress={() => setAll(true)} testID="seat-show-all" /> : null}
        </View>
      )}
    </View>
  );
}

const styles = StyleSheet.create({
  panel: { padding: space.md, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.loom, backgroundColor: colors.white, gap: space.sm },
  loading: { padding: space.md, alignItems: 'center', gap: space.sm },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  alt: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.xs },
  meter: { height: 8, borderRadius: 4, backgroundColor: colors.loomSoft, overflow: 'hidden' },
  meterFill: { height: 8, borderRadius: 4 },
});
