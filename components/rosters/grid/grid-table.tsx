import { Pressable, StyleSheet, Text, View } from 'react-native';
import { format } from 'date-fns';
import { colors, fonts, gridColors, space } from '@/constants/theme';
import { ABSENCE_KIND_WORDS } from '@/shared/api/absences';
import { ABSENCE_MARKS, WISH_MARKS, cellWords, isWeekend, shiftBand, shiftMark, type FootEntry, type GridCell, type GridModel, type GridRow } from '@/shared/roster/grid-model';
import { stickyCorner, stickyLeft, stickyTop } from './sticky';

export interface GridSizes {
  name: number;
  day: number;
  total: number;
}
export const PHONE_SIZES: GridSizes = { name: 86, day: 38, total: 54 };
export const WIDE_SIZES: GridSizes = { name: 156, day: 44, total: 62 };
export const PRINT_SIZES: GridSizes = { name: 150, day: 90, total: 52 };
/**
 * Printed rows share the height the sheet has left between PRINT_ROW_MIN and PRINT_ROW_MAX px, so
 * a wider fallback font or a legend that wraps once more shrinks the rows instead of pushing the
 * sheet onto a second page. Every printed text is one line of a fixed line height.
 */
export const PRINT_ROW_MIN = 15;
export const PRINT_ROW_MAX = 24;

const localDate = (s: string) => new Date(Number(s.slice(0, 4)), Number(s.slice(5, 7)) - 1, Number(s.slice(8, 10)), 12);
export const absenceWords = (kind: string) => ABSENCE_KIND_WORDS[kind as keyof typeof ABSENCE_KIND_WORDS] ?? kind;
const round = (x: number) => Math.round(x * 10) / 10;
const abbrev = (name: string) => (name === 'anyone' ? 'Any' : name.replace(/[^\p{L}\p{N}]/gu, '').slice(0, 3));

interface GridTableProps {
  model: GridModel;
  days: string[];
  rows: GridRow[];
  sizes: GridSizes;
  skillName: (id: number | null) => string;
  /** Print: no sticky parts, no presses. */
  print?: boolean;
  selected?: { personId: number; day: string } | null;
  onCellPress?: (row: GridRow, cell: GridCell) => void;
  onCellHover?: (words: string | null) => void;
}

