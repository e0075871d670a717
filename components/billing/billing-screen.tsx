import { useEffect, useState } from 'react';
import { ActivityIndicator, Linking, Pressable, StyleSheet, View } from 'react-native';
import { useLocalSearchParams } from 'expo-router';
import { format } from 'date-fns';
import { colors, fonts, radius, space } from '@/constants/theme';
import { useSession } from '@/hooks/api/get-session';
import { useBilling, type Billing } from '@/hooks/api/get-billing';
import { useInvoices, type Invoice } from '@/hooks/api/get-invoices';
import { useStartCheckout } from '@/hooks/api/start-checkout';
import { usePreviewSeats } from '@/hooks/api/preview-seats';
import { useUpdateSeats } from '@/hooks/api/update-seats';
import { useCancelSubscription } from '@/hooks/api/cancel-subscription';
import { useOpenBillingPortal } from '@/hooks/api/open-billing-portal';
import { useIsWide } from '@/hooks/use-is-wide';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body, Heading } from '@/components/ui/typography';
import { Section } from '@/components/auth/section';
import { formatMoney, PLANS } from '@/shared/billing/plans';
import { openExternal } from './open-external';

const day = (iso: string | null | undefined) => (iso ? format(new Date(iso), 'd MMM yyyy') : '—');

const STATUS_WORDS: Record<string, string> = {
  none: 'No subscription',
  trialing: 'Free trial',
  active: 'Paid and current',
  past_due: 'Payment overdue',
  canceled: 'Ended',
  incomplete: 'Waiting for the first payment',
  incomplete_expired: 'First payment never arrived',
  unpaid: 'Unpaid',
  paused: 'Paused',
};

/** Admins: the workspace's plan, what it uses against the plan's limits, payment and invoices. */
export function BillingScreen() {
  const { data: session } = useSession();
  const params = useLocalSearchParams<{ checkout?: string }>();
  const returned = params.checkout === 'done';
  const billing = useBilling(returned, session?.role === 'admin');
  if (session && session.role !== 'admin') return <Notice>Only admins of this workspace see its plan and billing.</Notice>;
  return (
    <View style={styles.page}>
      <Heading>Plan & billing</Heading>
      {billing.isPending ? <ActivityIndicator color={colors.loom} accessibilityLabel="Loading the plan" /> : null}
      {billing.error ? <Notice>{`The plan could not be loaded: ${billing.error.message}`}</Notice> : null}
      {billing.data ? (
        <>
          {returned && billing.data.plan.id !== 'team' ? <Notice kind="info">Payment received. Waiting for the payment service to confirm the new plan…</Notice> : null}
          {returned && billing.data.plan.id === 'team' ? <Notice kind="info">{`Welcome to the ${PLANS.team.name} plan.`}</Notice> : null}
          {params.checkout === 'cancelled' ? <Notice kind="info">No payment was made; the plan is unchanged.</Notice> : null}
          <CurrentPlan billing={billing.data} />
          <UsageCard billing={billing.data} />
          {billing.data.plan.id === 'free' ? <UpgradeCard billing={billing.data} /> : <ManageCard billing={billing.data} />}
          {billing.data.seatChange ? <SeatChange key={billing.data.seatChange.to} billing={billing.data} /> : null}
          <Invoices enabled={billing.data.configured} />
        </>
      ) : null}
    </View>
  );
}

function CurrentPlan({ billing }: { billing: Billing }) {
  const sub = billing.subscription;
  let detail = billing.plan.summary;
  if (sub && billing.plan.id === 'team') {
    const price = `${formatMoney(sub.monthlyPrice, sub.currency)} a month for ${sub.quantity} ${sub.quantity === 1 ? 'seat' : 'seats'}`;
    if (billing.status === 'trialing') detail = `${price} once the free trial ends on ${day(sub.trialEnd)}. Nothing is charged before then, and meanwhile the seats follow the number of people by themselves.`;
    else if (sub.cancelAtPeriodEnd) detail = `${price}. The plan ends on ${day(sub.currentPeriodEnd)}; after that the ${PLANS.free.name} limits apply.`;
    else detail = `${price}, renewing on ${day(sub.currentPeriodEnd)}.`;
  }
  return (
    <Section title="Current plan" testID="current-plan">
      <View style={styles.planRow}>
        <Heading level={2} testID="plan-name">
          {billing.plan.name}
        </Heading>
        <View style={[styles.chip, billing.status === 'past_due' && styles.chipDanger]}>
          <Body style={styles.chipText}>{STATUS_WORDS[billing.status] ?? billing.status}</Body>
        </View>
      </View>
      <Body>{detail}</Body>
      {sub && !sub.managedByPaymentService && billing.plan.id === 'team' ? <Body muted>This workspace is on the Team plan without a subscription at the payment service (the demo), so there is nothing to pay or change here.</Body> : null}
    </Section>
  );
}

