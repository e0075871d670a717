import { useState } from 'react';
import { ActivityIndicator, View } from 'react-native';
import { colors } from '@/constants/theme';
import type { OfferDto, OpenSeatDto, SwapDto } from '@/shared/api/swaps';
import { useRosters } from '@/hooks/api/get-rosters';
import { useSwaps } from '@/hooks/api/get-swaps';
import { useDecideSwap, type ChangeMail } from '@/hooks/api/decide-swap';
import { useOpenSeats } from '@/hooks/api/get-open-seats';
import { useRosterOffers } from '@/hooks/api/get-roster-offers';
import { useCreateOffer } from '@/hooks/api/create-offer';
import { useDecideOffer } from '@/hooks/api/decide-offer';
import { Section } from '@/components/auth/section';
import { Tag } from '@/components/people/inline-controls';
import { ChoiceChips } from '@/components/staff/choice-chips';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body, Heading } from '@/components/ui/typography';
import { CheckWords, SWAP_STATUS_WORDS, cardStyle, shiftWords, statusTone } from './swap-words';

const mailWords = (m: ChangeMail | null | undefined) =>
  m ? `Approved. The published roster is updated; ${m.sent} e-mail${m.sent === 1 ? '' : 's'} sent${m.noAddress.length ? `; no address for ${m.noAddress.join(', ')}` : ''}${m.failed ? `; ${m.failed} failed` : ''}.` : 'Done.';

/** Coordinators: swaps waiting for approval (one tap each), and open seats of published rosters to offer. */
export function TeamChangesScreen() {
  const swaps = useSwaps();
  const waiting = (swaps.data ?? []).filter((s) => s.status === 'accepted');
  const others = (swaps.data ?? []).filter((s) => s.status !== 'accepted').slice(0, 20);
  // A decided card leaves its list (and unmounts before mutate's own callbacks would run), so what happened is said here.
  const [done, setDone] = useState<string | null>(null);
  return (
    <View style={cardStyle.page}>
      <Heading>Swaps and open shifts</Heading>
      <Body muted>Staff swap and give away published shifts; a change reaches you only once the colleague agreed and every hard rule holds. Approving updates the published roster and e-mails the people whose shifts changed.</Body>
      {swaps.isPending ? <ActivityIndicator color={colors.loom} accessibilityLabel="Loading swaps" /> : null}
      {swaps.error ? <Notice>{swaps.error.message}</Notice> : null}
      {done ? <Notice kind="info">{done}</Notice> : null}
      <Section title="Waiting for you" testID="swaps-waiting">
        {waiting.length === 0 ? <Body muted>No swaps are waiting for approval.</Body> : waiting.map((s) => <SwapToDecide key={s.id} swap={s} onDone={setDone} />)}
      </Section>
      <OpenShifts onDone={setDone} />
      {others.length > 0 ? (
        <Section title="Recent swaps" testID="swaps-recent">
          {others.map((s) => (
            <View key={s.id} style={cardStyle.card}>
              <View style={cardStyle.head}>
                <Body bold style={{ flex: 1 }}>{`${s.proposer.name} → ${s.colleague.name}`}</Body>
                <Tag tone={statusTone(s.status)}>{SWAP_STATUS_WORDS[s.status]}</Tag>
              </View>
              <Body muted>{s.kind === 'swap' ? `${shiftWords(s.proposerShift)} for ${shiftWords(s.colleagueShift)}` : shiftWords(s.proposerShift)}</Body>
            </View>
          ))}
        </Section>
      ) : null}
    </View>
  );
}

function SwapToDecide({ swap: s, onDone }: { swap: SwapDto; onDone: (words: string) => void }) {
  const decide = useDecideSwap();
  return (
    <View style={cardStyle.card} testID={`swap-decide-${s.id}`}>
      <Body bold>{s.kind === 'swap' ? `${s.proposer.name} and ${s.colleague.name} swap` : `${s.proposer.name} gives a shift to ${s.colleague.name}`}</Body>
      <Body>{s.kind === 'swap' ? `${s.proposer.name}: ${shiftWords(s.proposerShift)} → ${s.colleague.name}; ${s.colleague.name}: ${shiftWords(s.colleagueShift)} → ${s.proposer.name}.` : `${shiftWords(s.proposerShift)} → ${s.colleague.name}.`}</Body>
      <Body muted>{s.rosterName}</Body>
      <CheckWords check={s.check} />
      <View style={cardStyle.actions}>
        <Button label="Approve" onPress={() => decide.mutateAsync({ id: s.id, decision: 'approve', version: s.version }).then((r) => onDone(mailWords(r.mail)), () => undefined)} busy={decide.isPending && decide.variables?.decision === 'approve'} testID={`swap-approve-${s.id}`} />
        <Button kind="quiet" label="Refuse" onPress={() => decide.mutateAsync({ id: s.id, decision: 'refuse', version: s.version }).then(() => onDone('Refused. The published roster stays as it was.'), () => undefined)} busy={decide.isPending && decide.variables?.decision === 'refuse'} testID={`swap-refuse-${s.id}`} />
      </View>
      {decide.error ? <Notice>{decide.error.message}</Notice> : null}
    </View>
  );
}