/** The table itself: a header of days, a row per person with totals at its end, the seats filled at the foot. */
export function GridTable({ model, days, rows, sizes, skillName, print, selected, onCellPress, onCellHover }: GridTableProps) {
  const width = sizes.name + days.length * sizes.day + 4 * sizes.total;
  const top = print ? null : stickyTop;
  const left = print ? null : stickyLeft;
  const corner = print ? null : stickyCorner;
  return (
    <View style={[{ width }, print && styles.tablePrint]} role="table" aria-label="Roster grid: people by day" testID={print ? 'print-table' : 'grid-table'}>
      <View style={[styles.row, { width }, top, print && styles.headRowPrint]} role="row">
        <View style={[styles.head, styles.nameCell, { width: sizes.name }, corner, print && styles.headPrint]} role="columnheader">
          <Text style={styles.headText} numberOfLines={1}>Person</Text>
        </View>
        {days.map((d) => (
          <View key={d} style={[styles.head, { width: sizes.day }, isWeekend(d) && styles.weekendHead, print && styles.headPrint]} role="columnheader" aria-label={format(localDate(d), 'EEEE d MMMM')}>
            <Text style={styles.headDay} numberOfLines={1}>{format(localDate(d), 'EEEEEE')}</Text>
            <Text style={styles.headText} numberOfLines={1}>{format(localDate(d), 'd')}</Text>
          </View>
        ))}
        {['Hours', 'Nights', 'Wkend', 'Wishes'].map((h, i) => (
          <View key={h} style={[styles.head, styles.totalCell, { width: sizes.total }, print && styles.headPrint]} role="columnheader" aria-label={['Hours against contract', 'Nights', 'Weekend shifts', 'Wishes honoured'][i]}>
            <Text style={styles.headText} numberOfLines={1}>{h}</Text>
          </View>
        ))}
      </View>
      {rows.map((row) => (
        <View key={row.person.id} style={[styles.row, { width }, print && styles.rowPrint]} role="row" testID={print ? 'print-row' : `grid-row-${row.person.id}`}>
          <View style={[styles.nameCell, { width: sizes.name }, print && styles.nameCellPrint, left, row.rowBreaches.length > 0 && styles.nameBreach]} role="rowheader">
            <Text style={[styles.name, print && styles.namePrint]} numberOfLines={print ? 1 : 2}>{row.person.name}</Text>
            {row.rowBreaches.length > 0 ? <Text style={[styles.nameNote, print && styles.notePrint]} numberOfLines={1}>{print ? ` !${row.rowBreaches.length}` : `! ${row.rowBreaches.length} rule${row.rowBreaches.length === 1 ? '' : 's'}`}</Text> : null}
          </View>
          {days.map((d) => {
            const cell = row.cells.get(d)!;
            const on = selected?.personId === row.person.id && selected.day === d;
            const words = cellWords(row, cell, { day: format(localDate(d), 'EEEE d MMMM'), skillName, absenceWords });
            const body = <CellBody cell={cell} print={print} />;
            const style = [styles.cell, { width: sizes.day }, print && styles.cellPrint, isWeekend(d) && styles.weekend, cell.breaches.length > 0 && styles.cellBreach, on && styles.cellOn];
            return print ? (
              <View key={d} style={style}>{body}</View>
            ) : (
              <Pressable
                key={d}
                role="cell"
                accessibilityLabel={words}
                aria-selected={on}
                onPress={() => onCellPress?.(row, cell)}
                onHoverIn={() => onCellHover?.(words)}
                onHoverOut={() => onCellHover?.(null)}
                onFocus={() => onCellHover?.(words)}
                style={style}
                testID={`grid-cell-${row.person.id}-${d}`}
              >
                {body}
              </Pressable>
            );
          })}
          <Total sizes={sizes} print={print} text={`${round(row.hours)}${row.contractedHours !== null ? `/${round(row.contractedHours)}` : ''}`} tone={row.contractedHours !== null && Math.abs(row.hours - row.contractedHours) > Math.max(4, row.contractedHours * 0.1) ? 'warn' : 'plain'} label={`${round(row.hours)} hours${row.contractedHours !== null ? ` of ${round(row.contractedHours)} contracted` : ''}`} />
          <Total sizes={sizes} print={print} text={String(row.nights)} label={`${row.nights} nights`} />
          <Total sizes={sizes} print={print} text={String(row.weekendShifts)} label={`${row.weekendShifts} weekend shifts`} />
          <Total sizes={sizes} print={print} text={row.wishesTotal ? `${row.wishesHonoured}/${row.wishesTotal}` : '–'} tone={row.wishesHonoured < row.wishesTotal ? 'warn' : 'plain'} label={row.wishesTotal ? `${row.wishesHonoured} of ${row.wishesTotal} wishes honoured` : 'no wishes'} />
        </View>
      ))}
      <View style={[styles.row, styles.footRow, { width }]} role="row" testID={print ? undefined : 'grid-foot'}>
        <View style={[styles.nameCell, styles.foot, { width: sizes.name }, left, print && styles.footPrint]} role="rowheader">
          <Text style={styles.headText} numberOfLines={1}>Filled / needed</Text>
        </View>
        {days.map((d) => (
          <View key={d} style={[styles.foot, { width: sizes.day }, print && styles.footPrint]} role="cell" aria-label={footWords(model.foot.get(d) ?? [], d)}>
            {(model.foot.get(d) ?? []).map((f) => (
              <Text key={String(f.skillId)} style={[styles.footText, f.filled < f.needed && styles.footShort]} numberOfLines={1}>{`${abbrev(f.skillName)} ${f.filled}/${f.needed}`}</Text>
            ))}
          </View>
        ))}
        <View style={[styles.foot, { width: 4 * sizes.total }]} />
      </View>
    </View>
  );
}

const footWords = (entries: FootEntry[], day: string) =>
  entries.length === 0 ? `${day}: no shifts` : `${day}: ${entries.map((f) => `${f.skillName} ${f.filled} of ${f.needed} filled`).join(', ')}`;

function Total({ text, label, sizes, print, tone = 'plain' }: { text: string; label: string; sizes: GridSizes; print?: boolean; tone?: 'plain' | 'warn' }) {
  return (
    <View style={[styles.cell, styles.totalCell, { width: sizes.total }, print && styles.cellPrint]} role="cell" accessibilityLabel={label} aria-label={label}>
      <Text style={[styles.totalText, print && styles.lineHPrint, tone === 'warn' && { color: gridColors.missed }]} numberOfLines={1}>{text}</Text>
    </View>
  );
}

/** Marks in one cell: shift badges (or the absence), wish glyphs in the corner, a pin dot, the breach sign. */
function CellBody({ cell, print }: { cell: GridCell; print?: boolean }) {
  const badge = [styles.badge, print && styles.badgePrint];
  const badgeText = [styles.badgeText, print && styles.badgeTextPrint];
  return (
    <>
      {cell.seats.slice(0, 2).map((s) => {
        const band = gridColors[shiftBand(s.shift)];
        return (
          <View key={s.seatId} style={[badge, { backgroundColor: band.fill }]}>
            <Text style={[badgeText, { color: band.ink }]} numberOfLines={1}>{shiftMark(s.shift.label)}</Text>
            {s.pinned ? <View style={styles.pin} /> : null}
          </View>
        );
      })}
      {cell.seats.length > 2 ? <Text style={styles.more}>{`+${cell.seats.length - 2}`}</Text> : null}
      {cell.absence && cell.seats.length === 0 ? (
        <View style={[badge, { backgroundColor: gridColors.away.fill }]}>
          <Text style={[badgeText, { color: gridColors.away.ink }]} numberOfLines={1}>{ABSENCE_MARKS[cell.absence.kind] ?? 'Aw'}</Text>
        </View>
      ) : null}
      {cell.wishes.length ? (
        <View style={styles.wishes}>
          {cell.wishes.slice(0, 2).map((w, i) => (
            <Text key={i} style={[styles.wish, { color: w.honoured ? gridColors.honoured : gridColors.missed }, !w.honoured && { textDecorationLine: 'underline' }]}>{WISH_MARKS[w.kind]}</Text>
          ))}
        </View>
      ) : null}
      {cell.breaches.length ? <Text style={styles.breachSign}>!</Text> : null}
    </>
  );
}

