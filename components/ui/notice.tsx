import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';

/** A short message in a coloured band: errors the person can act on, or a caution. */
export function Notice({ kind = 'error', children }: { kind?: 'error' | 'caution' | 'info'; children: string }) {
  return (
    <View role={kind === 'error' ? 'alert' : 'note'} style={[styles.box, styles[kind]]}>
      <Text style={styles.text}>{children}</Text>
    </View>
  );
}

const styles = StyleSheet.create({
  box: { borderRadius: radius.sm, padding: space.md, borderLeftWidth: 4 },
  error: { backgroundColor: colors.dangerSoft, borderLeftColor: colors.danger },
  caution: { backgroundColor: colors.threadSoft, borderLeftColor: colors.thread },
  info: { backgroundColor: colors.loomSoft, borderLeftColor: colors.loom },
  text: { fontFamily: fonts.body, color: colors.ink, fontSize: 15, lineHeight: 21 },
});
