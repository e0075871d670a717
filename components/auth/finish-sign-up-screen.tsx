import { useEffect, useRef, useState } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { useLocalSearchParams, useRouter } from 'expo-router';
import { colors, space } from '@/constants/theme';
import { useHydrated } from '@/hooks/use-hydrated';
import { finishSignUpSchema } from '@/shared/auth/schemas';
import { useSignUpPreview } from '@/hooks/api/get-sign-up-preview';
import { useFinishSignUp } from '@/hooks/api/finish-sign-up';
import { ApiError } from '@/hooks/api/api-client';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body } from '@/components/ui/typography';
import { AuthPage } from './auth-page';
import { TextLink } from './text-link';
import { checkForm, fieldError, formError, type FieldErrors } from '@/components/forms/form-errors';

const TITLE = 'Finish signing up';


/** What to offer after a link that cannot be used: a new one, or signing in when the account exists. */
function LinkProblem({ message, status }: { message: string; status?: number }) {
  const accountExists = status === 409 || (status === 410 && /already used/.test(message));
  return (
    <AuthPage title={TITLE}>
      <View style={styles.box} testID="finish-sign-up-problem">
        <Notice>{message}</Notice>
        {accountExists ? null : <TextLink href="/sign-up" label="Sign up again" testID="finish-sign-up-again" />}
      </View>
    </AuthPage>
  );
}

function Finishing({ what }: { what: string }) {
  return (
    <AuthPage title={TITLE} back={false}>
      <View style={styles.busy} testID="finish-sign-up-busy">
        <ActivityIndicator color={colors.loom} accessibilityLabel="Finishing" />
        <Body muted>{what}</Body>
      </View>
    </AuthPage>
  );
}

/**
 * Opened from the e-mailed link. In the browser that signed up it finishes at once and enters the
 * app; elsewhere it asks for the password chosen at sign-up first (the server decides which).
 * Nothing is made by merely loading the page, so mail scanners that open links change nothing.
 */
export function FinishSignUpScreen() {
  const router = useRouter();
  // A page written at build time has no link query while it hydrates: the token is known only after.
  const hydrated = useHydrated();
  const params = useLocalSearchParams<{ token?: string }>();
  const token = hydrated ? (params.token ?? '') : '';
  const preview = useSignUpPreview(token);
  const finish = useFinishSignUp();
  const [password, setPassword] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const started = useRef(false);
  const enter = () => router.replace('/home');

  const { mutate } = finish;
  const direct = preview.data && !preview.data.passwordNeeded;
  useEffect(() => {
    if (!direct || started.current) return;
    started.current = true;
    mutate({ token }, { onSuccess: () => router.replace('/home') });
  }, [direct, mutate, token, router]);

  if (!hydrated) return <Finishing what="Opening your link…" />;
  if (!token) return <LinkProblem message="This link is not complete; open it from the e-mail again." />;
  if (preview.error) return <LinkProblem message={preview.error.message} status={preview.error instanceof ApiError ? preview.error.status : undefined} />;
  const linkError = finish.error instanceof ApiError && finish.error.fieldMessage('token');
  if (linkError) return <LinkProblem message={linkError} status={finish.error instanceof ApiError ? finish.error.status : undefined} />;
  if (preview.isPending || (direct && !finish.error)) return <Finishing what={preview.data ? `Making ${preview.data.workspaceName}…` : 'Opening your link…'} />;

  const { email, displayName, workspaceName } = preview.data;
  const submit = () => {
    const checked = checkForm(finishSignUpSchema.required({ password: true }), { token, password });
    setErrors(checked.errors ?? {});
    if (checked.data) finish.mutate(checked.data, { onSuccess: enter });
  };
  const message = formError(finish.error, ['password', 'token']);
  return (
    <AuthPage title={TITLE} lead={`${displayName}, this makes the workspace ${workspaceName} for ${email}, with you as its admin.`}>
      <View style={styles.box} role="form" aria-label="Finish signing up">
        <Body>This link was opened in another browser than the one you signed up in: enter the password you chose to finish.</Body>
        {/* For password managers: the account the password belongs to. */}
        <TextField label="E-mail" value={email} onChangeText={() => undefined} editable={false} autoComplete="username" testID="finish-sign-up-email" />
        <TextField label="Password" value={password} onChangeText={setPassword} secureTextEntry autoComplete="current-password" error={fieldError(errors, finish.error, 'password')} onSubmitEditing={submit} testID="finish-sign-up-password" />
        {message ? <Notice>{message}</Notice> : null}
        <Button label="Finish and open Rotaloom" onPress={submit} busy={finish.isPending} testID="finish-sign-up-submit" />
      </View>
    </AuthPage>
  );
}

const styles = StyleSheet.create({
  box: { gap: space.lg },
  busy: { gap: space.md, alignItems: 'center', paddingVertical: space.lg },
});
