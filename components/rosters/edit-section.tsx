import { useMemo, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { Pressable, StyleSheet, View } from 'react-native';
import { colors, radius, space } from '@/constants/theme';
import { useRun } from '@/hooks/api/get-run';
import { rosterQueryOptions } from '@/hooks/api/get-roster';
import { useRosterScore } from '@/hooks/api/score-roster';
import { useSaveManualRun } from '@/hooks/api/save-manual-run';
import { ApiError } from '@/hooks/api/api-client';
import type { RosterDto, RunDetail } from '@/hooks/api/roster-types';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body } from '@/components/ui/typography';
import { Loadable, Panel, Pill } from './panel';
import { dayWords, points, timeOf } from './format';
import { useRosterView } from '@/hooks/use-roster-view';
import { stickyTop } from './grid/sticky';

interface Draft {
  runId: number;
  /** The roster version the edit started from; a save checks it. */
  version: number;
  assignment: Record<string, number | null>;
}

/** Edits survive switching sections (and a refused save): kept per roster until saved or dropped. */
const drafts = new Map<number, Draft>();

export function EditSection({ roster, runId, onSaved }: { roster: RosterDto; runId: number | null; onSaved: (runId: number) => void }) {
  const run = useRun(runId);
  if (runId === null) return <Notice kind="info">No finished run to edit yet. Solve the roster first.</Notice>;
  if (roster.status === 'published') return <Notice kind="info">The roster is published. Reopen it (Publish) to edit it by hand.</Notice>;
  return <Loadable query={run} label="The run">{(r) => (r.assignments.length ? <Editor roster={roster} run={r} onSaved={onSaved} /> : <Notice>This run kept no roster to edit.</Notice>)}</Loadable>;
}

