import { useState, type ReactNode } from 'react';
import { Link, usePathname } from 'expo-router';
import { Pressable, ScrollView, StyleSheet, Text, View } from 'react-native';
import { useSafeAreaInsets } from 'react-native-safe-area-context';
import { colors, fonts, space } from '@/constants/theme';
import { useIsWide } from '@/hooks/use-is-wide';
import type { Session } from '@/hooks/api/get-session';
import { useSignOut } from '@/hooks/api/sign-out';
import { LoomMark } from './loom-mark';
import { navItemsFor } from './nav-items';
import { PastDueBanner } from '@/components/billing/past-due-banner';

/**
 * The signed-in frame: a side column on wide screens, a bottom bar on phones, with the same
 * items either way so people find things in the same order on both.
 */
export function NavShell({ session, children }: { session: Session; children: ReactNode }) {
  const wide = useIsWide();
  const pathname = usePathname();
  const items = navItemsFor(session.role, session.personId);
  // A phone has room for about five tabs; the rest go behind "More".
  const tabs = items.length > MAX_TABS ? items.slice(0, MAX_TABS - 1) : items;
  const overflow = items.slice(tabs.length);
  const [moreOpen, setMoreOpen] = useState(false);
  const insets = useSafeAreaInsets();
  const signOut = useSignOut();
  const isActive = (href: string) => pathname === href || pathname.startsWith(`${href}/`);

  // Styles below are flattened: Link asChild passes them to a DOM anchor on web, which rejects arrays.
  if (wide) {
    return (
      <View style={styles.wideRoot}>
        <View style={styles.side} role="navigation" aria-label="Main" testID="side-nav">
          <LoomMark inverse />
          <Text style={styles.workspace}>{session.workspace?.name ?? 'No workspace'}</Text>
          <View style={styles.sideItems}>
            {items.map((item) => (
              <Link key={item.href} href={item.href} asChild>
                <Pressable role="link" aria-current={isActive(item.href) ? 'page' : undefined} style={StyleSheet.flatten([styles.sideItem, isActive(item.href) && styles.sideItemActive])}>
                  <Text style={[styles.sideLabel, isActive(item.href) && styles.sideLabelActive]}>{item.label}</Text>
                </Pressable>
              </Link>
            ))}
          </View>
          <View style={styles.sideFoot}>
            <Text style={styles.who}>{session.user.displayName}</Text>
            <Text style={styles.role}>{session.role ?? ''}</Text>
            <Pressable role="button" onPress={() => signOut.mutate()} style={styles.signOut}>
              <Text style={styles.signOutLabel}>Sign out</Text>
            </Pressable>
          </View>
        </View>
        <ScrollView style={styles.content} contentContainerStyle={styles.wideContent}>
          {session.role === 'admin' ? <PastDueBanner /> : null}
          {children}
        </ScrollView>
      </View>
    );
  }

  return (
    <View style={[styles.phoneRoot, { paddingTop: insets.top }]}>
      <View style={styles.topBar}>
        <LoomMark size={20} />
        <Pressable role="button" onPress={() => signOut.mutate()} accessibilityLabel="Sign out">
          <Text style={styles.topSignOut}>Sign out</Text>
        </Pressable>
      </View>
      <ScrollView style={styles.content} contentContainerStyle={styles.phoneContent}>
        {session.role === 'admin' ? <PastDueBanner /> : null}
        {children}
      </ScrollView>
      {moreOpen ? (
        <View style={styles.moreSheet} role="menu" aria-label="More sections" testID="more-sheet">
          {overflow.map((item) => (
            <Link key={item.href} href={item.href} asChild>
              <Pressable role="menuitem" onPress={() => setMoreOpen(false)} style={styles.moreItem}>
                <Text style={[styles.moreLabel, isActive(item.href) && styles.tabLabelActive]}>{item.label}</Text>
              </Pressable>
            </Link>
          ))}
        </View>
      ) : null}
      <View style={[styles.tabs, { paddingBottom: Math.max(insets.bottom, space.sm) }]} role="navigation" aria-label="Main" testID="bottom-tabs">
        {tabs.map((item) => (
          <Link key={item.href} href={item.href} asChild>
            <Pressable role="link" aria-current={isActive(item.href) ? 'page' : undefined} style={styles.tab} onPress={() => setMoreOpen(false)}>
              <View style={[styles.tabMark, isActive(item.href) && styles.tabMarkActive]} />
              <Text style={[styles.tabLabel, isActive(item.href) && styles.tabLabelActive]} numberOfLines={1}>
                {item.label}
              </Text>
            </Pressable>
          </Link>
        ))}
        {overflow.length > 0 ? (
          <Pressable role="button" aria-expanded={moreOpen} accessibilityLabel="More sections" style={styles.tab} onPress={() => setMoreOpen((o) => !o)} testID="more-tab">
            <View style={[styles.tabMark, (moreOpen || overflow.some((i) => isActive(i.href))) && styles.tabMarkActive]} />
            <Text style={[styles.tabLabel, overflow.some((i) => isActive(i.href)) && styles.tabLabelActive]}>More</Text>
          </Pressable>
        ) : null}
      </View>
    </View>
  );
}

