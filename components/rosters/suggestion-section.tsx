import { StyleSheet, View } from 'react-native';
import { colors, radius, space } from '@/constants/theme';
import { useSuggestion } from '@/hooks/api/get-suggestion';
import { useCreateSuggestion } from '@/hooks/api/create-suggestion';
import { useDecideSuggestion } from '@/hooks/api/decide-suggestion';
import type { RosterDto } from '@/hooks/api/roster-types';
import type { PastRosterEffect, SuggestionDto } from '@/shared/api/suggestion';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body } from '@/components/ui/typography';
import { Loadable, Panel, Pill } from './panel';

const num = (x: number) => (Math.round(x * 10) / 10).toString();

/** One past roster in words: how many of its edits each set of weights agrees with, and what a re-solve would change. */
function pastWords(p: PastRosterEffect): string {
  const agree = `The current weights agree with ${p.agreeBefore} of your ${p.edits} edit${p.edits === 1 ? '' : 's'} here, the suggested ones with ${p.agreeAfter}.`;
  if (p.seatsChanged === null) return `${agree}${p.note ? ` ${p.note}` : ''}`;
  if (p.seatsChanged === 0) return `${agree} Solved again with the suggested weights, the roster it proposed would stay as it was.`;
  const moved = p.moved.map((m) => `${m.name} ${num(m.before)} → ${num(m.after)}`).join(', ');
  return `${agree} Solved again with the suggested weights, ${p.seatsChanged} of ${p.seats} seats would change${moved ? ` (rule counts: ${moved})` : ''}.`;
}

/**
 * Rule weights learned from the coordinator's own edits (server/learning): the suggestion in
 * words, what it would have changed on past rosters, and Adopt / Dismiss. Weights change only on Adopt.
 */
export function SuggestionSection({ roster }: { roster: RosterDto }) {
  const query = useSuggestion(roster.id);
  const create = useCreateSuggestion();
  return (
    <Panel title="Weights from your edits" lead="Each hand edit you save says which roster you preferred. From enough of them Rotaloom suggests rule weights; nothing changes unless you adopt it." testID="suggestion-section">
      <Loadable query={query} label="The suggestion">
        {(d) => {
          const open = d.suggestion?.status === 'open' ? d.suggestion : null;
          return (
            <View style={{ gap: space.sm }}>
              <Body muted testID="suggestion-edits">{`${d.edits} edit${d.edits === 1 ? '' : 's'} recorded over ${d.rosters} roster${d.rosters === 1 ? '' : 's'}; a suggestion needs at least ${d.minEdits}.`}</Body>
              {create.error ? <Notice>{create.error.message}</Notice> : null}
              {open ? <OpenSuggestion roster={roster} s={open} /> : null}
              {d.suggestion && !open ? <Decided s={d.suggestion} /> : null}
              {!open ? (
                <View style={styles.actions}>
                  <Button
                    label={create.isPending ? 'Learning from your edits…' : 'Suggest weights from my edits'}
                    busy={create.isPending}
                    disabled={roster.status === 'published'}
                    onPress={() => create.mutate({ rosterId: roster.id })}
                    testID="suggestion-create"
                  />
                </View>
              ) : null}
            </View>
          );
        }}
      </Loadable>
    </Panel>
  );
}

function Decided({ s }: { s: SuggestionDto }) {
  const when = s.decidedAt ? new Date(s.decidedAt).toLocaleString() : '';
  return (
    <Body testID="suggestion-decided">{`Last suggestion ${s.status}${s.decidedBy ? ` by ${s.decidedBy}` : ''}${when ? ` on ${when}` : ''}: ${s.report.words}`}</Body>
  );
}

function OpenSuggestion({ roster, s }: { roster: RosterDto; s: SuggestionDto }) {
  const decide = useDecideSuggestion();
  const r = s.report;
  return (
    <View style={styles.card} testID="suggestion-open">
      <Body bold testID="suggestion-words">{r.words}</Body>
      <Body>{`The current weights agree with ${r.agreeBefore} of these ${r.edits} edits; the suggested weights with ${r.agreeAfter}.`}</Body>
      {r.changes.map((c) => (
        <View key={c.key} style={styles.row}>
          <Body style={{ flex: 1 }}>{c.name}</Body>
          <Pill tone={c.to > c.from ? 'warn' : 'plain'}>{`${c.from} → ${c.to}`}</Pill>
        </View>
      ))}
      {(r.cautions ?? []).map((c) => (
        <Notice key={c} kind="caution">{c}</Notice>
      ))}
      {r.contradictions.length ? <Notice kind="caution">{`Edits that undo others: ${r.contradictions.join('; ')}.`}</Notice> : null}
      {r.unexplained.length ? <Notice kind="info">{`No rule weights can explain: ${r.unexplained.join('; ')}.`}</Notice> : null}
      <Body bold>On past rosters</Body>
      {r.past.map((p) => (
        <Body key={p.rosterId} testID={`suggestion-past-${p.rosterId}`}>{`${p.rosterName}: ${pastWords(p)}`}</Body>
      ))}
      {decide.error ? <Notice>{decide.error.message}</Notice> : null}
      <View style={styles.actions}>
        <Button label="Adopt these weights" busy={decide.isPending} disabled={roster.status === 'published'} onPress={() => decide.mutate({ rosterId: roster.id, suggestionId: s.id, decision: 'adopt' })} testID="suggestion-adopt" />
        <Button kind="quiet" label="Dismiss" disabled={decide.isPending} onPress={() => decide.mutate({ rosterId: roster.id, suggestionId: s.id, decision: 'dismiss' })} testID="suggestion-dismiss" />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.sm, padding: space.md, borderRadius: radius.sm, backgroundColor: colors.loomSoft },
  row: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
});
