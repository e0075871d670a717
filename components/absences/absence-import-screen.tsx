import { useRef, useState } from 'react';
import { ActivityIndicator, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';
import { ABSENCE_CSV_COLUMNS, ABSENCE_CSV_REQUIRED, ABSENCE_KIND_WORDS, type AbsenceImportReport } from '@/shared/api/absences';
import { useCommitAbsenceImport, usePreviewAbsenceImport } from '@/hooks/api/import-absences';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body, Heading } from '@/components/ui/typography';
import { Section } from '@/components/auth/section';
import { TextLink } from '@/components/auth/text-link';
import { CoordinatorsOnly, LinkButton, Tag } from '@/components/people/inline-controls';
import { CsvPicker } from '@/components/people/csv-picker';

const SHOWN_ROWS = 60;

/** Two steps, as for people: a dry run listing every row and its errors, then an all-or-nothing import. */
export function AbsenceImportScreen() {
  return (
    <CoordinatorsOnly what="absences">
      <AbsenceImport />
    </CoordinatorsOnly>
  );
}

function AbsenceImport() {
  const preview = usePreviewAbsenceImport();
  const commit = useCommitAbsenceImport();
  const [csv, setCsv] = useState<string | null>(null);
  const [name, setName] = useState<string | null>(null);
  const [readError, setReadError] = useState<string | null>(null);
  const abort = useRef<AbortController | null>(null);
  const pick = async (file: Blob & { name?: string }) => {
    abort.current?.abort();
    commit.reset();
    setReadError(null);
    let text: string;
    try {
      text = await file.text();
    } catch {
      setReadError('The file could not be read. Save it again as CSV UTF-8 and choose it once more.');
      return;
    }
    const controller = new AbortController();
    abort.current = controller;
    setCsv(text);
    setName(file.name ?? 'the file');
    preview.mutate({ csv: text, signal: controller.signal });
  };
  const doCommit = () => {
    if (csv === null) return;
    const controller = new AbortController();
    abort.current = controller;
    commit.mutate({ csv, signal: controller.signal });
  };
  const report = commit.data ?? preview.data;
  const busy = preview.isPending || commit.isPending;
  return (
    <View style={styles.page}>
      <TextLink href="/absences" label="← Absences" />
      <Heading>Import absences from CSV</Heading>
      <View style={styles.row}>
        <CsvPicker onPick={(f) => void pick(f)} disabled={busy} label={csv ? 'Choose another file' : 'Choose a CSV file'} />
        {busy ? (
          <View style={styles.row}>
            <ActivityIndicator color={colors.loom} accessibilityLabel={preview.isPending ? 'Checking the file' : 'Importing'} />
            <Body muted>{preview.isPending ? 'Checking the file…' : 'Importing…'}</Body>
            <Button kind="quiet" label="Cancel" onPress={() => abort.current?.abort()} />
          </View>
        ) : null}
      </View>
      {readError ? <Notice>{readError}</Notice> : null}
      {preview.error ? <Notice>{preview.error.message}</Notice> : null}
      {commit.error ? <Notice>{commit.error.message}</Notice> : null}
      {commit.data?.committed ? (
        <View style={styles.done} testID="absence-import-done">
          <Notice kind="info">{`Imported ${commit.data.valid} absence${commit.data.valid === 1 ? '' : 's'} from ${name}. They are approved.`}</Notice>
          <LinkButton href="/absences" label="See the absences" primary />
        </View>
      ) : null}
      {report && !busy ? <Preview report={report} name={name ?? 'the file'} onCommit={doCommit} /> : null}
      <FormatHelp />
    </View>
  );
}