const MAX_TABS = 5;

const styles = StyleSheet.create({
  wideRoot: { flex: 1, flexDirection: 'row', backgroundColor: colors.paper },
  side: { width: 248, backgroundColor: colors.loom, paddingVertical: space.xl, paddingHorizontal: space.lg, gap: space.md },
  workspace: { color: colors.loomSoft, fontFamily: fonts.body, fontSize: 14 },
  sideItems: { marginTop: space.lg, gap: space.xs },
  sideItem: { paddingVertical: space.md, paddingHorizontal: space.md, borderRadius: 8 },
  sideItemActive: { backgroundColor: 'rgba(255,255,255,0.12)', borderLeftWidth: 3, borderLeftColor: colors.thread },
  sideLabel: { color: colors.paper, fontFamily: fonts.body, fontSize: 16 },
  sideLabelActive: { fontFamily: fonts.bodyBold },
  sideFoot: { marginTop: 'auto', gap: 2 },
  who: { color: colors.paper, fontFamily: fonts.bodyBold },
  role: { color: colors.loomSoft, fontFamily: fonts.body, fontSize: 13 },
  signOut: { marginTop: space.sm, paddingVertical: space.sm },
  signOutLabel: { color: colors.threadSoft, fontFamily: fonts.bodyBold },
  content: { flex: 1 },
  wideContent: { padding: space.xxl, maxWidth: 1200, width: '100%' },
  phoneRoot: { flex: 1, backgroundColor: colors.paper },
  topBar: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', paddingHorizontal: space.lg, paddingVertical: space.md, borderBottomWidth: 1, borderBottomColor: colors.line, backgroundColor: colors.card },
  topSignOut: { color: colors.loom, fontFamily: fonts.bodyBold, fontSize: 14 },
  phoneContent: { padding: space.lg, paddingBottom: space.xxl },
  moreSheet: { position: 'absolute', right: space.sm, bottom: 72, minWidth: 200, backgroundColor: colors.card, borderRadius: 12, borderWidth: 1, borderColor: colors.line, paddingVertical: space.xs, shadowColor: '#000', shadowOpacity: 0.12, shadowRadius: 12, shadowOffset: { width: 0, height: 4 }, zIndex: 10 },
  moreItem: { paddingVertical: space.md, paddingHorizontal: space.lg, minHeight: 48, justifyContent: 'center' },
  moreLabel: { fontFamily: fonts.body, fontSize: 16, color: colors.ink },
  tabs: { flexDirection: 'row', borderTopWidth: 1, borderTopColor: colors.line, backgroundColor: colors.card, paddingTop: space.xs },
  tab: { flex: 1, alignItems: 'center', paddingVertical: space.xs, gap: 4, minHeight: 48, justifyContent: 'center' },
  tabMark: { width: 24, height: 4, borderRadius: 2, backgroundColor: 'transparent' },
  tabMarkActive: { backgroundColor: colors.thread },
  tabLabel: { fontFamily: fonts.body, fontSize: 12, color: colors.inkSoft },
  tabLabelActive: { color: colors.loom, fontFamily: fonts.bodyBold },
});
