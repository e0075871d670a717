import { useState } from 'react';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';
import { WORKING_TIME_CAUTION } from '@/shared/caution';

/**
 * The working-time caution once for a group of screens (all tabs of one roster): one line in
 * view and a link that opens the whole text, rather than the full band on every tab.
 */
export function CautionLine({ testID }: { testID?: string }) {
  const [open, setOpen] = useState(false);
  return (
    <View role="note" aria-label="Working-time caution" style={styles.box} testID={testID}>
      <Text style={styles.text}>
        {open ? WORKING_TIME_CAUTION : 'Rosters affect rest and fatigue: local law, agreements and licensed practice decide what is allowed. '}
        <Text role="link" onPress={() => setOpen(!open)} style={styles.link} aria-expanded={open} testID={testID ? `${testID}-toggle` : undefined}>
          {open ? ' Show less' : 'Read the working-time caution'}
        </Text>
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  box: { borderRadius: radius.sm, paddingVertical: space.sm, paddingHorizontal: space.md, borderLeftWidth: 4, borderLeftColor: colors.thread, backgroundColor: colors.threadSoft },
  text: { fontFamily: fonts.body, color: colors.ink, fontSize: 14, lineHeight: 20 },
  link: { color: colors.loom, fontFamily: fonts.bodyBold, textDecorationLine: 'underline' },
});