function Preview({ report, name, onCommit }: { report: AbsenceImportReport; name: string; onCommit: () => void }) {
  const [showAll, setShowAll] = useState(false);
  const rows = showAll ? report.rows : report.rows.slice(0, SHOWN_ROWS);
  return (
    <Section title={report.committed ? 'What was imported' : `Preview of ${name}`} testID="absence-import-preview">
      <Text style={styles.summary} aria-live="polite" testID="absence-import-summary">{`${report.rows.length} row${report.rows.length === 1 ? '' : 's'}: ${report.valid} ready, ${report.invalid} with errors`}</Text>
      {report.invalid > 0 ? <Notice>{`Nothing can be imported until every row is right. Fix ${report.invalid === 1 ? 'the row' : `the ${report.invalid} rows`} marked below in your file, save it and choose it again.`}</Notice> : null}
      {!report.committed && report.canCommit ? (
        <View style={styles.done}>
          <Button label={`Import ${report.valid} absence${report.valid === 1 ? '' : 's'}`} onPress={onCommit} testID="absence-import-commit" />
        </View>
      ) : null}
      <View role="table" aria-label="Rows in the file" style={styles.table}>
        {rows.map((r) => (
          <View key={r.row} role="row" style={styles.tr}>
            <View role="cell" style={styles.rowNo}>
              <Text style={styles.muted}>{`row ${r.row}`}</Text>
            </View>
            <View role="cell" style={styles.tag}>
              <Tag tone={r.errors.length ? 'bad' : 'good'}>{r.errors.length ? 'error' : 'ready'}</Tag>
            </View>
            <View role="cell" style={styles.grow}>
              <Text style={styles.name}>{r.personName || '(no person)'}</Text>
              <Text style={styles.muted}>{[ABSENCE_KIND_WORDS[r.kind as keyof typeof ABSENCE_KIND_WORDS] ?? r.kind, r.startDate && r.endDate ? `${r.startDate} – ${r.endDate}` : r.startDate].filter(Boolean).join(' · ')}</Text>
              {r.errors.map((e, i) => (
                <Text key={i} style={styles.error}>{e.column ? `${e.column}: ${e.message}` : e.message}</Text>
              ))}
            </View>
          </View>
        ))}
      </View>
      {report.rows.length > SHOWN_ROWS ? <Button kind="quiet" label={showAll ? `Show the first ${SHOWN_ROWS} rows` : `Show all ${report.rows.length} rows`} onPress={() => setShowAll(!showAll)} /> : null}
    </Section>
  );
}

function FormatHelp() {
  return (
    <Section title="What the file looks like" lead="A header row, then one absence a row, saved as CSV UTF-8.">
      <View style={styles.example} accessibilityLabel="Example file">
        <Text style={styles.mono}>{`${ABSENCE_CSV_COLUMNS.join(',')}\nAda Quill,annual,2026-03-02,2026-03-13,,,,Spring leave\nBrin Tallow,training,2026-03-18,2026-03-18,09:00,13:00,4,First-aid refresher`}</Text>
      </View>
      <Body muted>{`${ABSENCE_CSV_REQUIRED.join(', ')} are required. kind is one of ${Object.keys(ABSENCE_KIND_WORDS).join(', ')}; dates are YYYY-MM-DD, times HH:mm (blank = the whole day); a blank credit_hours takes the default for the kind. People are matched by name.`}</Body>
    </Section>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg, maxWidth: 960 },
  row: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.md },
  done: { gap: space.sm, alignItems: 'flex-start' },
  example: { backgroundColor: colors.paper, borderRadius: radius.sm, padding: space.md, borderWidth: 1, borderColor: colors.line },
  mono: { fontFamily: 'monospace', fontSize: 13, color: colors.ink },
  summary: { fontFamily: fonts.bodyBold, fontSize: 16, color: colors.ink },
  table: { borderTopWidth: 1, borderTopColor: colors.line },
  tr: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, paddingVertical: space.sm, borderBottomWidth: 1, borderBottomColor: colors.line, alignItems: 'flex-start' },
  rowNo: { width: 56 },
  tag: { width: 64 },
  grow: { flex: 1, minWidth: 200, gap: 2 },
  name: { fontFamily: fonts.bodyBold, fontSize: 15, color: colors.ink },
  muted: { fontFamily: fonts.body, fontSize: 14, color: colors.inkSoft },
  error: { fontFamily: fonts.body, fontSize: 14, color: colors.danger },
});
