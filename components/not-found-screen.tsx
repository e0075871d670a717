import { Link } from 'expo-router';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, space } from '@/constants/theme';
import { Body, Heading } from '@/components/ui/typography';
import { LoomMark } from '@/components/nav/loom-mark';

export function NotFoundScreen() {
  return (
    <View style={styles.page}>
      <LoomMark />
      <Heading level={1} style={styles.title}>
        This page is not on the roster
      </Heading>
      <Body muted style={styles.text}>
        The address may be mistyped, or the page may have moved.
      </Body>
      <Link href="/" style={styles.link}>
        <Text style={styles.linkText}>Back to the start</Text>
      </Link>
    </View>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, alignItems: 'center', justifyContent: 'center', padding: space.xl, gap: space.lg, backgroundColor: colors.paper },
  title: { textAlign: 'center', fontSize: 28, lineHeight: 34 },
  text: { textAlign: 'center' },
  link: { padding: space.md },
  linkText: { color: colors.thread, fontFamily: fonts.bodyBold, fontSize: 16, textDecorationLine: 'underline' },
});
