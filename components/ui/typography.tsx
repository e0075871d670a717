import { StyleSheet, Text, type TextProps } from 'react-native';
import { colors, fonts } from '@/constants/theme';

export function Heading({ style, level = 1, ...props }: TextProps & { level?: 1 | 2 | 3 }) {
  return <Text role="heading" aria-level={level} style={[styles.heading, styles[`h${level}`], style]} {...props} />;
}

export function Body({ style, muted, bold, ...props }: TextProps & { muted?: boolean; bold?: boolean }) {
  return <Text style={[styles.body, muted && styles.muted, bold && styles.bold, style]} {...props} />;
}

const styles = StyleSheet.create({
  heading: { fontFamily: fonts.heading, color: colors.ink },
  h1: { fontSize: 34, lineHeight: 40 },
  h2: { fontSize: 24, lineHeight: 30 },
  h3: { fontSize: 18, lineHeight: 24 },
  body: { fontFamily: fonts.body, color: colors.ink, fontSize: 16, lineHeight: 23 },
  muted: { color: colors.inkSoft },
  bold: { fontFamily: fonts.bodyBold },
});
