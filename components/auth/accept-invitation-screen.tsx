import { useState } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { useLocalSearchParams, useRouter } from 'expo-router';
import { colors, space } from '@/constants/theme';
import { acceptInvitationSchema, newPasswordSchema, displayNameSchema, signInSchema } from '@/shared/auth/schemas';
import { useInvitationPreview } from '@/hooks/api/get-invitation-preview';
import { useAcceptInvitation } from '@/hooks/api/accept-invitation';
import { useSession } from '@/hooks/api/get-session';
import { useSignIn } from '@/hooks/api/sign-in';
import { useSignOut } from '@/hooks/api/sign-out';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body } from '@/components/ui/typography';
import { AuthPage } from './auth-page';
import { GoogleButton } from './google-button';
import { checkForm, fieldError, formError, type FieldErrors } from '@/components/forms/form-errors';

const roleWords = { admin: 'an admin', coordinator: 'a coordinator', staff: 'a staff member' } as const;

/**
 * Opened from the invitation e-mail. Signed in as the invited address: one button. Signed out
 * with an account: sign in (password or Google), then join. No account yet: name and password.
 */
export function AcceptInvitationScreen() {
  const router = useRouter();
  const { token = '' } = useLocalSearchParams<{ token?: string }>();
  const preview = useInvitationPreview(token);
  const session = useSession();
  const accept = useAcceptInvitation();
  const signIn = useSignIn();
  const signOut = useSignOut();
  const [values, setValues] = useState({ displayName: '', password: '' });
  const [errors, setErrors] = useState<FieldErrors>({});
  const set = (name: keyof typeof values) => (text: string) => setValues((v) => ({ ...v, [name]: text }));
  const done = () => router.replace('/home');

  if (!token) return <AuthPage title="Join a workspace"><Notice>This link is not complete; open it from the e-mail again.</Notice></AuthPage>;
  if (preview.isPending || session.isPending) {
    return (
      <AuthPage title="Join a workspace">
        <ActivityIndicator color={colors.loom} accessibilityLabel="Loading" />
      </AuthPage>
    );
  }
  if (preview.error) return <AuthPage title="Join a workspace"><Notice>{preview.error.message}</Notice></AuthPage>;
  const invite = preview.data;
  const lead = `${invite.invitedBy ?? 'An admin'} invited ${invite.email} to ${invite.workspace.name} as ${roleWords[invite.role]}.`;
  const acceptError = formError(accept.error, ['displayName', 'password']);
  const signedInAs = session.data?.user.email;

  let body;
  if (signedInAs && signedInAs === invite.email) {
    body = <Button label={`Join ${invite.workspace.name}`} onPress={() => accept.mutate({ token }, { onSuccess: done })} busy={accept.isPending} testID="accept-invitation" />;
  } else if (signedInAs) {
    body = (
      <>
        <Notice kind="caution">{`You are signed in as ${signedInAs}. Sign out to accept this invitation as ${invite.email}.`}</Notice>
        <Button kind="quiet" label="Sign out" onPress={() => signOut.mutate()} busy={signOut.isPending} />
      </>
    );
  } else if (invite.accountExists) {
    const submit = () => {
      const checked = checkForm(signInSchema, { email: invite.email, password: values.password });
      setErrors(checked.errors ?? {});
      if (checked.data) signIn.mutate(checked.data, { onSuccess: () => accept.mutate({ token }, { onSuccess: done }) });
    };
    body = (
      <>
        <Body>{`Sign in as ${invite.email} to join.`}</Body>
        <TextField label="Password" value={values.password} onChangeText={set('password')} secureTextEntry autoComplete="current-password" error={fieldError(errors, signIn.error, 'password')} onSubmitEditing={submit} testID="invitation-password" />
        <Button label="Sign in and join" onPress={submit} busy={signIn.isPending || accept.isPending} testID="accept-invitation" />
        <GoogleButton returnTo={`/invitation?token=${token}`} />
      </>
    );
  } else {
    const submit = () => {
      const checked = checkForm(acceptInvitationSchema.required({ displayName: true, password: true }).extend({ displayName: displayNameSchema, password: newPasswordSchema }), { token, ...values });
      setErrors(checked.errors ?? {});
      if (checked.data) accept.mutate(checked.data, { onSuccess: done });
    };
    body = (
      <>
        <Body>{`Make your account for ${invite.email}.`}</Body>
        <TextField label="Your name" value={values.displayName} onChangeText={set('displayName')} autoComplete="name" error={fieldError(errors, accept.error, 'displayName')} testID="invitation-name" />
        <TextField label="Choose a password" value={values.password} onChangeText={set('password')} secureTextEntry autoComplete="new-password" error={fieldError(errors, accept.error, 'password')} onSubmitEditing={submit} testID="invitation-password" />
        <Button label={`Join ${invite.workspace.name}`} onPress={submit} busy={accept.isPending} testID="accept-invitation" />
        <GoogleButton returnTo={`/invitation?token=${token}`} />
      </>
    );
  }

  return (
    <AuthPage title={`Join ${invite.workspace.name}`} lead={lead}>
      <View style={styles.box} role="form" aria-label="Accept invitation">
        {body}
        {acceptError ? <Notice>{acceptError}</Notice> : null}
      </View>
    </AuthPage>
  );
}

const styles = StyleSheet.create({ box: { gap: space.lg } });
