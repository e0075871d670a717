import type { ReactNode } from 'react';
import { ActivityIndicator, Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';
import { Notice } from '@/components/ui/notice';
import { Body, Heading } from '@/components/ui/typography';

/** A card with a heading: the building block of the roster pages. */
export function Panel({ title, lead, children, testID, right }: { title: string; lead?: string; children: ReactNode; testID?: string; right?: ReactNode }) {
  return (
    <View style={styles.panel} testID={testID}>
      <View style={styles.panelHead}>
        <View style={{ flex: 1, minWidth: 160, gap: 2 }}>
          <Heading level={2} style={styles.panelTitle}>
            {title}
          </Heading>
          {lead ? <Body muted>{lead}</Body> : null}
        </View>
        {right}
      </View>
      {children}
    </View>
  );
}

/** Loading / error / content, so every section shows one of the three. */
export function Loadable<T>({ query, label, children }: { query: { isPending: boolean; error: Error | null; data: T | undefined }; label: string; children: (data: T) => ReactNode }) {
  if (query.error) return <Notice>{`${label} could not be loaded: ${query.error.message}`}</Notice>;
  if (query.isPending || query.data === undefined) {
    return (
      <View style={styles.loading}>
        <ActivityIndicator color={colors.loom} accessibilityLabel={`Loading ${label.toLowerCase()}`} />
      </View>
    );
  }
  return <>{children(query.data)}</>;
}

/** A row of choices where one is on (weekdays, hard/soft, sections). */
export function Choices<T extends string>({ label, options, value, onChange, multi, testID }: { label: string; options: Array<{ value: T; label: string }>; value: T[]; onChange: (v: T[]) => void; multi?: boolean; testID?: string }) {
  return (
    <View role={multi ? 'group' : 'radiogroup'} aria-label={label} style={styles.choices} testID={testID}>
      {options.map((o) => {
        const on = value.includes(o.value);
        return (
          <Pressable
            key={o.value}
            role={multi ? 'checkbox' : 'radio'}
            aria-checked={on}
            accessibilityLabel={`${label}: ${o.label}`}
            onPress={() => onChange(multi ? (on ? value.filter((v) => v !== o.value) : [...value, o.value]) : [o.value])}
            style={[styles.choice, on && styles.choiceOn]}
          >
            <Text style={[styles.choiceText, on && styles.choiceTextOn]}>{o.label}</Text>
          </Pressable>
        );
      })}
    </View>
  );
}

export function Pill({ children, tone = 'plain' }: { children: string; tone?: 'plain' | 'good' | 'warn' | 'bad' }) {
  return (
    <View style={[styles.pill, styles[`pill_${tone}`]]}>
      <Text style={styles.pillText}>{children}</Text>
    </View>
  );
}

const styles = StyleSheet.create({
  panel: { backgroundColor: colors.card, borderRadius: radius.md, borderWidth: 1, borderColor: colors.line, padding: space.lg, gap: space.md },
  panelHead: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'flex-start' },
  panelTitle: { fontSize: 20, lineHeight: 26 },
  loading: { padding: space.lg, alignItems: 'center' },
  choices: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  choice: { minHeight: 40, minWidth: 44, paddingHorizontal: space.md, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.line, alignItems: 'center', justifyContent: 'center', backgroundColor: colors.white },
  choiceOn: { backgroundColor: colors.loom, borderColor: colors.loom },
  choiceText: { fontFamily: fonts.body, color: colors.ink, fontSize: 15 },
  choiceTextOn: { color: colors.white, fontFamily: fonts.bodyBold },
  pill: { borderRadius: 999, paddingHorizontal: space.sm, paddingVertical: 2, alignSelf: 'flex-start' },
  pill_plain: { backgroundColor: colors.loomSoft },
  pill_good: { backgroundColor: '#DCEBDD' },
  pill_warn: { backgroundColor: colors.threadSoft },
  pill_bad: { backgroundColor: colors.dangerSoft },
  pillText: { fontFamily: fonts.bodyBold, fontSize: 13, color: colors.ink },
});
