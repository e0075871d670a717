import { useState } from 'react';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { useRouter } from 'expo-router';
import { colors, fonts, radius, space } from '@/constants/theme';
import { createWorkspaceSchema } from '@/shared/auth/schemas';
import { useSession } from '@/hooks/api/get-session';
import { useSwitchWorkspace } from '@/hooks/api/switch-workspace';
import { useCreateWorkspace } from '@/hooks/api/create-workspace';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { checkForm, fieldError, formError, type FieldErrors } from '@/components/forms/form-errors';

/** The user's workspaces with their role in each; choosing one switches every screen to it. */
export function WorkspaceSwitcher() {
  const router = useRouter();
  const { data: session } = useSession();
  const switcher = useSwitchWorkspace();
  const create = useCreateWorkspace();
  const [name, setName] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  if (!session) return null;

  const submit = () => {
    const checked = checkForm(createWorkspaceSchema, { name, timeZone: Intl.DateTimeFormat().resolvedOptions().timeZone });
    setErrors(checked.errors ?? {});
    if (checked.data) create.mutate(checked.data, { onSuccess: () => { setName(''); router.replace('/home'); } });
  };

  return (
    <View style={styles.box}>
      <View role="radiogroup" aria-label="Workspaces" style={styles.list}>
        {session.workspaces.map((w) => {
          const current = w.id === session.workspace?.id;
          return (
            <Pressable
              key={w.id}
              role="radio"
              aria-checked={current}
              disabled={current || switcher.isPending}
              onPress={() => switcher.mutate({ workspaceId: w.id })}
              style={[styles.item, current && styles.itemCurrent]}
              testID={`workspace-${w.id}`}
            >
              <Text style={[styles.name, current && styles.nameCurrent]}>{w.name}</Text>
              <Text style={styles.role}>{current ? `${w.role} · current` : w.role}</Text>
            </Pressable>
          );
        })}
      </View>
      {switcher.error ? <Notice>{switcher.error.message}</Notice> : null}
      <TextField label="New workspace" placeholder="Name of another team" value={name} onChangeText={setName} error={fieldError(errors, create.error, 'name')} onSubmitEditing={submit} testID="new-workspace-name" />
      {formError(create.error, ['name', 'timeZone']) ? <Notice>{formError(create.error, ['name', 'timeZone'])!}</Notice> : null}
      <Button kind="quiet" label="Make this workspace" onPress={submit} busy={create.isPending} testID="new-workspace-submit" />
    </View>
  );
}

const styles = StyleSheet.create({
  box: { gap: space.md },
  list: { gap: space.sm },
  item: { borderWidth: 1, borderColor: colors.line, borderRadius: radius.md, padding: space.md, backgroundColor: colors.white, minHeight: 48, gap: 2 },
  itemCurrent: { borderColor: colors.loom, borderLeftWidth: 4, backgroundColor: colors.loomSoft },
  name: { fontFamily: fonts.body, fontSize: 16, color: colors.ink },
  nameCurrent: { fontFamily: fonts.bodyBold },
  role: { fontFamily: fonts.body, fontSize: 13, color: colors.inkSoft },
});