function OpenShifts({ onDone }: { onDone: (words: string) => void }) {
  const rosters = useRosters();
  const published = (rosters.data?.items ?? []).filter((r) => r.status === 'published');
  const [picked, setPicked] = useState<string | null>(null);
  const rosterId = picked ? Number(picked) : (published[0]?.id ?? null);
  const seats = useOpenSeats(rosterId);
  const offers = useRosterOffers(rosterId);
  const taken = (offers.data ?? []).filter((o) => o.status === 'taken');
  return (
    <Section title="Open shifts" lead="Uncovered seats of a published roster still to come. Each person is checked against every hard rule for the seat; the first eligible person to take it gets it once you approve." testID="open-shifts">
      {published.length === 0 ? <Body muted>No roster is published.</Body> : null}
      {published.length > 1 ? <ChoiceChips label="Roster" choices={published.map((r) => ({ value: String(r.id), label: r.name }))} value={rosterId ? String(rosterId) : null} onChange={setPicked} /> : null}
      {seats.error ? <Notice>{seats.error.message}</Notice> : null}
      {taken.map((o) => (
        <OfferToDecide key={o.id} offer={o} onDone={onDone} />
      ))}
      {seats.data && seats.data.length === 0 ? <Body muted>Every seat to come is covered.</Body> : null}
      {(seats.data ?? []).map((s) => (
        <OpenSeat key={s.seatId} rosterId={rosterId!} seat={s} offer={offers.data?.find((o) => o.id === s.offerId) ?? null} />
      ))}
    </Section>
  );
}

function OpenSeat({ rosterId, seat: s, offer }: { rosterId: number; seat: OpenSeatDto; offer: OfferDto | null }) {
  const create = useCreateOffer();
  return (
    <View style={cardStyle.card} testID={`open-seat-${s.seatId}`}>
      <View style={cardStyle.head}>
        <Body bold style={{ flex: 1 }}>{shiftWords(s.shift)}</Body>
        {offer ? <Tag tone="warn">{offer.status === 'open' ? 'On offer' : 'Taken'}</Tag> : null}
      </View>
      {s.skill ? <Body muted>{`Needs ${s.skill}`}</Body> : null}
      <Body>{s.eligible.length ? `Eligible: ${s.eligible.map((p) => p.name).join(', ')}.` : 'Nobody can take it without breaking a hard rule.'}</Body>
      {s.ineligible.slice(0, 6).map((p) => (
        <Body key={p.id} muted>{`Not eligible: ${p.reason}`}</Body>
      ))}
      {s.ineligible.length > 6 ? <Body muted>{`… and ${s.ineligible.length - 6} more who cannot.`}</Body> : null}
      {!offer && s.eligible.length ? <Button label={`Offer to ${s.eligible.length} eligible`} onPress={() => create.mutate({ rosterId, seatId: s.seatId })} busy={create.isPending} testID={`offer-seat-${s.seatId}`} /> : null}
      {create.error ? <Notice>{create.error.message}</Notice> : null}
    </View>
  );
}

function OfferToDecide({ offer: o, onDone }: { offer: OfferDto; onDone: (words: string) => void }) {
  const decide = useDecideOffer();
  return (
    <View style={cardStyle.card} testID={`offer-decide-${o.id}`}>
      <Body bold>{`${o.taker?.name} takes ${shiftWords(o.shift)}`}</Body>
      {o.check ? <CheckWords check={o.check} /> : null}
      <View style={cardStyle.actions}>
        <Button label="Approve" onPress={() => decide.mutateAsync({ id: o.id, decision: 'approve', version: o.version }).then((r) => onDone(mailWords(r.mail)), () => undefined)} busy={decide.isPending} testID={`offer-approve-${o.id}`} />
        <Button kind="quiet" label="Refuse" onPress={() => decide.mutateAsync({ id: o.id, decision: 'refuse', version: o.version }).then(() => onDone('Refused. The seat stays open.'), () => undefined)} disabled={decide.isPending} testID={`offer-refuse-${o.id}`} />
      </View>
      {decide.error ? <Notice>{decide.error.message}</Notice> : null}
    </View>
  );
}
