import { Linking, Pressable, StyleSheet, Text } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';

/** Opens a file address from the API (the session cookie goes along); the web build uses a download link instead. */
export function DownloadLink({ href, label, a11yLabel, testID }: { href: string; filename: string; label: string; a11yLabel?: string; testID?: string }) {
  return (
    <Pressable role="link" accessibilityLabel={a11yLabel ?? label} onPress={() => void Linking.openURL(href)} style={styles.link} testID={testID}>
      <Text style={styles.text}>{label}</Text>
    </Pressable>
  );
}

export const downloadStyles = StyleSheet.create({
  link: { minHeight: 44, justifyContent: 'center', paddingHorizontal: space.md, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.white },
  text: { color: colors.loom, fontFamily: fonts.bodyBold, fontSize: 15 },
});
const styles = downloadStyles;
