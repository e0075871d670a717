import { useState } from 'react';
import { ActivityIndicator, Linking, StyleSheet, TextInput, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';
import { useMyFeed } from '@/hooks/api/get-my-feed';
import { useResetMyFeed } from '@/hooks/api/reset-my-feed';
import { useStopMyFeed } from '@/hooks/api/stop-my-feed';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body } from '@/components/ui/typography';
import { Section } from '@/components/auth/section';
import { copyText } from './copy-text';

/**
 * The private calendar address (iCalendar). Only a fingerprint of it is kept on the server, so the
 * address is shown once, when made; making a new one turns the old one off.
 */
export function CalendarFeedSection() {
  const feed = useMyFeed();
  const reset = useResetMyFeed();
  const stop = useStopMyFeed();
  const [copied, setCopied] = useState<'yes' | 'no' | null>(null);
  const [confirming, setConfirming] = useState(false);
  const url = reset.data?.url;
  const error = reset.error ?? stop.error;

  const make = () => {
    setCopied(null);
    setConfirming(false);
    reset.mutate();
  };
  return (
    <Section title="Add to your calendar" lead="A private address your phone’s calendar can subscribe to. It shows your published shifts and updates when a roster is published again." testID="calendar-feed">
      {feed.isPending ? <ActivityIndicator color={colors.loom} accessibilityLabel="Loading your calendar address" /> : null}
      {feed.error ? <Notice>{feed.error.message}</Notice> : null}
      {url ? (
        <View style={styles.urlBox}>
          <Body bold>Your calendar address</Body>
          <TextInput value={url} editable={false} selectTextOnFocus accessibilityLabel="Calendar address" style={styles.url} multiline testID="feed-url" />
          <View style={styles.row}>
            <Button label="Copy address" onPress={() => void copyText(url).then((ok) => setCopied(ok ? 'yes' : 'no'))} testID="feed-copy" />
            <Button kind="quiet" label="Open in calendar app" onPress={() => void Linking.openURL(url.replace(/^https?:/, 'webcal:')).catch(() => undefined)} />
          </View>
          {copied === 'yes' ? <Notice kind="info">Copied. In your calendar app, add a calendar “from URL” or “by subscription” and paste it.</Notice> : null}
          {copied === 'no' ? <Notice kind="caution">This browser would not copy it; select the address above and copy it by hand.</Notice> : null}
          <Notice kind="caution">Keep this address to yourself: anyone who has it can see your shifts. It is shown only now; if you lose it, make a new one.</Notice>
        </View>
      ) : feed.data?.active ? (
        <Body muted testID="feed-active">{`Your calendar address is on (made ${new Date(feed.data.createdAt!).toLocaleDateString()}). For another device or if it may have leaked, make a new one: the old one stops working at once.`}</Body>
      ) : feed.data ? (
        <Body muted>You have no calendar address yet.</Body>
      ) : null}
      {error ? <Notice>{error.message}</Notice> : null}
      {feed.data?.active && !url ? (
        confirming ? (
          <View style={styles.row}>
            <Button label="Yes, make a new address" onPress={make} busy={reset.isPending} testID="feed-reset-confirm" />
            <Button kind="quiet" label="Keep the old one" onPress={() => setConfirming(false)} />
          </View>
        ) : (
          <View style={styles.row}>
            <Button label="Make a new address" onPress={() => setConfirming(true)} testID="feed-reset" />
            <Button kind="quiet" label="Turn off" onPress={() => stop.mutate()} busy={stop.isPending} />
          </View>
        )
      ) : !url ? (
        <Button label="Make my calendar address" onPress={make} busy={reset.isPending} testID="feed-make" />
      ) : null}
    </Section>
  );
}

const styles = StyleSheet.create({
  urlBox: { gap: space.sm },
  url: { borderWidth: 1, borderColor: colors.line, borderRadius: radius.sm, padding: space.md, backgroundColor: colors.white, fontFamily: fonts.body, fontSize: 14, color: colors.ink, minHeight: 64 },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
});
