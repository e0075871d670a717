import { useEffect, useRef, useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { useQueryClient } from '@tanstack/react-query';
import { colors, radius, space } from '@/constants/theme';
import { startRunBody } from '@/shared/api/rosters';
import { useRuns } from '@/hooks/api/get-runs';
import { useRun } from '@/hooks/api/get-run';
import { useStartRun } from '@/hooks/api/start-run';
import { useCancelRun } from '@/hooks/api/cancel-run';
import { useReopenRoster } from '@/hooks/api/reopen-roster';
import type { RosterDto, RunDto } from '@/hooks/api/roster-types';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { isBillingRefusal, PlanLimitPrompt } from '@/components/billing/plan-limit-prompt';
import { TextField } from '@/components/ui/text-field';
import { Body } from '@/components/ui/typography';
import { Choices, Loadable, Panel, Pill } from './panel';
import { gapWords, points, runName } from './format';
import { keys } from '@/hooks/api/query-keys';

const LIMITS = [
  { value: '5', label: '5 s' },
  { value: '15', label: '15 s' },
  { value: '60', label: '1 min' },
  { value: '300', label: '5 min' },
];

export function SolveSection({ roster, onFinished, onShowResult }: { roster: RosterDto; onFinished: (runId: number) => void; onShowResult: (runId: number) => void }) {
  const runs = useRuns(roster.id);
  const start = useStartRun();
  const [limit, setLimit] = useState('15');
  const [limitError, setLimitError] = useState<string | null>(null);
  const active = runs.data?.find((r) => r.status === 'queued' || r.status === 'running');
  const [watching, setWatching] = useState<number | null>(null);
  const current = watching ?? active?.id ?? null;
  const go = () => {
    const parsed = startRunBody.safeParse({ timeLimitSeconds: Number(limit) });
    if (!parsed.success) return setLimitError(`Time limit: ${parsed.error.issues[0].message}`);
    setLimitError(null);
    start.mutate({ rosterId: roster.id, timeLimitSeconds: parsed.data.timeLimitSeconds }, { onSuccess: (run) => setWatching(run.id) });
  };
  return (
    <View style={{ gap: space.lg }}>
      <Panel title="Solve" lead="Rotaloom searches for the highest-scoring roster that keeps every hard rule, and proves how far from the best possible it can be.">
        <Body bold>Time limit</Body>
        <Choices label="Time limit" options={LIMITS} value={LIMITS.some((l) => l.value === limit) ? [limit] : []} onChange={(v) => setLimit(v[0])} testID="solve-limit" />
        <View style={{ maxWidth: 220 }}>
          <TextField label="Or seconds (0.5–600)" value={limit} onChangeText={setLimit} inputMode="decimal" error={limitError ?? undefined} testID="solve-seconds" />
        </View>
        {isBillingRefusal(start.error) ? <PlanLimitPrompt error={start.error} /> : start.error ? <Notice>{start.error.message}</Notice> : null}
        {roster.status === 'published' ? (
          <ReopenToSolve roster={roster} />
        ) : (
          <Button label={active ? 'A run is in progress' : 'Start solving'} onPress={go} busy={start.isPending} disabled={Boolean(active)} testID="solve-start" />
        )}
      </Panel>
      {current !== null ? <RunProgress runId={current} onFinished={onFinished} onShowResult={onShowResult} /> : null}
      <Panel title="Runs">
        <Loadable query={runs} label="Runs">
          {(items) =>
            items.length === 0 ? (
              <Body muted>No runs yet.</Body>
            ) : (
              <View style={{ gap: space.xs }}>
                {items.slice(0, 12).map((r) => (
                  <RunLine key={r.id} run={r} onPress={() => (r.status === 'done' || r.status === 'cancelled' ? onShowResult(r.id) : setWatching(r.id))} />
                ))}
              </View>
            )
          }
        </Loadable>
      </Panel>
    </View>
  );
}

/** A published roster is frozen; the way to solve it again is on the spot, not only under Publish. */
function ReopenToSolve({ roster }: { roster: RosterDto }) {
  const reopen = useReopenRoster();
  return (
    <View style={{ gap: space.sm }} testID="solve-frozen">
      <Notice kind="info">The roster is published, so it is frozen and cannot be solved. Reopen it to solve again; staff keep the published shifts until you publish another run.</Notice>
      {reopen.error ? <Notice>{reopen.error.message}</Notice> : null}
      <Button label="Reopen to solve again" onPress={() => reopen.mutate({ rosterId: roster.id, version: roster.version })} busy={reopen.isPending} testID="solve-reopen" />
    </View>
  );
}

function RunLine({ run, onPress }: { run: RunDto; onPress: () => void }) {
  const tone = run.status === 'done' ? 'good' : run.status === 'failed' ? 'bad' : 'warn';
  const what = run.parameters.manual ? 'hand-edited' : `${run.parameters.timeLimitSeconds} s`;
  return (
    <Pressable role="button" onPress={onPress} accessibilityLabel={`${runName(run)}, ${run.status}`} style={styles.runLine}>
      <Body style={{ flex: 1 }}>{`${runName(run)} · ${what} · ${new Date(run.createdAt).toLocaleString()}`}</Body>
      <Body muted>{run.score !== null ? `${points(run.score)} points` : ''}</Body>
      <Pill tone={tone}>{run.status}</Pill>
    </Pressable>
  );
}

/** Polls the run twice a second: a bar for the time used, the current score, bound and gap in words. */
function RunProgress({ runId, onFinished, onShowResult }: { runId: number; onFinished: (runId: number) => void; onShowResult: (runId: number) => void }) {
  const run = useRun(runId);
  const cancel = useCancelRun();
  const queryClient = useQueryClient();
  const reported = useRef(false);
  const status = run.data?.status;
  useEffect(() => {
    if (!status || status === 'queued' || status === 'running' || reported.current) return;
    reported.current = true;
    void queryClient.invalidateQueries({ queryKey: keys.rosters._def });
    if (status === 'done' || status === 'cancelled') onFinished(runId);
  }, [status, runId, onFinished, queryClient]);
  return (
    <Loadable query={run} label="The run">
      {(r) => {
        // One time on the card: the search's own clock (the run's wall time also counts queueing and checks).
        const elapsed = r.progress?.elapsedMs ?? (r.timeMs ?? 0);
        const limitMs = r.parameters.timeLimitSeconds * 1000;
        const fraction = r.status === 'running' ? Math.min(1, elapsed / Math.max(1, limitMs)) : r.status === 'queued' ? 0 : 1;
        const score = r.score ?? r.progress?.score ?? null;
        const bound = r.bound ?? r.progress?.bound ?? null;
        const gap = r.gap ?? r.progress?.gap ?? null;
        return (
          <Panel title={runName(r)} lead={statusWords(r)} testID="run-progress">
            <View
              role="progressbar"
              aria-label="Time used of the limit"
              aria-valuemin={0}
              aria-valuemax={100}
              aria-valuenow={Math.round(fraction * 100)}
              style={styles.bar}
            >
              <View style={[styles.barFill, { width: `${Math.round(fraction * 100)}%` }, r.status === 'failed' && { backgroundColor: colors.danger }]} />
            </View>
            {r.status === 'queued' ? (
              <Body testID="run-queued">Queued: no solver is free yet. The run starts on its own as soon as one is; nothing is lost if you leave this page.</Body>
            ) : (
            <View style={styles.figures}>
              <Figure label="Score" value={points(score)} testID="run-score" />
              <Figure label="Bound" value={points(bound)} />
              <Figure label="Gap" value={gap === null ? '—' : `${(gap * 100).toFixed(gap < 0.1 ? 1 : 0)}%`} />
              <Figure label={r.status === 'running' ? 'Time so far' : 'Search time'} value={`${(elapsed / 1000).toFixed(1)} s (limit ${r.parameters.timeLimitSeconds} s)`} testID="run-time" />
            </View>
            )}
            {score !== null ? <Body testID="run-gap-words">{gapWords(score, bound, gap, r.result?.optimal)}</Body> : null}
            {r.status === 'failed' && r.error ? <Notice>{r.error}</Notice> : null}
            {r.status === 'cancelled' && r.error ? <Notice kind="caution">{r.error}</Notice> : null}
            {cancel.error ? <Notice>{cancel.error.message}</Notice> : null}
            {r.status === 'queued' || r.status === 'running' ? (
              <Button kind="quiet" label={r.cancelRequested ? 'Stopping…' : 'Cancel run'} onPress={() => cancel.mutate(r.id)} busy={cancel.isPending} disabled={r.cancelRequested} testID="run-cancel" />
            ) : null}
            {(r.status === 'done' || r.status === 'cancelled') && r.score !== null ? <Button label="See the result" onPress={() => onShowResult(r.id)} testID="run-show-result" /> : null}
          </Panel>
        );
      }}
    </Loadable>
  );
}

function statusWords(r: RunDto): string {
  switch (r.status) {
    case 'queued':
      return 'Queued: waiting for a solver to pick it up.';
    case 'running':
      return 'Solving: the score rises as better rosters are found; the bound falls as the search proves there is nothing better.';
    case 'done':
      return 'Finished.';
    case 'cancelled':
      return 'Cancelled.';
    default:
      return 'This run could not finish.';
  }
}

function Figure({ label, value, testID }: { label: string; value: string; testID?: string }) {
  return (
    <View style={styles.figure} testID={testID}>
      <Body muted style={{ fontSize: 13 }}>{label}</Body>
      <Body bold>{value}</Body>
    </View>
  );
}

const styles = StyleSheet.create({
  bar: { height: 14, borderRadius: 7, backgroundColor: colors.loomSoft, overflow: 'hidden' },
  barFill: { height: '100%', backgroundColor: colors.thread, borderRadius: 7 },
  figures: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  figure: { minWidth: 120, padding: space.sm, borderRadius: radius.sm, backgroundColor: colors.paper },
  runLine: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm, minHeight: 44, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.xs },
});
