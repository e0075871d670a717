import { Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';

export interface Choice<T extends string> {
  value: T;
  label: string;
  /** Colour of the chip when chosen; defaults to the loom green. */
  tone?: string;
}

/** A row of single-choice buttons (a radio group), big enough to tap on a phone. */
export function ChoiceChips<T extends string>({
  label,
  choices,
  value,
  onChange,
  disabled,
  testID,
}: {
  label: string;
  choices: ReadonlyArray<Choice<T>>;
  value: T | null;
  onChange: (value: T) => void;
  disabled?: boolean;
  testID?: string;
}) {
  return (
    <View role="radiogroup" aria-label={label} style={styles.row} testID={testID}>
      {choices.map((c) => {
        const on = c.value === value;
        return (
          <Pressable
            key={c.value}
            role="radio"
            aria-checked={on}
            accessibilityLabel={c.label}
            disabled={disabled}
            onPress={() => onChange(c.value)}
            style={[styles.chip, on && { backgroundColor: c.tone ?? colors.loom, borderColor: c.tone ?? colors.loom }, disabled && styles.disabled]}
          >
            <Text style={[styles.text, on && styles.textOn]}>{c.label}</Text>
          </Pressable>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  chip: { minHeight: 44, minWidth: 44, paddingHorizontal: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.white, alignItems: 'center', justifyContent: 'center' },
  text: { fontFamily: fonts.bodyBold, fontSize: 15, color: colors.loom },
  textOn: { color: colors.white },
  disabled: { opacity: 0.5 },
});
