import { useEffect, useState } from 'react';
import { ActivityIndicator, Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';
import { usePeople } from '@/hooks/api/get-people';
import { TextField } from '@/components/ui/text-field';

export interface PickedPerson {
  id: number;
  name: string;
}

/** Type part of a name, then choose from the matches the server finds. */
export function PersonPicker({ label, value, onChange, error, testID }: { label: string; value: PickedPerson | null; onChange: (p: PickedPerson | null) => void; error?: string; testID?: string }) {
  const [text, setText] = useState('');
  const [q, setQ] = useState('');
  useEffect(() => {
    const t = setTimeout(() => setQ(text.trim()), 200);
    return () => clearTimeout(t);
  }, [text]);
  const matches = usePeople({ q, pageSize: 6, sort: 'name' });

  if (value) {
    return (
      <View style={styles.field}>
        <Text style={styles.label}>{label}</Text>
        <View style={styles.picked}>
          <Text style={styles.pickedName} testID={testID ? `${testID}-picked` : undefined}>{value.name}</Text>
          <Pressable role="button" accessibilityLabel={`Change ${label.toLowerCase()}`} onPress={() => { onChange(null); setText(''); }}>
            <Text style={styles.change}>Change</Text>
          </Pressable>
        </View>
        {error ? <Text role="alert" style={styles.error}>{error}</Text> : null}
      </View>
    );
  }
  return (
    <View style={styles.field}>
      <TextField label={label} value={text} onChangeText={setText} placeholder="Type a name" autoCapitalize="words" error={error} testID={testID} />
      {q ? (
        matches.isPending ? (
          <ActivityIndicator color={colors.loom} />
        ) : matches.error ? (
          <Text style={styles.error}>{matches.error.message}</Text>
        ) : matches.data.items.length === 0 ? (
          <Text style={styles.none}>{`Nobody called "${q}"`}</Text>
        ) : (
          <View role="list" aria-label={`Matches for ${label}`} style={styles.matches}>
            {matches.data.items.map((p) => (
              <Pressable key={p.id} role="button" accessibilityLabel={`Choose ${p.name}`} onPress={() => { onChange({ id: p.id, name: p.name }); setText(''); setQ(''); }} style={({ hovered }: { pressed: boolean; hovered?: boolean }) => [styles.match, hovered && styles.matchHover]}>
                <Text style={styles.matchName}>{p.name}</Text>
              </Pressable>
            ))}
          </View>
        )
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  field: { gap: space.xs, flex: 1, minWidth: 220 },
  label: { fontFamily: fonts.bodyBold, color: colors.ink, fontSize: 15 },
  picked: { minHeight: 48, borderWidth: 1, borderColor: colors.loom, borderRadius: radius.sm, paddingHorizontal: space.md, flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', backgroundColor: colors.loomSoft },
  pickedName: { fontFamily: fonts.bodyBold, fontSize: 16, color: colors.ink },
  change: { fontFamily: fonts.bodyBold, color: colors.loom, textDecorationLine: 'underline' },
  matches: { borderWidth: 1, borderColor: colors.line, borderRadius: radius.sm, backgroundColor: colors.white },
  match: { paddingHorizontal: space.md, paddingVertical: space.sm, minHeight: 44, justifyContent: 'center', borderBottomWidth: 1, borderBottomColor: colors.line },
  matchHover: { backgroundColor: colors.loomSoft },
  matchName: { fontFamily: fonts.body, fontSize: 16, color: colors.ink },
  none: { fontFamily: fonts.body, color: colors.inkSoft },
  error: { color: colors.danger, fontFamily: fonts.body, fontSize: 14 },
});
