import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, radius, space } from '@/constants/theme';
import { useSeatAlternatives } from '@/hooks/api/get-seat-alternatives';
import { usePutPin } from '@/hooks/api/put-pin';
import { useDeletePin } from '@/hooks/api/delete-pin';
import type { RosterDto } from '@/hooks/api/roster-types';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body } from '@/components/ui/typography';
import { Loadable, Pill } from './parts';
import { points } from './format';

/** One seat: who is on it, who else could be and at what score change, how contested it is; pin or unpin. */
export function SeatPanel({ roster, runId, seatId }: { roster: RosterDto; runId: number; seatId: number }) {
  const details = useSeatAlternatives(runId, seatId);
  const pin = usePutPin();
  const unpin = useDeletePin();
  const [all, setAll] = useState(false);
  const frozen = roster.status === 'published';
  const error = pin.error ?? unpin.error;
  return (
    <View style={styles.panel} testID="seat-panel" role="region" aria-label="Seat details">
      <Loadable query={details} label="Seat details">
        {(d) => (
          <View style={{ gap: space.sm }}>
            <Body bold>{`${d.current.name ?? 'Open'} · ${d.shift.words} · ${d.skill ?? 'any skill'}`}</Body>
            <Body muted>{d.contested}</Body>
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
            <Body bold>Alternatives</Body>
            <Body muted style={{ fontSize: 13 }}>{d.methodWords}</Body>
            {d.alternatives.slice(0, all ? undefined : 6).map((a) => (
              <View key={a.personId ?? 'open'} style={styles.alt}>
                <Body style={{ flex: 1, minWidth: 140 }}>{`${a.name ?? 'Leave open'}${a.swapsWithSeatId ? ' (swaps seats)' : ''}`}</Body>
                {a.feasible ? <Pill tone={(a.scoreChange ?? 0) >= 0 ? 'good' : 'warn'}>{Math.abs(a.scoreChange ?? 0) < 0.05 ? 'no change' : `${(a.scoreChange ?? 0) > 0 ? '+' : ''}${points(a.scoreChange)} points`}</Pill> : <Pill tone="bad">breaks a hard rule</Pill>}
                {a.feasible && !frozen ? <Button kind="quiet" label={`Pin ${a.name ?? 'open'}`} onPress={() => pin.mutate({ rosterId: roster.id, seatId, personId: a.personId })} disabled={pin.isPending} /> : null}
                {!a.feasible && a.breaks[0] ? <Body muted style={{ width: '100%', fontSize: 13 }}>{a.breaks[0]}</Body> : null}
              </View>
            ))}
            {!all && d.alternatives.length > 6 ? <Button kind="quiet" label={`Show all ${d.alternatives.length} alternatives`} onPress={() => setAll(true)} testID="seat-show-all" /> : null}
          </View>
        )}
      </Loadable>
    </View>
  );
}

const styles = StyleSheet.create({
  panel: { padding: space.md, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.loom, backgroundColor: colors.white, gap: space.sm },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  alt: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.xs },
});
