import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { useLocalSearchParams, useRouter } from 'expo-router';
import { space } from '@/constants/theme';
import { resetPasswordSchema } from '@/shared/auth/schemas';
import { useResetPassword } from '@/hooks/api/reset-password';
import { ApiError } from '@/hooks/api/api-client';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { AuthPage } from './auth-page';
import { TextLink } from './text-link';
import { checkForm, fieldError, formError, type FieldErrors } from '@/components/forms/form-errors';

/** Opened from the e-mailed link: choose a new password, then straight in. */
export function ResetPasswordScreen() {
  const router = useRouter();
  const { token = '' } = useLocalSearchParams<{ token?: string }>();
  const reset = useResetPassword();
  const [password, setPassword] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const submit = () => {
    const checked = checkForm(resetPasswordSchema, { token, password });
    setErrors(checked.errors ?? {});
    if (checked.data) reset.mutate(checked.data, { onSuccess: () => router.replace('/home') });
  };
  const linkProblem = errors.token ?? (reset.error instanceof ApiError ? reset.error.fieldMessage('token') : undefined);
  const message = formError(reset.error, ['password', 'token']);
  return (
    <AuthPage title="Choose a new password" lead="At least 10 characters. Other devices signed in to your account will be signed out.">
      <View style={styles.form} role="form" aria-label="Reset password">
        {linkProblem ? (
          <>
            <Notice>{linkProblem}</Notice>
            <TextLink href="/forgot-password" label="Send me a new link" />
          </>
        ) : null}
        <TextField label="New password" value={password} onChangeText={setPassword} secureTextEntry autoComplete="new-password" error={fieldError(errors, reset.error, 'password')} onSubmitEditing={submit} testID="reset-password" />
        {message ? <Notice>{message}</Notice> : null}
        <Button label="Save and sign in" onPress={submit} busy={reset.isPending} testID="reset-submit" />
      </View>
    </AuthPage>
  );
}

const styles = StyleSheet.create({ form: { gap: space.lg } });
