import { useRef, useState } from 'react';
import { ActivityIndicator, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';
import { IMPORT_MAX_BYTES, IMPORT_MAX_ROWS, type ImportReport, type ImportRow } from '@/shared/api/people';
import { useIsWide } from '@/hooks/use-is-wide';
import { useCommitPeopleImport, usePreviewPeopleImport } from '@/hooks/api/import-people';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body, Heading } from '@/components/ui/typography';
import { Section } from '@/components/auth/section';
import { TextLink } from '@/components/auth/text-link';
import { CoordinatorsOnly, formatHours, LinkButton, Tag } from './inline-controls';
import { CsvPicker } from './csv-picker';

const SHOWN_ROWS = 50;
const ACTION_WORDS: Record<ImportRow['action'], string> = { create: 'new', update: 'update', unchanged: 'no change', error: 'error' };
const ACTION_TONE = { create: 'good', update: 'warn', unchanged: 'plain', error: 'bad' } as const;

/** Two steps: a dry run that shows what would happen and every row error, then an all-or-nothing import. */
export function ImportPeopleScreen() {
  return (
    <CoordinatorsOnly what="people">
      <ImportPeople />
    </CoordinatorsOnly>
  );
}

function ImportPeople() {
  const preview = usePreviewPeopleImport();
  const commit = useCommitPeopleImport();
  const [file, setFile] = useState<(Blob & { name?: string }) | null>(null);
  const abort = useRef<AbortController | null>(null);

  const pick = (f: Blob & { name?: string }) => {
    abort.current?.abort();
    const controller = new AbortController();
    abort.current = controller;
    setFile(f);
    commit.reset();
    preview.mutate({ file: f, signal: controller.signal });
  };
  const cancel = () => abort.current?.abort();
  const doCommit = () => {
    if (!file) return;
    const controller = new AbortController();
    abort.current = controller;
    commit.mutate({ file, signal: controller.signal });
  };
  const report = commit.data ?? preview.data;
  const busy = preview.isPending || commit.isPending;

  return (
    <View style={styles.page}>
      <TextLink href="/people" label="← All people" />
      <Heading>Import people from CSV</Heading>
      {report ? null : <FormatHelp />}

      <View style={styles.row}>
        <CsvPicker onPick={pick} disabled={busy} label={file ? 'Choose another file' : 'Choose a CSV file'} />
        {busy ? (
          <View style={styles.row}>
            <ActivityIndicator color={colors.loom} accessibilityLabel={preview.isPending ? 'Checking the file' : 'Importing'} />
            <Body muted>{preview.isPending ? 'Checking the file…' : 'Importing…'}</Body>
            <Button kind="quiet" label="Cancel" onPress={cancel} />
          </View>
        ) : null}
      </View>

      {preview.error ? <Notice>{preview.error.message}</Notice> : null}
      {commit.error ? <Notice>{commit.error.message}</Notice> : null}

      {commit.data ? (
        <View style={styles.done} testID="import-done">
          <Notice kind="info">{`Imported from ${commit.data.fileName}: ${commit.data.counts.create} added, ${commit.data.counts.update} updated, ${commit.data.counts.unchanged} unchanged.`}</Notice>
          <LinkButton href="/people" label="See the people list" primary testID="import-see-people" />
        </View>
      ) : null}

      {report && !preview.isPending && !preview.error ? <Preview report={report} committed={Boolean(commit.data)} onCommit={doCommit} committing={commit.isPending} /> : null}
      {report ? <FormatHelp /> : null}
    </View>
  );
}

function FormatHelp() {
  return (
    <Section title="What the file looks like" lead={`A header row, then one row per person; at most ${IMPORT_MAX_ROWS.toLocaleString('en-GB')} rows and ${IMPORT_MAX_BYTES / 1024 / 1024} MB, saved as CSV UTF-8.`}>
      <View style={styles.example} accessibilityLabel="Example file">
        <Text style={styles.mono}>{'name,email,contracted_hours,skills\nAda Quill,ada@example.org,37.5,First aid;Medication round\nBrin Tallow,,20,'}</Text>
      </View>
      <Body muted>name and contracted_hours are required; skills are separated by ";" and must match the workspace's skills. Someone whose name is already here is updated, everyone else is added. Nothing is imported until every row is right.</Body>
    </Section>
  );
}