function Meter({ label, used, limit, testID }: { label: string; used: number; limit: number | null; testID: string }) {
  const full = limit !== null && used >= limit;
  const share = limit === null ? 0 : Math.min(1, used / limit);
  return (
    <View style={styles.meter} testID={testID} accessibilityLabel={`${label}: ${used} of ${limit ?? 'no limit'}`}>
      <View style={styles.meterHead}>
        <Body bold>{label}</Body>
        <Body muted={!full} style={full ? styles.fullText : undefined}>{limit === null ? `${used} · no limit` : `${used} of ${limit}${full ? ' · full' : ''}`}</Body>
      </View>
      {limit !== null ? (
        <View style={styles.track}>
          <View style={[styles.fill, { width: `${Math.round(share * 100)}%` }, full && styles.fillFull]} />
        </View>
      ) : null}
    </View>
  );
}

function UsageCard({ billing }: { billing: Billing }) {
  const full = (billing.limits.people !== null && billing.usage.people >= billing.limits.people) || (billing.limits.activeRosters !== null && billing.usage.activeRosters >= billing.limits.activeRosters);
  return (
    <Section title="Usage" lead="People count as seats. A roster counts as in progress until it is published.">
      <Meter label="People" used={billing.usage.people} limit={billing.limits.people} testID="usage-people" />
      <Meter label="Rosters in progress" used={billing.usage.activeRosters} limit={billing.limits.activeRosters} testID="usage-rosters" />
      {full && billing.plan.id === 'free' ? <Notice kind="caution">{`This workspace has reached a limit of the ${PLANS.free.name} plan. Nothing is lost, but adding more needs the ${PLANS.team.name} plan.`}</Notice> : null}
    </Section>
  );
}

function UpgradeCard({ billing }: { billing: Billing }) {
  const checkout = useStartCheckout();
  const seat = PLANS.team.seatPrice!;
  const seats = Math.max(1, billing.usage.people);
  const go = () => checkout.mutate(undefined, { onSuccess: ({ url }) => openExternal(url) });
  return (
    <Section title={`The ${PLANS.team.name} plan`} lead={PLANS.team.summary} testID="upgrade-card">
      <Body>{`${formatMoney(seat.amount, seat.currency)} per person on your rosters, per month. With ${seats} ${seats === 1 ? 'person' : 'people'} today that is ${formatMoney(seat.amount * seats, seat.currency)} a month; the number follows your team as it changes.`}</Body>
      {billing.canStartTrial ? <Body>{`The first ${PLANS.team.trialDays} days are free; you can stop before anything is charged.`}</Body> : null}
      {!billing.configured ? <Notice kind="caution">Payments are not set up on this server, so the plan cannot be changed here.</Notice> : null}
      {checkout.error ? <Notice>{checkout.error.message}</Notice> : null}
      <Button label={billing.canStartTrial ? `Start the ${PLANS.team.trialDays}-day free trial` : `Move to the ${PLANS.team.name} plan`} onPress={go} busy={checkout.isPending} disabled={!billing.configured} testID="start-checkout" />
    </Section>
  );
}

function ManageCard({ billing }: { billing: Billing }) {
  const portal = useOpenBillingPortal();
  const cancel = useCancelSubscription();
  const sub = billing.subscription;
  if (!sub?.managedByPaymentService) return null;
  return (
    <Section title="Payment and renewal" testID="manage-card">
      <Body muted>Cards, billing address and receipts are kept by the payment service; its page opens in this window and brings you back here.</Body>
      {portal.error ? <Notice>{portal.error.message}</Notice> : null}
      <Button kind="quiet" label={billing.status === 'past_due' ? 'Update the card and pay' : 'Manage payment details'} onPress={() => portal.mutate(undefined, { onSuccess: ({ url }) => openExternal(url) })} busy={portal.isPending} testID="open-portal" />
      {cancel.error ? <Notice>{cancel.error.message}</Notice> : null}
      {sub.cancelAtPeriodEnd ? (
        <Button label={`Keep the ${PLANS.team.name} plan`} onPress={() => cancel.mutate({ atPeriodEnd: false })} busy={cancel.isPending} testID="resume-plan" />
      ) : (
        <Button kind="quiet" label={`Move back to ${PLANS.free.name} on ${day(sub.currentPeriodEnd)}`} onPress={() => cancel.mutate({ atPeriodEnd: true })} busy={cancel.isPending} testID="cancel-plan" />
      )}
    </Section>
  );
}

