import { StyleSheet, Text, View, type TextStyle } from 'react-native';
import { colors, fonts, gridColors, radius, space } from '@/constants/theme';
import { ABSENCE_KIND_WORDS } from '@/shared/api/absences';
import { ABSENCE_MARKS, WISH_MARKS } from '@/shared/roster/grid-model';

const BANDS = [
  { key: 'morning', words: 'starts 04:00–10:59' },
  { key: 'afternoon', words: 'starts 11:00–15:59' },
  { key: 'evening', words: 'starts 16:00–19:59' },
  { key: 'night', words: 'night shift' },
] as const;

/**
 * What the grid's marks mean; the print sheet and the PDF use the same words. Compact is the
 * printed form: small type of a fixed line height, each entry kept on one line (entries wrap as
 * a whole), and no words about tapping.
 */
export function GridLegend({ compact }: { compact?: boolean }) {
  const item = [styles.item, compact && styles.itemCompact];
  const swatch = [styles.swatch, compact && styles.swatchCompact];
  const swatchText = [styles.swatchText, compact && styles.swatchTextCompact];
  const words = [styles.words, compact && styles.wordsCompact];
  const glyph = [styles.glyph, compact && styles.glyphCompact];
  return (
    <View style={[styles.legend, compact && styles.legendCompact]} role="list" aria-label="What the marks mean" testID="grid-legend">
      {BANDS.map((b) => (
        <View key={b.key} style={item} role="listitem">
          <View style={[swatch, { backgroundColor: gridColors[b.key].fill }]}>
            <Text style={[swatchText, { color: gridColors[b.key].ink }]}>Ab</Text>
          </View>
          <Text style={words}>{compact ? b.words : `${b.words} (first letters of the shift's name)`}</Text>
        </View>
      ))}
      {compact ? (
        <View style={item} role="listitem">
          <Text style={words}>Ab: first letters of the shift's name</Text>
        </View>
      ) : null}
      <View style={item} role="listitem">
        <View style={[swatch, { backgroundColor: gridColors.away.fill }]}>
          <Text style={[swatchText, { color: gridColors.away.ink }]}>Lv</Text>
        </View>
        <Text style={words}>{Object.entries(ABSENCE_MARKS).map(([k, m]) => `${m} ${ABSENCE_KIND_WORDS[k as keyof typeof ABSENCE_KIND_WORDS].toLowerCase()}`).join(', ')}</Text>
      </View>
      <View style={item} role="listitem">
        <Text style={[glyph, { color: gridColors.honoured }]}>{`${WISH_MARKS.prefer} ${WISH_MARKS.avoid} ${WISH_MARKS.cannot}`}</Text>
        <Text style={words}>wish to work, to be spared, cannot: green when honoured,</Text>
        <Text style={[glyph, { color: gridColors.missed, textDecorationLine: 'underline' }]}>{WISH_MARKS.prefer}</Text>
        <Text style={words}>ochre and underlined when not</Text>
      </View>
      <View style={item} role="listitem">
        <View style={[swatch, styles.breach]}>
          <Text style={[swatchText, { color: gridColors.breach }]}>!</Text>
        </View>
        <Text style={words}>{compact ? 'a rule is broken or given up here' : 'a rule is broken or given up here (tap or hover for the reason)'}</Text>
      </View>
      <View style={item} role="listitem">
        <View style={[styles.pinDot]} />
        <Text style={words}>pinned seat</Text>
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  legend: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, columnGap: space.lg },
  item: { flexDirection: 'row', alignItems: 'center', gap: space.xs, flexWrap: 'wrap' },
  swatch: { minWidth: 26, height: 20, borderRadius: radius.sm, alignItems: 'center', justifyContent: 'center', paddingHorizontal: 3 },
  swatchText: { fontFamily: fonts.bodyBold, fontSize: 12 },
  breach: { borderWidth: 2, borderColor: gridColors.breach, backgroundColor: colors.white },
  glyph: { fontFamily: fonts.bodyBold, fontSize: 15 },
  words: { fontFamily: fonts.body, fontSize: 13, color: colors.inkSoft },
  pinDot: { width: 8, height: 8, borderRadius: 4, backgroundColor: gridColors.pinned },
  legendCompact: { gap: 2, columnGap: space.md },
  itemCompact: { flexWrap: 'nowrap', gap: 3 },
  swatchCompact: { minWidth: 20, height: 13, paddingHorizontal: 2 },
  swatchTextCompact: { fontSize: 9, lineHeight: 11 },
  wordsCompact: { fontSize: 9, lineHeight: 13, whiteSpace: 'nowrap' } as TextStyle,
  glyphCompact: { fontSize: 11, lineHeight: 13 },
});
