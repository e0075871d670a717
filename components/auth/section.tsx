import type { ReactNode } from 'react';
import { StyleSheet, View } from 'react-native';
import { colors, radius, space } from '@/constants/theme';
import { Body, Heading } from '@/components/ui/typography';

/** A titled card on the signed-in account and members pages. */
export function Section({ title, lead, children, testID }: { title: string; lead?: string; children: ReactNode; testID?: string }) {
  return (
    <View style={styles.card} testID={testID}>
      <Heading level={3}>{title}</Heading>
      {lead ? <Body muted>{lead}</Body> : null}
      {children}
    </View>
  );
}

const styles = StyleSheet.create({
  card: { backgroundColor: colors.card, borderRadius: radius.lg, padding: space.xl, gap: space.md, borderWidth: 1, borderColor: colors.line },
});
