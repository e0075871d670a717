import { useState } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { useLocalSearchParams } from 'expo-router';
import { colors, space } from '@/constants/theme';
import type { RunCompare } from '@/shared/api/compare';
import { useRosters } from '@/hooks/api/get-rosters';
import { useRuns } from '@/hooks/api/get-runs';
import { useRunCompare } from '@/hooks/api/get-run-compare';
import { Section } from '@/components/auth/section';
import { ChoiceChips } from '@/components/staff/choice-chips';
import { Notice } from '@/components/ui/notice';
import { Body, Heading } from '@/components/ui/typography';
import { runName } from '@/components/rosters/format';
import { shiftWords } from '@/components/swaps/swap-words';

/** One run's standing on a per-person term, in words: honoured, or broken with its units and points. */
function outcome(o: RunCompare['personRuleTerms'][number]['a'], hard: boolean): string {
  if (o.honoured) return 'honoured';
  return hard ? `broken ${o.units} time${o.units === 1 ? '' : 's'} (hard)` : `not honoured, ${Math.round(o.units * 100) / 100} over, ${pts(o.points ?? 0)} points`;
}

const pts = (x: number) => `${x > 0 ? '+' : x < 0 ? '−' : ''}${Math.abs(Math.round(x * 100) / 100)}`;

/** Any two finished runs of a roster side by side: seats, people, score terms and concessions that differ. */
export function CompareScreen() {
  const params = useLocalSearchParams<{ roster?: string }>();
  const rosters = useRosters();
  const [picked, setPicked] = useState<string | null>(params.roster ?? null);
  const rosterId = picked ? Number(picked) : (rosters.data?.items[0]?.id ?? null);
  const runs = useRuns(rosterId ?? 0);
  const finished = (runs.data ?? []).filter((r) => r.status === 'done' || (r.status === 'cancelled' && r.score !== null));
  const [a, setA] = useState<string | null>(null);
  const [b, setB] = useState<string | null>(null);
  // Until chosen: the two newest finished runs, older on the left.
  const aId = a ? Number(a) : (finished[1]?.id ?? null);
  const bId = b ? Number(b) : (finished[0]?.id ?? null);
  const compare = useRunCompare(rosterId, aId, bId);
  const runChoices = finished.map((r) => ({ value: String(r.id), label: `${runName(r)}${r.parameters.manual ? ' (edited)' : ''}` }));
  return (
    <View style={styles.page}>
      <Heading>Compare two runs</Heading>
      <Body muted>Both runs are scored against the roster as it stands now, so what differs is the runs, not the rules.</Body>
      {rosters.data && rosters.data.items.length > 1 ? (
        <ChoiceChips label="Roster" choices={rosters.data.items.map((r) => ({ value: String(r.id), label: r.name }))} value={rosterId ? String(rosterId) : null} onChange={(v) => { setPicked(v); setA(null); setB(null); }} testID="compare-roster" />
      ) : null}
      {runs.data && finished.length < 2 ? <Notice kind="info">This roster has fewer than two finished runs.</Notice> : null}
      {finished.length >= 2 ? (
        <>
          <Body bold>First run (A)</Body>
          <ChoiceChips label="First run" choices={runChoices} value={aId ? String(aId) : null} onChange={setA} testID="compare-a" />
          <Body bold>Second run (B)</Body>
          <ChoiceChips label="Second run" choices={runChoices} value={bId ? String(bId) : null} onChange={setB} testID="compare-b" />
        </>
      ) : null}
      {aId !== null && aId === bId ? <Notice kind="info">Choose two different runs.</Notice> : null}
      {compare.isFetching ? <ActivityIndicator color={colors.loom} accessibilityLabel="Comparing" /> : null}
      {compare.error ? <Notice>{compare.error.message}</Notice> : null}
      {compare.data ? <CompareResult c={compare.data} /> : null}
    </View>
  );
}

function CompareResult({ c }: { c: RunCompare }) {
  return (
    <View style={{ gap: space.lg }} testID="compare-result">
      <Body testID="compare-score">{`Score A ${Math.round(c.a.score * 100) / 100}, B ${Math.round(c.b.score * 100) / 100} (${pts(c.b.score - c.a.score)} points).`}</Body>
      <Section title={`Seats that changed (${c.seats.length})`} testID="compare-seats">
        {c.seats.length === 0 ? <Body muted>The same people in every seat.</Body> : null}
        {c.seats.map((s) => (
          <Body key={s.seatId}>{`${shiftWords(s)}: ${s.a?.name ?? 'open'} → ${s.b?.name ?? 'open'}`}</Body>
        ))}
      </Section>
      <Section title={`People affected (${c.people.length})`} testID="compare-people">
        {c.people.map((p) => (
          <Body key={p.id}>{`${p.name}: ${p.gained} seat${p.gained === 1 ? '' : 's'} more in B, ${p.lost} fewer`}</Body>
        ))}
      </Section>
      <Section title="Score terms that moved" testID="compare-terms">
        {c.terms.length === 0 ? <Body muted>No score term moved.</Body> : null}
        {c.terms.map((t) => (
          <Body key={t.term}>{`${t.label}: ${Math.round(t.a * 100) / 100} → ${Math.round(t.b * 100) / 100} (${pts(t.change)})`}</Body>
        ))}
        {c.personTerms.length ? <Body bold>Per person (rules, wishes and pairings)</Body> : null}
        {c.personTerms.map((t) => (
          <Body key={`${t.id}-${t.term}`} muted>{`${t.name}, ${t.label}: ${pts(t.change)}`}</Body>
        ))}
      </Section>
      <Section title={`Per-person terms (${c.personRuleTerms.length})`} testID="compare-person-terms">
        {c.personRuleTerms.length === 0 ? <Body muted>Nobody on this roster has a term of their own.</Body> : null}
        {c.personRuleTerms.map((t) => (
          <View key={`${t.id}-${t.index}`} style={styles.term} role="group" aria-label={`${t.name}: ${t.words}`} testID={`compare-person-term-${t.id}-${t.index}`}>
            <Body bold>{`${t.name}: ${t.words}`}</Body>
            <Body>{`A ${outcome(t.a, t.hard)} · B ${outcome(t.b, t.hard)}${t.change !== null && Math.abs(t.change) > 1e-9 ? ` (${pts(t.change)} points)` : ''}`}</Body>
            {t.b.breaches.slice(0, 2).map((m, i) => (
              <Body key={i} muted style={{ fontSize: 13 }}>{`In B: ${m}`}</Body>
            ))}
          </View>
        ))}
      </Section>
      <Section title="Concessions" testID="compare-concessions">
        {c.concessionsAdded.length + c.concessionsRemoved.length === 0 ? <Body muted>Both runs give up the same.</Body> : null}
        {c.concessionsAdded.map((v, i) => (
          <Body key={`add-${i}`}>{`Added in B: ${v.message} (${pts(v.points)})`}</Body>
        ))}
        {c.concessionsRemoved.map((v, i) => (
          <Body key={`rem-${i}`}>{`Gone in B: ${v.message} (${pts(-v.points)})`}</Body>
        ))}
      </Section>
    </View>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg, maxWidth: 860, width: '100%' },
  term: { gap: 2, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.xs },
});
