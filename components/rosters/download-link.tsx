import { useState } from 'react';
import { Linking, Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';
import { fetchDownload } from './download-link-fetch';

/**
 * Opens a file address from the API (the session cookie goes along); the web build saves it
 * instead. A large export is made by a worker first (the API answers 202): the link says it is
 * preparing the file, then opens the prepared file's address.
 */
export function DownloadLink({ href, label, a11yLabel, testID }: { href: string; filename: string; label: string; a11yLabel?: string; testID?: string }) {
  const [state, setState] = useState<{ kind: 'idle' | 'preparing' } | { kind: 'failed'; message: string }>({ kind: 'idle' });
  const onPress = () => {
    if (state.kind === 'preparing') return;
    fetchDownload(href, { onPreparing: () => setState({ kind: 'preparing' }) })
      .then((got) => {
        setState({ kind: 'idle' });
        // A small file came at once; the phone's viewer fetches it again from the same address.
        void Linking.openURL(got.kind === 'prepared' ? got.url : href);
      })
      .catch((err: unknown) => setState({ kind: 'failed', message: err instanceof Error ? err.message : String(err) }));
  };
  return (
    <View style={styles.wrap}>
      <Pressable role="link" accessibilityLabel={a11yLabel ?? label} accessibilityState={{ busy: state.kind === 'preparing' }} onPress={onPress} style={styles.link} testID={testID}>
        <Text style={styles.text}>{state.kind === 'preparing' ? `Preparing ${label}…` : label}</Text>
      </Pressable>
      {state.kind === 'preparing' ? <Text style={styles.note} role="status">A large file: it is being made and opens by itself in a few seconds.</Text> : null}
      {state.kind === 'failed' ? <Text style={styles.note} role="alert">{state.message}</Text> : null}
    </View>
  );
}

export const downloadStyles = StyleSheet.create({
  wrap: { gap: space.xs, maxWidth: 360 },
  link: { minHeight: 44, justifyContent: 'center', paddingHorizontal: space.md, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.white },
  text: { color: colors.loom, fontFamily: fonts.bodyBold, fontSize: 15 },
  note: { color: colors.ink, fontFamily: fonts.body, fontSize: 14 },
});
const styles = downloadStyles;