function Editor({ roster, run, onSaved }: { roster: RosterDto; run: RunDetail; onSaved: (runId: number) => void }) {
  const [draft, setDraftState] = useState<Draft>(() => {
    const kept = drafts.get(roster.id);
    if (kept && kept.runId === run.id) return kept;
    return { runId: run.id, version: roster.version, assignment: Object.fromEntries(run.assignments.map((a) => [String(a.seatId), a.personId])) };
  });
  const setDraft = (d: Draft) => {
    drafts.set(roster.id, d);
    setDraftState(d);
  };
  const assignmentMap = useMemo(() => new Map(Object.entries(draft.assignment).map(([k, v]) => [Number(k), v])), [draft.assignment]);
  const { view, error } = useRosterView(roster.id, assignmentMap);
  const score = useRosterScore(roster.id, draft.assignment);
  const save = useSaveManualRun();
  const queryClient = useQueryClient();
  const days = useMemo(() => (view ? [...view.byDay.keys()] : []), [view]);
  const [dayIndex, setDayIndex] = useState(0);
  const [picked, setPicked] = useState<number | null>(null);
  const changed = run.assignments.filter((a) => (draft.assignment[String(a.seatId)] ?? null) !== a.personId).length;
  const conflict = save.error instanceof ApiError && save.error.status === 409;
  // Changing day drops the picked seat; done in the day buttons, not an effect, since a mount-time
  // effect would also undo a tap that lands before it runs (seen on a loaded machine).
  const goToDay = (i: number) => { setDayIndex(i); setPicked(null); };

  if (error) return <Notice>{`The roster could not be loaded: ${error.message}`}</Notice>;
  if (!view) return <Body muted>Loading the roster…</Body>;
  const day = days[Math.min(dayIndex, days.length - 1)];
  const pickedSeat = picked === null ? null : view.seats.find((s) => s.seatId === picked) ?? null;

  const place = (seatId: number, personId: number | null) => setDraft({ ...draft, assignment: { ...draft.assignment, [String(seatId)]: personId } });
  const tapSeat = (seatId: number) => {
    if (picked === null || picked === seatId) return setPicked(picked === seatId ? null : seatId);
    // A second seat: swap the two people.
    const a = draft.assignment[String(picked)] ?? null;
    const b = draft.assignment[String(seatId)] ?? null;
    setDraft({ ...draft, assignment: { ...draft.assignment, [String(picked)]: b, [String(seatId)]: a } });
    setPicked(null);
  };
  // People for the picked seat: never its own holder; those already on a shift that day listed apart.
  const candidates = (() => {
    if (!pickedSeat) return { free: [], busy: [] };
    const dayOf = pickedSeat.shift.startsLocal.slice(0, 10);
    const working = new Set(view.seats.filter((s) => s.shift.startsLocal.slice(0, 10) === dayOf && s.personId !== null).map((s) => s.personId));
    const able = view.people.filter((p) => p.id !== pickedSeat.personId && (pickedSeat.skillId === null || p.skillIds.includes(pickedSeat.skillId)));
    return { free: able.filter((p) => !working.has(p.id)), busy: able.filter((p) => working.has(p.id)) };
  })();
  const hard = score.data?.violations.filter((v) => v.hard) ?? [];
  const soft = (score.data?.violations.filter((v) => !v.hard) ?? []).sort((x, y) => (x.points ?? 0) - (y.points ?? 0));

  return (
    <View style={{ gap: space.lg }}>
      <Panel title="Edit by hand" lead="Tap a seat, then a person to move them there, or tap a second seat to swap the two. The score and rule checks update as you go." testID="edit-panel">
        {/* The live score stays in view (pinned to the top while the day's seats scroll under it). */}
        <View style={[styles.scoreRow, styles.scoreSticky, stickyTop]} testID="edit-score" aria-live="polite">
          <Pill tone={score.data && !score.isPlaceholderData ? (score.data.feasible ? 'good' : 'bad') : 'plain'}>{score.data && !score.isPlaceholderData ? (score.data.feasible ? `${points(score.data.total)} points` : 'breaks a hard rule') : 'scoring…'}</Pill>
          <Body muted>{`Solver's roster: ${points(run.score)} points · ${changed} seat${changed === 1 ? '' : 's'} changed`}</Body>
        </View>
        {score.error ? <Notice>{score.error.message}</Notice> : null}
        {hard.length > 0 ? <Notice>{`Hard rules broken: ${hard.slice(0, 4).map((v) => v.message).join('; ')}${hard.length > 4 ? '; …' : ''}`}</Notice> : null}
        {soft.length > 0 ? <Body muted>{`Largest concessions now: ${soft.slice(0, 3).map((v) => `${v.message} (${points(v.points)})`).join('; ')}`}</Body> : null}
        <View style={styles.dayNav}>
          <Button kind="quiet" label="‹ Day before" onPress={() => goToDay(Math.max(0, dayIndex - 1))} disabled={dayIndex === 0} />
          <Body bold style={{ textAlign: 'center', flex: 1 }}>{day ? dayWords(day) : ''}</Body>
          <Button kind="quiet" label="Next day ›" onPress={() => goToDay(Math.min(days.length - 1, dayIndex + 1))} disabled={dayIndex >= days.length - 1} />
        </View>
        {(view.byDay.get(day) ?? []).map((shift) => (
          <View key={shift.id} style={styles.shift}>
            <Body bold>{`${shift.label} · ${timeOf(shift.startsLocal)}–${timeOf(shift.endsLocal)}`}</Body>
            <View style={styles.seats}>
              {view.seatsOf(shift.id).map((s) => {
                const edited = (run.assignments.find((a) => a.seatId === s.seatId)?.personId ?? null) !== s.personId;
                return (
                  <Pressable
                    key={s.seatId}
                    role="button"
                    aria-pressed={picked === s.seatId}
                    accessibilityLabel={`${s.skillName} seat on the ${shift.label} shift: ${view.personName(s.personId)}${picked !== null && picked !== s.seatId ? '. Tap to swap with the picked seat' : ''}`}
                    onPress={() => tapSeat(s.seatId)}
                    style={[styles.chip, s.personId === null && styles.chipOpen, edited && styles.chipEdited, picked === s.seatId && styles.chipOn]}
                    testID={`edit-seat-${s.seatId}`}
                  >
                    <Body style={[{ fontSize: 15 }, picked === s.seatId && { color: colors.white }]}>{view.personName(s.personId)}</Body>
                    <Body style={[{ fontSize: 12, color: colors.inkSoft }, picked === s.seatId && { color: colors.loomSoft }]}>{s.skillName}</Body>
                  </Pressable>
                );
              })}
            </View>
          </View>
        ))}
        {pickedSeat ? (
          <View style={styles.picker} testID="edit-people">
            <Body bold>{`Move someone into this ${pickedSeat.skillName} seat`}</Body>
            <View style={styles.seats} testID="edit-people-free">
              <Button kind="quiet" label="Leave open" onPress={() => { place(pickedSeat.seatId, null); setPicked(null); }} />
              {candidates.free.map((p) => (
                <Button key={p.id} kind="quiet" label={p.name} onPress={() => { place(pickedSeat.seatId, p.id); setPicked(null); }} />
              ))}
            </View>
            {candidates.busy.length ? (
              <>
                <Body muted>Already working that day (a second shift is rarely wanted):</Body>
                {/* The group's name says it for screen readers; the buttons keep to the name so they fit a phone. */}
                <View style={styles.seats} role="group" aria-label="Already working that day" testID="edit-people-busy">
                  {candidates.busy.map((p) => (
                    <Button key={p.id} kind="quiet" label={p.name} onPress={() => { place(pickedSeat.seatId, p.id); setPicked(null); }} />
                  ))}
                </View>
              </>
            ) : null}
          </View>
        ) : null}
      </Panel>
      <Panel title="Save">
        {conflict ? (
          <Notice>{`${save.error!.message}`}</Notice>
        ) : save.error ? (
          <Notice>{save.error.message}</Notice>
        ) : null}
        {conflict ? (
          <Button kind="quiet" label="Keep my edits on the latest roster" onPress={async () => { const fresh = await queryClient.fetchQuery({ ...rosterQueryOptions(roster.id), staleTime: 0 }); setDraft({ ...draft, version: fresh.version }); save.reset(); }} testID="edit-rebase" />
        ) : null}
        <View style={styles.scoreRow}>
          <Button
            label="Save this roster"
            onPress={() =>
              // mutateAsync, not mutate's callbacks: the save refreshes the run list, which can swap this editor out before they would run.
              save
                .mutateAsync({ rosterId: roster.id, assignment: draft.assignment, version: draft.version, basedOnRunId: run.id })
                .then((r) => {
                  drafts.delete(roster.id);
                  onSaved(r.runId);
                })
                .catch(() => {})
            }
            busy={save.isPending}
            disabled={changed === 0 || (score.data !== undefined && !score.data.feasible)}
            testID="edit-save"
          />
          <Button kind="quiet" label="Drop my edits" onPress={() => { drafts.delete(roster.id); setDraft({ runId: run.id, version: roster.version, assignment: Object.fromEntries(run.assignments.map((a) => [String(a.seatId), a.personId])) }); save.reset(); }} disabled={changed === 0} />
        </View>
        <Body muted>{'Saved edits become a new run you can publish. Pins stay as they are.'}</Body>
      </Panel>
    </View>
  );
}

const styles = StyleSheet.create({
  scoreRow: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.md },
  scoreSticky: { backgroundColor: colors.card, paddingVertical: space.sm, borderBottomWidth: 1, borderBottomColor: colors.line },
  dayNav: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  shift: { gap: space.sm, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.sm },
  seats: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  chip: { minHeight: 44, paddingHorizontal: space.md, paddingVertical: space.xs, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.white, justifyContent: 'center' },
  chipOpen: { borderColor: colors.thread, borderStyle: 'dashed', backgroundColor: colors.threadSoft },
  chipEdited: { borderColor: colors.thread, borderWidth: 2 },
  chipOn: { backgroundColor: colors.loom, borderColor: colors.loom },
  picker: { gap: space.sm, padding: space.md, borderRadius: radius.sm, backgroundColor: colors.loomSoft },
});
