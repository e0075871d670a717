import type { ReactNode } from 'react';
import { ScrollView, StyleSheet, View } from 'react-native';
import { Link } from 'expo-router';
import { colors, fonts, radius, space } from '@/constants/theme';
import { useIsWide } from '@/hooks/use-is-wide';
import { LoomMark } from '@/components/nav/loom-mark';
import { Body, Heading } from '@/components/ui/typography';

/** The frame of the signed-out account pages: the mark, one card with a title, and a way back. */
export function AuthPage({ title, lead, children, back = true }: { title: string; lead?: string; children: ReactNode; back?: boolean }) {
  const wide = useIsWide();
  return (
    <ScrollView style={styles.page} contentContainerStyle={[styles.inner, wide && styles.innerWide]}>
      <Link href="/" accessibilityLabel="Rotaloom front page">
        <LoomMark size={wide ? 26 : 22} />
      </Link>
      <View style={[styles.card, wide && styles.cardWide]}>
        <Heading level={2}>{title}</Heading>
        {lead ? <Body muted>{lead}</Body> : null}
        {children}
      </View>
      {back ? (
        <Link href="/" style={styles.back}>
          Back to sign-in
        </Link>
      ) : null}
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, backgroundColor: colors.paper },
  inner: { padding: space.xl, gap: space.xl, paddingBottom: space.xxl * 2 },
  innerWide: { alignItems: 'center', paddingVertical: 64 },
  card: { backgroundColor: colors.card, borderRadius: radius.lg, padding: space.xl, gap: space.lg, borderWidth: 1, borderColor: colors.line },
  cardWide: { width: 440, padding: 32 },
  back: { color: colors.loom, fontFamily: fonts.bodyBold, fontSize: 15, textAlign: 'center' },
});
