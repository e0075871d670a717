import { useEffect, useState, type ReactNode } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, space } from '@/constants/theme';
import { WORKING_TIME_CAUTION } from '@/shared/caution';
import type { RosterDto, RunDetail } from '@/hooks/api/roster-types';
import { Button } from '@/components/ui/button';
import { DownloadLink } from '../download-link';
import { Choices } from '../panel';
import { periodWords, runName } from '../format';
import type { GridModel } from '@/shared/roster/grid-model';
import { GridTable, PRINT_SIZES } from './grid-table';
import { GridLegend } from './grid-legend';

// react-dom ships without types here; only its portal is needed, to print the sheet outside the app's layout boxes.
// eslint-disable-next-line @typescript-eslint/no-require-imports
const { createPortal } = require('react-dom') as { createPortal: (node: ReactNode, container: Element) => ReactNode };

/**
 * On screen the sheet is not shown; in print only the sheet is (everything else out of the flow), A4
 * landscape, a page per week or fortnight, each with the legend and the working-time caution.
 * Each sheet is exactly one page box tall (194 mm inside 8 mm margins, less 2 mm so rounding never
 * spills a pixel onto a blank page) and clips what does not fit, so the page count is the sheet
 * count whatever fonts the printing machine has; the rows inside share the height left over.
 */
const PRINT_CSS = `
@media screen { #rotaloom-print { display: none; } }
@media print {
  @page { size: A4 landscape; margin: 8mm; }
  html, body { height: auto !important; overflow: visible !important; }
  /* The app itself leaves the flow entirely: hidden but laid out, it would print as blank pages. */
  body > *:not(#rotaloom-print) { display: none !important; }
  #rotaloom-print { position: static; width: 100%; }
  #rotaloom-print .rotaloom-page { height: 192mm; overflow: hidden; box-sizing: border-box; break-inside: avoid; page-break-inside: avoid; break-after: page; page-break-after: always; }
  #rotaloom-print .rotaloom-page:last-child { break-after: auto; page-break-after: auto; }
  * { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
}`;

function usePrintStyles() {
  useEffect(() => {
    if (document.getElementById('rotaloom-print-css')) return;
    const el = document.createElement('style');
    el.id = 'rotaloom-print-css';
    el.textContent = PRINT_CSS;
    document.head.appendChild(el);
  }, []);
}

export function PrintButton({ roster, run, model, skillName }: { roster: RosterDto; run: RunDetail; model: GridModel; skillName: (id: number | null) => string }) {
  usePrintStyles();
  const [span, setSpan] = useState<'7' | '14'>('7');
  const [sheet, setSheet] = useState(false);
  useEffect(() => {
    if (!sheet) return;
    // Print once the sheet is in the document; drop it again when the dialog closes.
    const done = () => setSheet(false);
    window.addEventListener('afterprint', done);
    const t = setTimeout(() => window.print(), 50);
    return () => {
      clearTimeout(t);
      window.removeEventListener('afterprint', done);
    };
  }, [sheet]);
  return (
    <View style={styles.actions}>
      <Choices label="Print pages of" options={[{ value: '7', label: 'A week' }, { value: '14', label: 'Two weeks' }]} value={[span]} onChange={(v) => setSpan(v[0] as '7' | '14')} testID="grid-print-span" />
      <Button kind="quiet" label="Print" onPress={() => setSheet(true)} testID="grid-print" />
      <DownloadLink href={`/api/rosters/${roster.id}/roster.pdf?runId=${run.id}&days=${span}`} filename={`${roster.name}.pdf`} label="PDF" a11yLabel="Download the roster grid as a PDF" testID="grid-pdf" />
      {sheet ? createPortal(<PrintSheet roster={roster} run={run} model={model} skillName={skillName} span={Number(span)} />, document.body) : null}
    </View>
  );
}

/**
 * A sheet is 192 mm (725 px) tall. Title and line below (36 px), header (30), a foot of up to four
 * skills (56), legend and caution of up to three lines each (72) and the gaps (24) leave about
 * 500 px: 30 rows at no less than PRINT_ROW_MIN (15 px) fit with room to spare for wider fonts.
 */
const ROWS_PER_SHEET = 30;

export function PrintSheet({ roster, run, model, skillName, span }: { roster: RosterDto; run: RunDetail; model: GridModel; skillName: (id: number | null) => string; span: number }) {
  const rows = [...model.rows].filter((r) => r.hours > 0 || [...r.cells.values()].some((c) => c.seats.length || c.absence)).sort((a, b) => a.person.name.localeCompare(b.person.name));
  // A sheet per week (or fortnight); a staff list longer than one A4 sheet holds continues on the
  // next sheets for the same days, as the server's PDF does.
  const pages: Array<{ days: string[]; rows: typeof rows }> = [];
  for (let i = 0; i < model.days.length; i += span) {
    for (let j = 0; j < Math.max(1, rows.length); j += ROWS_PER_SHEET) pages.push({ days: model.days.slice(i, i + span), rows: rows.slice(j, j + ROWS_PER_SHEET) });
  }
  const sizes = span > 7 ? { ...PRINT_SIZES, day: 52, name: 110 } : PRINT_SIZES;
  return (
    <View nativeID="rotaloom-print" testID="print-sheet">
      {pages.map(({ days, rows: sheetRows }, i) => (
        <View key={i} style={styles.page}>
          {/* react-native-web has no className prop; PageClass sets the page-break class through a ref. */}
          <PageClass />
          <Text style={styles.title} numberOfLines={1}>{`${roster.name} · ${periodWords(days[0], days[days.length - 1])}`}</Text>
          <Text style={styles.sub} numberOfLines={1}>{`${runName(run)}${roster.status === 'published' ? ' · published' : ' · draft, not yet published'} · page ${i + 1} of ${pages.length}`}</Text>
          <GridTable model={model} days={days} rows={sheetRows} sizes={sizes} skillName={skillName} print />
          <View style={styles.bottom}>
            <GridLegend compact />
            <Text style={styles.caution} testID="print-caution">{WORKING_TIME_CAUTION}</Text>
          </View>
        </View>
      ))}
    </View>
  );
}

/** Marks its parent as a printed page (break after it). */
function PageClass() {
  return <View style={{ display: 'none' }} ref={(el) => { const parent = (el as unknown as HTMLElement | null)?.parentElement; if (parent) parent.classList.add('rotaloom-page'); }} />;
}

const styles = StyleSheet.create({
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' },
  page: { paddingHorizontal: space.xs, gap: 6, backgroundColor: colors.white },
  title: { fontFamily: fonts.heading, fontSize: 17, lineHeight: 22, color: colors.ink },
  sub: { fontFamily: fonts.body, fontSize: 11, lineHeight: 14, color: colors.inkSoft },
  // Legend and caution keep their own height; the table above gives way.
  bottom: { flexShrink: 0, gap: 4 },
  caution: { fontFamily: fonts.body, fontSize: 9, lineHeight: 12, color: colors.ink, borderLeftWidth: 3, borderLeftColor: colors.thread, paddingLeft: space.sm },
});
