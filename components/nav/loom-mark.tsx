import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts } from '@/constants/theme';

/** The wordmark: the name beside three woven threads. */
export function LoomMark({ inverse, size = 22 }: { inverse?: boolean; size?: number }) {
  const ink = inverse ? colors.paper : colors.loom;
  return (
    <View style={styles.row} accessibilityLabel="Rotaloom">
      <View style={styles.threads}>
        <View style={[styles.thread, { backgroundColor: colors.thread, height: size * 0.9 }]} />
        <View style={[styles.thread, { backgroundColor: ink, height: size * 0.65 }]} />
        <View style={[styles.thread, { backgroundColor: colors.thread, height: size * 0.9 }]} />
      </View>
      <Text style={[styles.word, { color: ink, fontSize: size }]}>Rotaloom</Text>
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', alignItems: 'center', gap: 8 },
  threads: { flexDirection: 'row', alignItems: 'center', gap: 3 },
  thread: { width: 4, borderRadius: 2 },
  word: { fontFamily: fonts.heading },
});
