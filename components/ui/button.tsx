import { ActivityIndicator, Pressable, StyleSheet, Text } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';

interface ButtonProps {
  label: string;
  onPress: () => void;
  kind?: 'primary' | 'quiet';
  busy?: boolean;
  disabled?: boolean;
  testID?: string;
}

export function Button({ label, onPress, kind = 'primary', busy, disabled, testID }: ButtonProps) {
  const inactive = disabled || busy;
  return (
    <Pressable
      role="button"
      accessibilityLabel={label}
      accessibilityState={{ disabled: inactive, busy }}
      disabled={inactive}
      onPress={onPress}
      testID={testID}
      style={({ pressed, hovered }: { pressed: boolean; hovered?: boolean }) => [
        styles.base,
        kind === 'primary' ? styles.primary : styles.quiet,
        (pressed || hovered) && !inactive && (kind === 'primary' ? styles.primaryActive : styles.quietActive),
        inactive && styles.inactive,
      ]}
    >
      {busy ? <ActivityIndicator color={kind === 'primary' ? colors.white : colors.loom} /> : null}
      <Text style={[styles.label, kind === 'primary' ? styles.primaryLabel : styles.quietLabel]}>{label}</Text>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  base: { minHeight: 48, borderRadius: radius.md, paddingHorizontal: space.xl, flexDirection: 'row', alignItems: 'center', justifyContent: 'center', gap: space.sm },
  primary: { backgroundColor: colors.thread },
  primaryActive: { backgroundColor: '#9C4E15' },
  quiet: { backgroundColor: 'transparent', borderWidth: 1, borderColor: colors.line },
  quietActive: { backgroundColor: colors.loomSoft },
  inactive: { opacity: 0.6 },
  label: { fontFamily: 'AtkinsonHyperlegible-Bold', fontSize: 16 },
  primaryLabel: { color: colors.white },
  quietLabel: { color: colors.loom },
});

export const buttonFont = fonts.bodyBold;
