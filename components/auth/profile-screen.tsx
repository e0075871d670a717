import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { space } from '@/constants/theme';
import { changeEmailSchema, changePasswordSchema, renameWorkspaceSchema, updateProfileSchema } from '@/shared/auth/schemas';
import { useSession, type Session } from '@/hooks/api/get-session';
import { useUpdateProfile } from '@/hooks/api/update-profile';
import { useChangeEmail } from '@/hooks/api/change-email';
import { useChangePassword } from '@/hooks/api/change-password';
import { useRenameWorkspace } from '@/hooks/api/rename-workspace';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body, Heading } from '@/components/ui/typography';
import { Section } from './section';
import { WorkspaceSwitcher } from './workspace-switcher';
import { checkForm, fieldError, formError, type FieldErrors } from '@/components/forms/form-errors';

/** The signed-in person's own account: name, e-mail, password, and their workspaces. */
export function ProfileScreen() {
  const { data: session } = useSession();
  if (!session) return null;
  return (
    <View style={styles.page}>
      <Heading>Your account</Heading>
      <Section title="Workspaces" lead="Switch to another team you belong to, or start a new one." testID="workspaces-section">
        <WorkspaceSwitcher />
      </Section>
      {session.role === 'admin' && session.workspace ? <RenameWorkspace session={session} /> : null}
      <NameForm session={session} />
      <EmailForm session={session} />
      <PasswordForm session={session} />
    </View>
  );
}

function NameForm({ session }: { session: Session }) {
  const update = useUpdateProfile();
  const [displayName, setDisplayName] = useState(session.user.displayName);
  const [errors, setErrors] = useState<FieldErrors>({});
  const submit = () => {
    const checked = checkForm(updateProfileSchema, { displayName });
    setErrors(checked.errors ?? {});
    if (checked.data) update.mutate(checked.data);
  };
  return (
    <Section title="Name" lead="How coordinators and colleagues see you.">
      <TextField label="Your name" value={displayName} onChangeText={setDisplayName} autoComplete="name" error={fieldError(errors, update.error, 'displayName')} onSubmitEditing={submit} testID="profile-name" />
      {update.isSuccess ? <Notice kind="info">Saved.</Notice> : null}
      <Button kind="quiet" label="Save name" onPress={submit} busy={update.isPending} testID="profile-name-submit" />
    </Section>
  );
}

function EmailForm({ session }: { session: Session }) {
  const change = useChangeEmail();
  const [email, setEmail] = useState('');
  const [currentPassword, setCurrentPassword] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const submit = () => {
    const checked = checkForm(changeEmailSchema, { email, currentPassword: session.user.hasPassword ? currentPassword : undefined });
    setErrors(checked.errors ?? {});
    if (checked.data) change.mutate(checked.data);
  };
  const status = session.user.emailVerified ? 'confirmed' : 'not confirmed yet (see the link we e-mailed you)';
  return (
    <Section title="E-mail" lead={`You sign in as ${session.user.email}, ${status}.`}>
      <TextField label="New e-mail address" value={email} onChangeText={setEmail} autoCapitalize="none" autoComplete="email" inputMode="email" error={fieldError(errors, change.error, 'email')} testID="profile-email" />
      {session.user.hasPassword ? (
        <TextField label="Current password" value={currentPassword} onChangeText={setCurrentPassword} secureTextEntry autoComplete="current-password" error={fieldError(errors, change.error, 'currentPassword')} onSubmitEditing={submit} />
      ) : null}
      {change.isSuccess ? <Notice kind="info">{change.data.message}</Notice> : null}
      {formError(change.error, ['email', 'currentPassword']) ? <Notice>{formError(change.error, ['email', 'currentPassword'])!}</Notice> : null}
      <Button kind="quiet" label="Send confirmation link" onPress={submit} busy={change.isPending} />
    </Section>
  );
}

function PasswordForm({ session }: { session: Session }) {
  const change = useChangePassword();
  const [currentPassword, setCurrentPassword] = useState('');
  const [newPassword, setNewPassword] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const submit = () => {
    const checked = checkForm(changePasswordSchema, { currentPassword: session.user.hasPassword ? currentPassword : undefined, newPassword });
    setErrors(checked.errors ?? {});
    if (checked.data) change.mutate(checked.data, { onSuccess: () => { setCurrentPassword(''); setNewPassword(''); } });
  };
  return (
    <Section
      title="Password"
      lead={session.user.hasPassword ? 'Changing it signs out your other devices.' : 'You sign in with Google. You can also set a password.'}
    >
      {session.user.hasPassword ? (
        <TextField label="Current password" value={currentPassword} onChangeText={setCurrentPassword} secureTextEntry autoComplete="current-password" error={fieldError(errors, change.error, 'currentPassword')} />
      ) : null}
      <TextField label="New password" value={newPassword} onChangeText={setNewPassword} secureTextEntry autoComplete="new-password" error={fieldError(errors, change.error, 'newPassword')} onSubmitEditing={submit} />
      {change.isSuccess ? <Notice kind="info">Your password is changed.</Notice> : null}
      {session.user.hasGoogle ? <Body muted>Google sign-in is linked to this account.</Body> : null}
      <Button kind="quiet" label="Change password" onPress={submit} busy={change.isPending} />
    </Section>
  );
}

function RenameWorkspace({ session }: { session: Session }) {
  const rename = useRenameWorkspace();
  const [name, setName] = useState(session.workspace?.name ?? '');
  const [errors, setErrors] = useState<FieldErrors>({});
  const submit = () => {
    const checked = checkForm(renameWorkspaceSchema, { name });
    setErrors(checked.errors ?? {});
    if (checked.data) rename.mutate(checked.data);
  };
  return (
    <Section title="Workspace name" lead="Shown to everyone in the workspace and in the e-mails Rotaloom sends.">
      <TextField label="Name" value={name} onChangeText={setName} error={fieldError(errors, rename.error, 'name')} onSubmitEditing={submit} />
      <Button kind="quiet" label="Rename" onPress={submit} busy={rename.isPending} />
    </Section>
  );
}

const styles = StyleSheet.create({ page: { gap: space.lg, maxWidth: 720 } });