/** Seat sync on a paid plan: the people count moved; the admin sees the new price before it applies. */
function SeatChange({ billing }: { billing: Billing }) {
  const change = billing.seatChange!;
  const preview = usePreviewSeats();
  const update = useUpdateSeats();
  const [asked, setAsked] = useState(false);
  useEffect(() => {
    if (!asked) {
      setAsked(true);
      preview.mutate({ quantity: change.to });
    }
  }, [asked, change.to, preview]);
  const p = preview.data;
  return (
    <Section title="Seats to update" lead={`You have ${change.to} ${change.to === 1 ? 'person' : 'people'} and pay for ${change.from} ${change.from === 1 ? 'seat' : 'seats'}.`} testID="seat-change">
      {preview.isPending ? <ActivityIndicator color={colors.loom} accessibilityLabel="Working out the new price" /> : null}
      {preview.error ? <Notice>{preview.error.message}</Notice> : null}
      {p ? (
        <View style={styles.priceTable}>
          <Row label="Monthly price now" value={formatMoney(p.currentMonthly, p.currency)} />
          <Row label={`Monthly price with ${p.quantity} seats`} value={formatMoney(p.newMonthly, p.currency)} strong />
          {p.nextInvoice.adjustment !== 0 ? <Row label="Adjustment for the rest of this period" value={formatMoney(p.nextInvoice.adjustment, p.currency)} /> : null}
          <Row label={`Next invoice${p.nextInvoice.date ? ` (${day(p.nextInvoice.date)})` : ''}`} value={formatMoney(p.nextInvoice.amount, p.currency)} />
        </View>
      ) : null}
      {update.error ? <Notice>{update.error.message}</Notice> : null}
      <Button label={`Pay for ${change.to} seats`} onPress={() => update.mutate({ quantity: change.to })} busy={update.isPending} disabled={!p} testID="confirm-seats" />
    </Section>
  );
}

function Row({ label, value, strong }: { label: string; value: string; strong?: boolean }) {
  return (
    <View style={styles.row}>
      <Body muted={!strong} bold={strong} style={styles.rowLabel}>
        {label}
      </Body>
      <Body bold={strong}>{value}</Body>
    </View>
  );
}

const INVOICE_WORDS: Record<Invoice['status'], string> = { paid: 'Paid', open: 'Due', draft: 'Being prepared', uncollectible: 'Not collected', void: 'Cancelled' };

function Invoices({ enabled }: { enabled: boolean }) {
  const invoices = useInvoices(enabled);
  const wide = useIsWide();
  return (
    <Section title="Invoices" testID="invoices">
      {!enabled ? <Body muted>No invoices: payments are not set up on this server.</Body> : null}
      {enabled && invoices.isPending ? <ActivityIndicator color={colors.loom} accessibilityLabel="Loading invoices" /> : null}
      {invoices.error ? <Notice>{`The invoices could not be loaded: ${invoices.error.message}`}</Notice> : null}
      {invoices.data?.length === 0 ? <Body muted>No invoices yet.</Body> : null}
      {invoices.data?.map((i) => (
        <View key={i.id} style={[styles.invoice, wide && styles.invoiceWide]} testID={`invoice-${i.number ?? i.id}`}>
          <View style={styles.invoiceMain}>
            <Body bold>{`${i.number ?? 'Invoice'} · ${day(i.created)}`}</Body>
            <Body muted>{`${day(i.periodStart)} to ${day(i.periodEnd)}`}</Body>
          </View>
          <View style={styles.invoiceSide}>
            <Body bold>{formatMoney(i.total, i.currency)}</Body>
            <View style={[styles.chip, i.status === 'open' && styles.chipDanger]}>
              <Body style={styles.chipText}>{INVOICE_WORDS[i.status] ?? i.status}</Body>
            </View>
            {i.url ? (
              <Pressable role="link" accessibilityLabel={`Open invoice ${i.number ?? i.id}`} onPress={() => void Linking.openURL(i.url!)}>
                <Body style={styles.link}>View</Body>
              </Pressable>
            ) : null}
          </View>
        </View>
      ))}
    </Section>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg, maxWidth: 760, width: '100%' },
  planRow: { flexDirection: 'row', alignItems: 'center', flexWrap: 'wrap', gap: space.md },
  chip: { backgroundColor: colors.loomSoft, borderRadius: radius.sm, paddingHorizontal: space.sm, paddingVertical: 2, alignSelf: 'flex-start' },
  chipDanger: { backgroundColor: colors.dangerSoft },
  chipText: { fontSize: 14, fontFamily: fonts.bodyBold },
  meter: { gap: space.xs },
  meterHead: { flexDirection: 'row', justifyContent: 'space-between', gap: space.md },
  fullText: { color: colors.danger, fontFamily: fonts.bodyBold },
  track: { height: 10, borderRadius: 5, backgroundColor: colors.line, overflow: 'hidden' },
  fill: { height: 10, backgroundColor: colors.loom },
  fillFull: { backgroundColor: colors.thread },
  priceTable: { gap: space.xs },
  row: { flexDirection: 'row', justifyContent: 'space-between', gap: space.md },
  rowLabel: { flexShrink: 1 },
  invoice: { borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.md, gap: space.sm },
  invoiceWide: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'center' },
  invoiceMain: { gap: 2, flexShrink: 1 },
  invoiceSide: { flexDirection: 'row', alignItems: 'center', gap: space.md },
  link: { color: colors.loom, textDecorationLine: 'underline' },
});
