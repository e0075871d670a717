import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, space } from '@/constants/theme';
import { useRun } from '@/hooks/api/get-run';
import { usePublishRoster } from '@/hooks/api/publish-roster';
import { useReopenRoster } from '@/hooks/api/reopen-roster';
import { usePublishPreview } from '@/hooks/api/get-publish-preview';
import type { RosterDto } from '@/hooks/api/roster-types';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body } from '@/components/ui/typography';
import { Loadable, Panel } from './panel';
import { dbId, gapWords, points, runName } from './format';
import { DownloadLink } from './download-link';

/** Freeze the roster on one run, mail everyone their shifts, and hand out CSV and iCalendar files. */
export function PublishSection({ roster, runId }: { roster: RosterDto; runId: number | null }) {
  const publish = usePublishRoster();
  const reopen = useReopenRoster();
  const shownRun = roster.status === 'published' ? roster.publishedRunId : runId;
  const run = useRun(shownRun);
  if (shownRun === null) return <Notice kind="info">No finished run to publish yet. Solve the roster first.</Notice>;
  const slug = roster.name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'roster';
  const base = `/api/rosters/${roster.id}`;
  const q = roster.status === 'published' ? '' : `?runId=${shownRun}`;
  const sep = q ? '&' : '?';
  return (
    <View style={{ gap: space.lg }}>
      <Loadable query={run} label="The run">
        {(r) => (
          <Panel title={roster.status === 'published' ? `Published: ${runName(r).toLowerCase()}` : `Publish ${runName(r).toLowerCase()}`} lead={roster.status === 'published' ? `Published ${roster.publishedAt ? new Date(roster.publishedAt).toLocaleString() : ''}. Staff see their shifts; the roster is frozen.` : 'Publishing freezes the roster on this run and e-mails every person on it their own shifts.'} testID="publish-panel">
            <Body>{`${points(r.score)} points. ${r.parameters.manual ? 'Edited by hand.' : gapWords(r.score, r.bound, r.gap, r.result?.optimal)}`}</Body>
            {r.result && r.result.openSeats > 0 ? <Notice kind="caution">{`${r.result.openSeats} seat${r.result.openSeats === 1 ? '' : 's'} stay open in this roster.`}</Notice> : null}
            {publish.error ? <Notice>{publish.error.message}</Notice> : null}
            {reopen.error ? <Notice>{reopen.error.message}</Notice> : null}
            {roster.status === 'published' ? (
              <Button kind="quiet" label="Reopen for changes" onPress={() => reopen.mutate({ rosterId: roster.id, version: roster.version })} busy={reopen.isPending} testID="publish-reopen" />
            ) : (
              <PublishConfirm roster={roster} runId={r.id} disabled={r.status !== 'done' || !r.result?.feasible} busy={publish.isPending} onConfirm={() => publish.mutate({ rosterId: roster.id, runId: r.id, version: roster.version })} />
            )}
            {publish.data ? (
              <View style={{ gap: space.xs }} testID="publish-mail-report">
                <Notice kind="info">{`Published. ${publish.data.mail.sent.length} e-mail${publish.data.mail.sent.length === 1 ? '' : 's'} sent: ${publish.data.mail.sent.map((m) => m.name).join(', ') || 'none'}.`}</Notice>
                {publish.data.mail.noAddress.length ? <Notice kind="caution">{`No e-mail address for ${publish.data.mail.noAddress.map((m) => m.name).join(', ')}: give them their shifts another way (the files below).`}</Notice> : null}
                {publish.data.mail.failed.length ? <Notice>{`Could not send to ${publish.data.mail.failed.map((m) => `${m.name} (${m.reason})`).join(', ')}.`}</Notice> : null}
              </View>
            ) : null}
          </Panel>
        )}
      </Loadable>
      <Panel title="Files" lead={roster.status === 'published' ? 'The published roster, for everyone or one person. Calendar files (.ics) open in any calendar program.' : 'Files of the run shown above (not yet published).'}>
        <View style={styles.links}>
          <DownloadLink href={`${base}/roster.ics${q}`} filename={`${slug}.ics`} label="Calendar for everyone (.ics)" testID="download-ics-all" />
          <DownloadLink href={`${base}/roster.csv${q}`} filename={`${slug}.csv`} label="Table for everyone (.csv)" testID="download-csv-all" />
        </View>
        <Loadable query={run} label="People">
          {(r) => (
            <View style={{ gap: space.xs }}>
              {(r.result?.people ?? [])
                .filter((p) => p.shifts > 0)
                .map((p) => (
                  <View key={p.personId} style={styles.person}>
                    <Body style={{ flex: 1, minWidth: 150 }}>{`${p.name} · ${p.shifts} shifts`}</Body>
                    <View style={styles.links}>
                      <DownloadLink href={`${base}/roster.ics${q}${sep}personId=${dbId(p.personId)}`} filename={`${slug}-${dbId(p.personId)}.ics`} label=".ics" a11yLabel={`Calendar for ${p.name} (.ics)`} />
                      <DownloadLink href={`${base}/roster.csv${q}${sep}personId=${dbId(p.personId)}`} filename={`${slug}-${dbId(p.personId)}.csv`} label=".csv" a11yLabel={`Table for ${p.name} (.csv)`} />
                    </View>
                  </View>
                ))}
            </View>
          )}
        </Loadable>
      </Panel>
    </View>
  );
}