function Preview({ report, committed, onCommit, committing }: { report: ImportReport; committed: boolean; onCommit: () => void; committing: boolean }) {
  const wide = useIsWide();
  const [showAll, setShowAll] = useState(false);
  const { counts } = report;
  const rows = showAll ? report.items : report.items.slice(0, SHOWN_ROWS);
  const moreErrors = counts.error > 0 && report.errors.length < report.items.filter((i) => i.action === 'error').length;
  return (
    <Section title={committed ? 'What was imported' : `Preview of ${report.fileName}`} testID="import-preview">
      <Text style={styles.summary} aria-live="polite" testID="import-summary">
        {`${report.rows} ${report.rows === 1 ? 'row' : 'rows'}: ${counts.create} new, ${counts.update} to update, ${counts.unchanged} unchanged, ${counts.error} with errors`}
      </Text>
      {report.errors.length > 0 ? (
        <View style={styles.errors} testID="import-errors">
          <Notice>{`${counts.error} ${counts.error === 1 ? 'row has' : 'rows have'} errors, so nothing can be imported yet. Fix ${counts.error === 1 ? 'it' : 'them'} in your file, save it and choose it again.`}</Notice>
          <View role="list" aria-label="Row errors" style={styles.errorList}>
            {report.errors.map((e, i) => (
              <Text key={`${e.row}-${i}`} role="listitem" style={styles.errorItem}>
                {e.message}
              </Text>
            ))}
            {moreErrors ? <Body muted>…and more; the first ones are listed.</Body> : null}
          </View>
        </View>
      ) : null}
      {!committed && report.canCommit ? (
        <View style={styles.start}>
          <Button label={`Import ${report.rows} ${report.rows === 1 ? 'row' : 'rows'}`} onPress={onCommit} busy={committing} testID="import-commit" />
        </View>
      ) : null}

      <View role="table" aria-label="Rows in the file" style={styles.table}>
        {rows.map((r) => (
          <View key={r.row} role="row" style={[styles.tr, wide && styles.trWide]}>
            <View role="cell" style={styles.rowNo}>
              <Text style={styles.muted}>{`row ${r.row}`}</Text>
            </View>
            <View role="cell" style={styles.tag}>
              <Tag tone={ACTION_TONE[r.action]}>{ACTION_WORDS[r.action]}</Tag>
            </View>
            <View role="cell" style={styles.grow}>
              <Text style={styles.name}>{r.name || '(no name)'}</Text>
              <Text style={styles.muted}>{[r.email, r.contractedHours === null ? null : `${formatHours(r.contractedHours)} / week`, r.skills.join(', ') || null].filter(Boolean).join(' · ')}</Text>
              {r.changes && r.changes.length > 0 ? <Text style={styles.changes}>{r.changes.join('; ')}</Text> : null}
            </View>
          </View>
        ))}
      </View>
      {report.items.length > SHOWN_ROWS ? <Button kind="quiet" label={showAll ? `Show the first ${SHOWN_ROWS} rows` : `Show all ${report.items.length} rows`} onPress={() => setShowAll(!showAll)} /> : null}
    </Section>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg, maxWidth: 960 },
  row: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.md },
  done: { gap: space.sm, alignItems: 'flex-start' },
  start: { alignItems: 'flex-start' },
  example: { backgroundColor: colors.paper, borderRadius: radius.sm, padding: space.md, borderWidth: 1, borderColor: colors.line },
  mono: { fontFamily: 'monospace', fontSize: 13, color: colors.ink },
  summary: { fontFamily: fonts.bodyBold, fontSize: 16, color: colors.ink },
  errors: { gap: space.sm },
  errorList: { gap: space.xs },
  errorItem: { fontFamily: fonts.body, fontSize: 15, color: colors.danger },
  table: { borderTopWidth: 1, borderTopColor: colors.line },
  tr: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, paddingVertical: space.sm, borderBottomWidth: 1, borderBottomColor: colors.line, alignItems: 'flex-start' },
  trWide: { flexWrap: 'nowrap' },
  rowNo: { width: 56 },
  tag: { width: 84 },
  grow: { flex: 1, minWidth: 200, gap: 2 },
  name: { fontFamily: fonts.bodyBold, fontSize: 15, color: colors.ink },
  muted: { fontFamily: fonts.body, fontSize: 14, color: colors.inkSoft },
  changes: { fontFamily: fonts.body, fontSize: 14, color: colors.thread },
});
