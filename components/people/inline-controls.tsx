import type { ReactNode } from 'react';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { router, type Href } from 'expo-router';
import { colors, fonts, radius, space } from '@/constants/theme';
import { useSession } from '@/hooks/api/get-session';
import { Notice } from '@/components/ui/notice';

/** People, skills and pairings are for coordinators and admins (DESIGN.md, Roles); the server says so too. */
export function CoordinatorsOnly({ children, what }: { children: ReactNode; what: string }) {
  const { data: session } = useSession();
  if (!session) return null;
  if (session.role !== 'admin' && session.role !== 'coordinator') return <Notice>{`Only coordinators and admins manage ${what}.`}</Notice>;
  return <>{children}</>;
}

/** A toggle shown as a rounded label: skills on a person, filters. */
/** A toggle chip: a checkbox on its own or among several picks, a radio inside a one-of-many group. */
export function Chip({ label, selected, onPress, testID, accessibilityLabel, role = 'checkbox' }: { label: string; selected: boolean; onPress: () => void; testID?: string; accessibilityLabel?: string; role?: 'checkbox' | 'radio' }) {
  return (
    <Pressable
      role={role}
      aria-checked={selected}
      accessibilityLabel={accessibilityLabel ?? label}
      onPress={onPress}
      testID={testID}
      style={({ hovered }: { pressed: boolean; hovered?: boolean }) => [styles.chip, selected && styles.chipOn, hovered && !selected && styles.chipHover]}
    >
      <Text style={[styles.chipLabel, selected && styles.chipLabelOn]}>{selected ? `✓ ${label}` : label}</Text>
    </Pressable>
  );
}

/**
 * A link that looks like a quiet button (navigation, not an action). It navigates itself rather
 * than through <Link asChild>: on the web that Slot spread an array style into an object with
 * key "0", which the browser refuses.
 */
export function LinkButton({ href, label, testID, primary }: { href: Href; label: string; testID?: string; primary?: boolean }) {
  return (
    <Pressable role="link" testID={testID} accessibilityLabel={label} onPress={() => router.push(href)} style={primary ? styles.linkButtonPrimaryAll : styles.linkButton}>
      <Text style={primary ? styles.linkButtonLabelPrimaryAll : styles.linkButtonLabel}>{label}</Text>
    </Pressable>
  );
}

export function Tag({ children, tone = 'plain' }: { children: string; tone?: 'plain' | 'good' | 'warn' | 'bad' }) {
  return (
    <View style={[styles.tag, styles[`tag_${tone}`]]}>
      <Text style={styles.tagLabel}>{children}</Text>
    </View>
  );
}

export const formatHours = (h: number) => `${Number.isInteger(h) ? h : h.toFixed(2).replace(/0$/, '')} h`;

const styles = StyleSheet.create({
  chip: { borderWidth: 1, borderColor: colors.line, borderRadius: 999, paddingHorizontal: space.md, minHeight: 36, justifyContent: 'center', backgroundColor: colors.white },
  chipOn: { backgroundColor: colors.loom, borderColor: colors.loom },
  chipHover: { backgroundColor: colors.loomSoft },
  chipLabel: { fontFamily: fonts.body, fontSize: 14, color: colors.ink },
  chipLabelOn: { color: colors.white, fontFamily: fonts.bodyBold },
  linkButton: { minHeight: 44, borderRadius: radius.md, paddingHorizontal: space.lg, borderWidth: 1, borderColor: colors.line, alignItems: 'center', justifyContent: 'center' },
  linkButtonPrimaryAll: { minHeight: 44, borderRadius: radius.md, paddingHorizontal: space.lg, borderWidth: 1, alignItems: 'center', justifyContent: 'center', backgroundColor: colors.thread, borderColor: colors.thread },
  linkButtonLabel: { fontFamily: fonts.bodyBold, fontSize: 15, color: colors.loom },
  linkButtonLabelPrimaryAll: { fontFamily: fonts.bodyBold, fontSize: 15, color: colors.white },
  tag: { borderRadius: radius.sm, paddingHorizontal: space.sm, paddingVertical: 2, alignSelf: 'flex-start' },
  tag_plain: { backgroundColor: colors.loomSoft },
  tag_good: { backgroundColor: '#DCEBDD' },
  tag_warn: { backgroundColor: colors.threadSoft },
  tag_bad: { backgroundColor: colors.dangerSoft },
  tagLabel: { fontFamily: fonts.body, fontSize: 13, color: colors.ink },
});
