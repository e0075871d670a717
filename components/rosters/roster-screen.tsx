import { useMemo, useState } from 'react';
import { Link, useLocalSearchParams } from 'expo-router';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';
import { useRoster } from '@/hooks/api/get-roster';
import { useRuns } from '@/hooks/api/get-runs';
import { Notice } from '@/components/ui/notice';
import { Body, Heading } from '@/components/ui/typography';
import { Loadable, Pill } from './panel';
import { periodWords } from './format';
import { SetupSection } from './setup-section';
import { RulesSection } from './rules-section';
import { SuggestionSection } from './suggestion-section';
import { WishesSection } from './wishes-section';
import { SolveSection } from './solve-section';
import { ResultSection } from './result-section';
import { EditSection } from './edit-section';
import { PublishSection } from './publish-section';
import { CopyForwardPanel } from './copy-forward-panel';
import { LinkButton } from '@/components/people/inline-controls';
import { Button } from '@/components/ui/button';
import { CautionLine } from '@/components/ui/caution-line';

const SECTIONS = [
  { key: 'setup', label: 'Shifts' },
  { key: 'rules', label: 'Rules' },
  { key: 'wishes', label: 'Wishes' },
  { key: 'solve', label: 'Solve' },
  { key: 'result', label: 'Result' },
  { key: 'edit', label: 'Edit' },
  { key: 'publish', label: 'Publish' },
] as const;
type SectionKey = (typeof SECTIONS)[number]['key'];

/** One roster: set up, rules, solve with progress, the result and its trade-offs, hand edits, publish. */
export function RosterScreen() {
  const params = useLocalSearchParams<{ rosterId: string; section?: string }>();
  const rosterId = Number(params.rosterId);
  const roster = useRoster(rosterId);
  const runs = useRuns(rosterId);
  const [section, setSection] = useState<SectionKey>((SECTIONS.find((s) => s.key === params.section)?.key ?? 'setup') as SectionKey);
  const [chosenRun, setChosenRun] = useState<number | null>(null);
  const [copying, setCopying] = useState(false);
  // The run the result, edit and publish sections look at: the one picked, else the newest with a roster.
  const latestFinished = useMemo(() => runs.data?.find((r) => r.status === 'done' || (r.status === 'cancelled' && r.score !== null))?.id ?? null, [runs.data]);
  const runId = chosenRun ?? latestFinished;

  if (!Number.isInteger(rosterId) || rosterId < 1) return <Notice>This address names no roster.</Notice>;
  return (
    <Loadable query={roster} label="The roster">
      {(r) => (
        <View style={styles.page}>
          <Link href="/rosters" style={styles.back}>
            ‹ All rosters
          </Link>
          <View style={styles.head}>
            <View style={{ flex: 1, minWidth: 200 }}>
              <Heading style={styles.title}>{r.name}</Heading>
              <Body muted>{`${periodWords(r.periodStart, r.periodEnd)} · ${r.timeZone}`}</Body>
            </View>
            <Pill tone={r.status === 'published' ? 'good' : r.status === 'solved' ? 'warn' : 'plain'}>{r.status}</Pill>
            {!copying ? <Button kind="quiet" label="Copy forward…" onPress={() => setCopying(true)} testID="copy-forward-open-panel" /> : null}
            <LinkButton href={`/compare?roster=${r.id}`} label="Compare runs" testID="compare-runs-link" />
          </View>
          {copying ? <CopyForwardPanel key={r.id} roster={r} onClose={() => setCopying(false)} /> : null}
          {/* Once for every tab of the roster (fix 13), instead of a band on each. */}
          <CautionLine testID="roster-caution" />
          {r.status === 'published' ? <Notice kind="info">Published and frozen: shifts, rules, pins and runs are locked until you reopen it (Publish).</Notice> : null}
          {/* Every tab in view: they wrap to a second row on a phone instead of scrolling off the edge. */}
          <View style={styles.tabs} role="tablist" aria-label="Roster sections" testID="roster-tabs">
            {SECTIONS.map((s) => (
              <Pressable key={s.key} role="tab" aria-selected={section === s.key} onPress={() => setSection(s.key)} style={[styles.tab, section === s.key && styles.tabOn]} testID={`section-${s.key}`}>
                <Text style={[styles.tabText, section === s.key && styles.tabTextOn]}>{s.label}</Text>
              </Pressable>
            ))}
          </View>
          <View role="tabpanel">
            {section === 'setup' ? <SetupSection roster={r} /> : null}
            {section === 'rules' ? <RulesSection roster={r} /> : null}
            {section === 'rules' ? <SuggestionSection roster={r} /> : null}
            {section === 'wishes' ? <WishesSection roster={r} /> : null}
            {section === 'solve' ? <SolveSection roster={r} onFinished={(id) => { setChosenRun(id); }} onShowResult={(id) => { setChosenRun(id); setSection('result'); }} /> : null}
            {section === 'result' ? <ResultSection roster={r} runId={runId} runs={runs.data ?? []} onPickRun={setChosenRun} /> : null}
            {section === 'edit' ? <EditSection roster={r} runId={runId} onSaved={(id) => { setChosenRun(id); setSection('result'); }} /> : null}
            {section === 'publish' ? <PublishSection roster={r} runId={runId} /> : null}
          </View>
        </View>
      )}
    </Loadable>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg, maxWidth: 1100 },
  back: { color: colors.loom, fontFamily: fonts.bodyBold, fontSize: 15 },
  head: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.md },
  title: { fontSize: 28, lineHeight: 34 },
  tabs: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs, paddingVertical: 2 },
  tab: { flexGrow: 1, flexBasis: 100, minHeight: 44, paddingHorizontal: space.lg, borderRadius: radius.md, alignItems: 'center', justifyContent: 'center', backgroundColor: colors.card, borderWidth: 1, borderColor: colors.line },
  tabOn: { backgroundColor: colors.loom, borderColor: colors.loom },
  tabText: { fontFamily: fonts.body, fontSize: 15, color: colors.ink },
  tabTextOn: { color: colors.white, fontFamily: fonts.bodyBold },
});