/** Publishing mails people at once, so it asks first, naming who will be mailed and whose shifts changed. */
function PublishConfirm({ roster, runId, disabled, busy, onConfirm }: { roster: RosterDto; runId: number; disabled: boolean; busy: boolean; onConfirm: () => void }) {
  const [asking, setAsking] = useState(false);
  const preview = usePublishPreview(roster.id, asking ? runId : null);
  if (!asking) return <Button label="Publish and e-mail staff…" onPress={() => setAsking(true)} disabled={disabled} testID="publish-go" />;
  const p = preview.data;
  const names = (list: Array<{ name: string }>) => list.map((x) => x.name).join(', ');
  return (
    <View style={styles.confirm} role="alertdialog" aria-label="Confirm publishing" testID="publish-confirm">
      <Body bold>{p && !p.firstPublication ? 'Publish again? Only people whose shifts changed are told.' : 'Publish and e-mail everyone on the roster?'}</Body>
      {preview.error ? <Notice>{`Who would be mailed could not be worked out: ${preview.error.message}`}</Notice> : null}
      {!p && !preview.error ? <Body muted>Working out who will be mailed…</Body> : null}
      {p ? (
        <>
          <Body testID="publish-confirm-mail">{p.willMail.length ? `E-mail to ${p.willMail.length}: ${p.willMail.map((m) => `${m.name} (${m.to})`).join(', ')}.` : 'Nobody will be e-mailed.'}</Body>
          {p.noAddress.length ? <Body muted testID="publish-confirm-noaddress">{`No address, so not mailed: ${names(p.noAddress)}.`}</Body> : null}
          <Body muted testID="publish-confirm-changed">
            {p.firstPublication
              ? `${p.changed.length} ${p.changed.length === 1 ? 'person has' : 'people have'} shifts in this roster.`
              : p.changed.length
                ? `Shifts changed for ${p.changed.map((c) => `${c.name} (${c.added ? `+${c.added}` : ''}${c.added && c.removed ? ' ' : ''}${c.removed ? `−${c.removed}` : ''})`).join(', ')}; ${p.unchanged} unchanged.`
                : `Nobody's shifts changed against the earlier publication (${p.unchanged} unchanged).`}
          </Body>
        </>
      ) : null}
      <View style={styles.links}>
        <Button label={p ? `Publish${p.willMail.length ? ` and send ${p.willMail.length} e-mail${p.willMail.length === 1 ? '' : 's'}` : ''}` : 'Publish'} onPress={onConfirm} busy={busy} disabled={!p} testID="publish-confirm-go" />
        <Button kind="quiet" label="Not now" onPress={() => setAsking(false)} disabled={busy} testID="publish-confirm-cancel" />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  confirm: { gap: space.sm, padding: space.md, borderRadius: 8, borderWidth: 2, borderColor: colors.thread, backgroundColor: colors.white },
  links: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  person: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.xs },
});
