import { ActivityIndicator, View } from 'react-native';
import { colors } from '@/constants/theme';
import type { OfferDto, SwapDto } from '@/shared/api/swaps';
import { useSession } from '@/hooks/api/get-session';
import { useMySwaps } from '@/hooks/api/get-my-swaps';
import { useMyOffers } from '@/hooks/api/get-my-offers';
import { useAcceptSwap } from '@/hooks/api/accept-swap';
import { useDeclineSwap } from '@/hooks/api/decline-swap';
import { useWithdrawSwap } from '@/hooks/api/withdraw-swap';
import { useTakeOffer } from '@/hooks/api/take-offer';
import { Section } from '@/components/auth/section';
import { Tag } from '@/components/people/inline-controls';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body, Heading } from '@/components/ui/typography';
import { CheckWords, SWAP_STATUS_WORDS, cardStyle, shiftWords, statusTone } from './swap-words';
import { SwapForm } from './swap-form';

/** Staff: swap or give away a published shift, answer colleagues' swaps, take open shifts. */
export function MySwapsScreen() {
  const session = useSession();
  const swaps = useMySwaps();
  const offers = useMyOffers();
  const me = session.data?.personId ?? null;
  const askedOfMe = (swaps.data ?? []).filter((s) => s.colleague.id === me && s.status === 'proposed');
  const rest = (swaps.data ?? []).filter((s) => !askedOfMe.includes(s));
  return (
    <View style={cardStyle.page}>
      <Heading>Swaps</Heading>
      <Body muted>Swap a published shift with a colleague, give one away, or take a shift your coordinator has opened. Rotaloom checks every hard rule first; your coordinator approves, and both of you get an e-mail.</Body>
      {swaps.isPending || offers.isPending ? <ActivityIndicator color={colors.loom} accessibilityLabel="Loading swaps" /> : null}
      {swaps.error ? <Notice>{swaps.error.message}</Notice> : null}
      {offers.error ? <Notice>{offers.error.message}</Notice> : null}
      <Section title="Asked of you" testID="swaps-asked">
        {askedOfMe.length === 0 ? <Body muted>No one has asked you to swap.</Body> : askedOfMe.map((s) => <SwapCard key={s.id} swap={s} me={me} />)}
      </Section>
      <Section title="Open shifts for you" testID="offers-for-me">
        {(offers.data ?? []).length === 0 ? <Body muted>No open shifts are offered to you.</Body> : offers.data!.map((o) => <OfferCard key={o.id} offer={o} me={me} />)}
      </Section>
      <Section title="Swap or give away a shift" testID="swap-section">
        <SwapForm />
      </Section>
      {rest.length > 0 ? (
        <Section title="Your swaps" testID="swaps-mine">
          {rest.map((s) => (
            <SwapCard key={s.id} swap={s} me={me} />
          ))}
        </Section>
      ) : null}
    </View>
  );
}

function SwapCard({ swap: s, me }: { swap: SwapDto; me: number | null }) {
  const accept = useAcceptSwap();
  const decline = useDeclineSwap();
  const withdraw = useWithdrawSwap();
  const mine = s.proposer.id === me;
  const error = accept.error ?? decline.error ?? withdraw.error;
  const what =
    s.kind === 'swap'
      ? mine
        ? `You give ${shiftWords(s.proposerShift)} to ${s.colleague.name} and take ${shiftWords(s.colleagueShift)}.`
        : `${s.proposer.name} gives you ${shiftWords(s.proposerShift)} and takes your ${shiftWords(s.colleagueShift)}.`
      : mine
        ? `You give ${shiftWords(s.proposerShift)} to ${s.colleague.name}.`
        : `${s.proposer.name} offers you ${shiftWords(s.proposerShift)}.`;
  return (
    <View style={cardStyle.card} testID={`swap-${s.id}`}>
      <View style={cardStyle.head}>
        <Body bold style={{ flex: 1 }}>{s.kind === 'swap' ? 'Swap' : 'Giveaway'}</Body>
        <Tag tone={statusTone(s.status)}>{SWAP_STATUS_WORDS[s.status]}</Tag>
      </View>
      <Body>{what}</Body>
      <CheckWords check={s.check} />
      <View style={cardStyle.actions}>
        {!mine && s.status === 'proposed' ? (
          <>
            <Button label="Accept" onPress={() => accept.mutate({ id: s.id, version: s.version })} busy={accept.isPending} testID={`swap-accept-${s.id}`} />
            <Button kind="quiet" label="Decline" onPress={() => decline.mutate({ id: s.id, version: s.version })} busy={decline.isPending} testID={`swap-decline-${s.id}`} />
          </>
        ) : null}
        {mine && (s.status === 'proposed' || s.status === 'accepted') ? <Button kind="quiet" label="Withdraw" onPress={() => withdraw.mutate({ id: s.id, version: s.version })} busy={withdraw.isPending} testID={`swap-withdraw-${s.id}`} /> : null}
      </View>
      {error ? <Notice>{error.message}</Notice> : null}
    </View>
  );
}

function OfferCard({ offer: o, me }: { offer: OfferDto; me: number | null }) {
  const take = useTakeOffer();
  const mine = o.taker?.id === me;
  return (
    <View style={cardStyle.card} testID={`offer-${o.id}`}>
      <View style={cardStyle.head}>
        <Body bold style={{ flex: 1 }}>{shiftWords(o.shift)}</Body>
        <Tag tone={statusTone(o.status)}>{o.status === 'open' ? 'Open' : mine ? (o.status === 'approved' ? 'Yours' : 'Waiting for the coordinator') : 'Taken'}</Tag>
      </View>
      <Body muted>{`${o.rosterName}${o.skill ? ` · needs ${o.skill}` : ''}`}</Body>
      {o.status === 'open' ? <Button label="Take this shift" onPress={() => take.mutate(o.id)} busy={take.isPending} testID={`offer-take-${o.id}`} /> : null}
      {take.error ? <Notice>{take.error.message}</Notice> : null}
    </View>
  );
}
