import { useState } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { format, parseISO } from 'date-fns';
import { colors, radius, space } from '@/constants/theme';
import type { LedgerAnswer } from '@/shared/api/ledger';
import { useLedger } from '@/hooks/api/get-ledger';
import { Section } from '@/components/auth/section';
import { ChoiceChips } from '@/components/staff/choice-chips';
import { Notice } from '@/components/ui/notice';
import { Body, Heading } from '@/components/ui/typography';
import { HoursChart, Legend, PeopleChart, PeriodsChart } from './ledger-charts';
import { LedgerSettings } from './ledger-settings';

const day = (date: string) => format(parseISO(date), 'd MMM yyyy');

/**
 * The fairness ledger for coordinators: who worked the nights, weekends, public holidays and
 * unpopular shifts across every published roster, wishes kept, hours against contract, swaps.
 * The next roster reads it: people over their share get fewer such shifts (a weighted term).
 */
export function LedgerScreen() {
  const ledger = useLedger();
  const [who, setWho] = useState<string>('team');
  return (
    <View style={styles.page}>
      <Heading>Ledger</Heading>
      <Body muted>Counts across published rosters, so fair means fair over months, not one period. Someone who worked more nights or weekends than their share in the look-back gets a weighted term on the next roster asking for fewer.</Body>
      {ledger.isPending ? <ActivityIndicator color={colors.loom} accessibilityLabel="Loading the ledger" /> : null}
      {ledger.error ? <Notice>{ledger.error.message}</Notice> : null}
      {ledger.data && ledger.data.periods.length === 0 ? <Notice kind="info">Nothing is published yet, so the ledger is empty.</Notice> : null}
      {ledger.data && ledger.data.periods.length > 0 ? (
        <>
          <Section title="Per person" lead={`${day(ledger.data.from!)} to ${day(ledger.data.to!)}, ${ledger.data.periods.length} published roster${ledger.data.periods.length === 1 ? '' : 's'}.`} testID="ledger-people">
            <Legend />
            <PeopleChart ledger={ledger.data} />
          </Section>
          <Section title="Hours against contract" testID="ledger-hours">
            <HoursChart ledger={ledger.data} />
          </Section>
          <Section title="Period by period" testID="ledger-periods">
            <ChoiceChips label="Whose" choices={[{ value: 'team', label: 'Team' }, ...ledger.data.people.map((p) => ({ value: String(p.personId), label: p.name }))]} value={who} onChange={setWho} testID="ledger-who" />
            <PeriodsChart periods={ledger.data.periods} series={who === 'team' ? ledger.data.team.byPeriod : (ledger.data.people.find((p) => p.personId === Number(who))?.byPeriod ?? [])} testID="ledger-periods-chart" />
            <Legend />
          </Section>
          <Section title="The numbers" testID="ledger-table">
            <LedgerTable ledger={ledger.data} />
          </Section>
        </>
      ) : null}
      <Section title="Holidays and weights" testID="ledger-settings-section">
        <LedgerSettings />
      </Section>
    </View>
  );
}

function LedgerTable({ ledger }: { ledger: LedgerAnswer }) {
  return (
    <View style={{ gap: space.xs }}>
      {ledger.people.map((p) => {
        const t = p.totals;
        const diff = Math.round((t.hours - t.contractHours) * 10) / 10;
        return (
          <View key={p.personId} style={styles.row} testID={`ledger-row-${p.personId}`}>
            <Body bold>{p.name}</Body>
            <Body muted>{`${t.shifts} shifts · ${t.nights} nights · ${t.weekendShifts} weekend · ${t.holidayShifts} holiday · ${t.unpopularShifts} unpopular · wishes ${t.wishesHonoured} kept, ${t.wishesRefused} not · ${t.hours} h of ${t.contractHours} h (${diff >= 0 ? '+' : ''}${diff} h) · ${t.swaps} swap${t.swaps === 1 ? '' : 's'}`}</Body>
          </View>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg, maxWidth: 860, width: '100%' },
  row: { paddingVertical: space.xs, borderBottomWidth: 1, borderBottomColor: colors.line, borderRadius: radius.sm },
});
