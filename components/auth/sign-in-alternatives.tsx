import { StyleSheet, View } from 'react-native';
import { useLocalSearchParams } from 'expo-router';
import { colors, space } from '@/constants/theme';
import { Body } from '@/components/ui/typography';
import { Notice } from '@/components/ui/notice';
import { useHydrated } from '@/hooks/use-hydrated';
import { GoogleButton } from './google-button';
import { TextLink } from './text-link';

/** Under the sign-in form: Google, a forgotten password, a new account; and why a Google sign-in came back. */
export function SignInAlternatives() {
  const { signInError } = useLocalSearchParams<{ signInError?: string }>();
  // The landing page's HTML is written at build time without a query: the reason shows after hydration.
  const hydrated = useHydrated();
  return (
    <View style={styles.box}>
      {hydrated && signInError ? <Notice>{signInError}</Notice> : null}
      <View style={styles.or}>
        <View style={styles.rule} />
        <Body muted>or</Body>
        <View style={styles.rule} />
      </View>
      <GoogleButton />
      <View style={styles.links}>
        <TextLink href="/forgot-password" label="Forgot your password?" testID="forgot-password-link" />
        <TextLink href="/sign-up" label="New here? Make a workspace" testID="sign-up-link" />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  box: { gap: space.lg, marginTop: space.sm },
  or: { flexDirection: 'row', alignItems: 'center', gap: space.md },
  rule: { flex: 1, height: 1, backgroundColor: colors.line },
  links: { gap: space.md },
});
