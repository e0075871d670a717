import { Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';
import type { Role } from '@/hooks/api/get-session';

const ROLES: Array<{ role: Role; label: string }> = [
  { role: 'admin', label: 'Admin' },
  { role: 'coordinator', label: 'Coordinator' },
  { role: 'staff', label: 'Staff' },
];

/** Three choices side by side; big enough to tap on a phone. */
export function RolePicker({ value, onChange, disabled, label, testID }: { value: Role; onChange: (role: Role) => void; disabled?: boolean; label: string; testID?: string }) {
  return (
    <View role="radiogroup" aria-label={label} style={styles.row} testID={testID}>
      {ROLES.map(({ role, label: text }) => {
        const on = role === value;
        return (
          <Pressable key={role} role="radio" aria-checked={on} aria-label={text} disabled={disabled} onPress={() => !on && onChange(role)} style={[styles.option, on && styles.on, disabled && styles.disabled]}>
            <Text style={[styles.text, on && styles.textOn]}>{text}</Text>
          </Pressable>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', borderWidth: 1, borderColor: colors.line, borderRadius: radius.md, overflow: 'hidden', alignSelf: 'flex-start' },
  option: { minHeight: 40, paddingHorizontal: space.md, justifyContent: 'center', backgroundColor: colors.white },
  on: { backgroundColor: colors.loom },
  disabled: { opacity: 0.6 },
  text: { fontFamily: fonts.body, fontSize: 14, color: colors.ink },
  textOn: { color: colors.white, fontFamily: fonts.bodyBold },
});