const CELL_H = 44;
const styles = StyleSheet.create({
  row: { flexDirection: 'row', alignSelf: 'flex-start' },
  head: { minHeight: 40, alignItems: 'center', justifyContent: 'center', backgroundColor: colors.card, borderBottomWidth: 1, borderColor: colors.line },
  weekendHead: { backgroundColor: gridColors.weekend },
  headDay: { fontFamily: fonts.body, fontSize: 11, lineHeight: 13, color: colors.inkSoft },
  headText: { fontFamily: fonts.bodyBold, fontSize: 12, lineHeight: 15, color: colors.ink },
  nameCell: { paddingHorizontal: space.xs, justifyContent: 'center', alignItems: 'flex-start', backgroundColor: colors.card, borderRightWidth: 1, borderBottomWidth: 1, borderColor: colors.line, minHeight: CELL_H },
  // Print: the table takes the sheet's height left over; rows share it (see PRINT_ROW_MIN/MAX) and
  // each is one line: the name and its breach count side by side, two shifts side by side.
  tablePrint: { flexGrow: 1, flexShrink: 1, minHeight: 0, overflow: 'hidden' },
  headRowPrint: { height: 30, flexShrink: 0 },
  headPrint: { minHeight: 0, height: 30, overflow: 'hidden' },
  rowPrint: { flexGrow: 1, flexShrink: 1, flexBasis: 0, minHeight: PRINT_ROW_MIN, maxHeight: PRINT_ROW_MAX, overflow: 'hidden' },
  nameCellPrint: { flexDirection: 'row', alignItems: 'center', justifyContent: 'flex-start', minHeight: 0, overflow: 'hidden' },
  namePrint: { flexShrink: 1, lineHeight: 13 },
  lineHPrint: { lineHeight: 13 },
  // The breach count stays whole; a long name gives way with an ellipsis.
  notePrint: { lineHeight: 13, flexShrink: 0 },
  cellPrint: { flexDirection: 'row', minHeight: 0, paddingVertical: 0, overflow: 'hidden' },
  badgePrint: { height: 13, minWidth: 22 },
  badgeTextPrint: { fontSize: 10, lineHeight: 12 },
  footPrint: { minHeight: 0, flexShrink: 0 },
  nameBreach: { borderLeftWidth: 3, borderLeftColor: gridColors.breach },
  name: { fontFamily: fonts.bodyBold, fontSize: 12, lineHeight: 15, color: colors.ink },
  nameNote: { fontFamily: fonts.body, fontSize: 11, color: gridColors.breach },
  cell: { minHeight: CELL_H, borderRightWidth: 1, borderBottomWidth: 1, borderColor: colors.line, alignItems: 'center', justifyContent: 'center', gap: 1, backgroundColor: colors.white, position: 'relative', paddingVertical: 2 },
  weekend: { backgroundColor: gridColors.weekend },
  cellBreach: { borderWidth: 2, borderColor: gridColors.breach },
  cellOn: { borderWidth: 2, borderColor: colors.loom, backgroundColor: colors.loomSoft },
  badge: { minWidth: 26, height: 18, borderRadius: 4, alignItems: 'center', justifyContent: 'center', paddingHorizontal: 2, flexDirection: 'row', gap: 2 },
  badgeText: { fontFamily: fonts.bodyBold, fontSize: 11 },
  pin: { width: 5, height: 5, borderRadius: 3, backgroundColor: gridColors.pinned, borderWidth: 1, borderColor: colors.white },
  more: { fontFamily: fonts.body, fontSize: 10, color: colors.inkSoft },
  wishes: { position: 'absolute', top: 0, right: 2, flexDirection: 'row', gap: 1 },
  wish: { fontFamily: fonts.bodyBold, fontSize: 11, lineHeight: 12 },
  breachSign: { position: 'absolute', bottom: 0, left: 2, fontFamily: fonts.bodyBold, fontSize: 11, lineHeight: 12, color: gridColors.breach },
  totalCell: { backgroundColor: colors.card },
  totalText: { fontFamily: fonts.body, fontSize: 12, color: colors.ink },
  footRow: { backgroundColor: colors.card },
  foot: { paddingVertical: 2, alignItems: 'center', justifyContent: 'flex-start', borderRightWidth: 1, borderTopWidth: 1, borderColor: colors.line, backgroundColor: colors.card },
  footText: { fontFamily: fonts.body, fontSize: 10, lineHeight: 13, color: colors.ink },
  footShort: { color: gridColors.breach, fontFamily: fonts.bodyBold },
});
