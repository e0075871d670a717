import { useState } from 'react';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';
import { usePeople } from '@/hooks/api/get-people';
import { TextField } from '@/components/ui/text-field';
import { Body } from '@/components/ui/typography';

/**
 * Finds a person record of this workspace by name, offering only those without a login (or the
 * member's own), since each person can belong to one member.
 */
export function PersonPicker({ label, forUserId, onPick, testID }: { label: string; forUserId?: number; onPick: (person: { id: number; name: string }) => void; testID?: string }) {
  const [q, setQ] = useState('');
  const people = usePeople({ q: q.trim() || undefined, pageSize: 8 });
  const choices = (people.data?.items ?? []).filter((p) => p.userId === null || p.userId === forUserId);
  return (
    <View style={styles.box} testID={testID}>
      <TextField label={label} placeholder="Type part of a name" value={q} onChangeText={setQ} autoCapitalize="words" />
      {people.error ? <Body muted>{people.error.message}</Body> : null}
      {people.data && choices.length === 0 ? <Body muted>No person without a login matches.</Body> : null}
      <View style={styles.list}>
        {choices.map((p) => (
          <Pressable key={p.id} role="button" aria-label={`Choose ${p.name}`} onPress={() => onPick({ id: p.id, name: p.name })} style={styles.choice}>
            <Text style={styles.name}>{p.name}</Text>
            {p.email ? <Text style={styles.email}>{p.email}</Text> : null}
          </Pressable>
        ))}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  box: { gap: space.sm },
  list: { gap: space.xs },
  choice: { borderWidth: 1, borderColor: colors.line, borderRadius: radius.sm, paddingHorizontal: space.md, paddingVertical: space.sm, backgroundColor: colors.white, minHeight: 44, justifyContent: 'center' },
  name: { fontFamily: fonts.body, fontSize: 15, color: colors.ink },
  email: { fontFamily: fonts.body, fontSize: 13, color: colors.inkSoft },
});
