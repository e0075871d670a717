import { ScrollView, StyleSheet, View } from 'react-native';
import { colors, radius, space } from '@/constants/theme';
import { useIsWide } from '@/hooks/use-is-wide';
import { useHydrated } from '@/hooks/use-hydrated';
import { Body, Heading } from '@/components/ui/typography';
import { LoomMark } from '@/components/nav/loom-mark';
import { SignInForm } from './sign-in-form';
import { SignInAlternatives } from '@/components/auth/sign-in-alternatives';

const PROMISES = [
  ['Every shift covered', 'Qualified people on every seat, or a plain account of which seat stays open and why.'],
  ['Rest and hours respected', 'Rest periods, weekly hours and nights in a row are checked on every roster it makes or you edit.'],
  ['Trade-offs in the open', 'Each wish it could not honour is listed with what blocked it and what honouring it would cost.'],
] as const;

/** The signed-out front page: what Rotaloom does, and the way in. */
export function LandingScreen() {
  const wide = useIsWide();
  // The build writes this page as HTML, so the form is drawn before the code arrives; it takes
  // input once the code has hydrated it (until then typing would be lost and a tap do nothing).
  const ready = useHydrated();
  return (
    <ScrollView style={styles.page} contentContainerStyle={[styles.inner, wide && styles.innerWide]}>
      <View style={[styles.story, wide && styles.storyWide]}>
        <LoomMark size={wide ? 30 : 24} />
        <Heading style={[styles.title, wide && styles.titleWide]}>Rosters your team can trust, and question.</Heading>
        <Body muted style={styles.lead}>
          Rotaloom weaves your people, their skills and wishes, and your working-time rules into the best roster it can find, then tells you how close to
          the best possible it is.
        </Body>
        <View style={styles.promises}>
          {PROMISES.map(([title, text]) => (
            <View key={title} style={styles.promise}>
              <View style={styles.thread} />
              <View style={styles.promiseText}>
                <Body bold>{title}</Body>
                <Body muted>{text}</Body>
              </View>
            </View>
          ))}
        </View>
      </View>
      <View style={[styles.card, wide && styles.cardWide]}>
        <Heading level={2}>Sign in</Heading>
        <Body muted style={styles.cardLead}>
          For coordinators, staff and admins of a workspace.
        </Body>
        <View aria-disabled={!ready} aria-busy={!ready} pointerEvents={ready ? 'auto' : 'none'} style={styles.way}>
          <SignInForm />
          <SignInAlternatives />
        </View>
      </View>
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, backgroundColor: colors.paper },
  inner: { padding: space.xl, gap: space.xxl, paddingBottom: space.xxl * 2 },
  innerWide: { flexDirection: 'row', alignItems: 'flex-start', justifyContent: 'center', paddingVertical: 72, paddingHorizontal: 48, gap: 64 },
  story: { gap: space.lg },
  storyWide: { flex: 1, maxWidth: 560, paddingTop: space.xl },
  title: { marginTop: space.md },
  titleWide: { fontSize: 44, lineHeight: 52 },
  lead: { fontSize: 18, lineHeight: 27 },
  promises: { gap: space.lg, marginTop: space.sm },
  promise: { flexDirection: 'row', gap: space.md },
  thread: { width: 4, borderRadius: 2, backgroundColor: colors.thread },
  promiseText: { flex: 1, gap: 2 },
  card: { backgroundColor: colors.card, borderRadius: radius.lg, padding: space.xl, gap: space.md, borderWidth: 1, borderColor: colors.line },
  cardWide: { width: 400, padding: 32 },
  cardLead: { marginBottom: space.sm },
  way: { gap: space.md },
});
