import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { space } from '@/constants/theme';
import { forgotPasswordSchema } from '@/shared/auth/schemas';
import { useForgotPassword } from '@/hooks/api/forgot-password';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { AuthPage } from './auth-page';
import { checkForm, fieldError, formError, type FieldErrors } from '@/components/forms/form-errors';

export function ForgotPasswordScreen() {
  const forgot = useForgotPassword();
  const [email, setEmail] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const submit = () => {
    const checked = checkForm(forgotPasswordSchema, { email });
    setErrors(checked.errors ?? {});
    if (checked.data) forgot.mutate(checked.data);
  };
  const message = formError(forgot.error, ['email']);
  return (
    <AuthPage title="Forgot your password?" lead="We will e-mail you a link to choose a new one. It works once, for an hour.">
      <View style={styles.form} role="form" aria-label="Forgot password">
        {forgot.isSuccess ? (
          <Notice kind="info">{forgot.data.message}</Notice>
        ) : (
          <>
            <TextField label="E-mail" value={email} onChangeText={setEmail} autoCapitalize="none" autoComplete="email" inputMode="email" error={fieldError(errors, forgot.error, 'email')} onSubmitEditing={submit} testID="forgot-email" />
            {message ? <Notice>{message}</Notice> : null}
            <Button label="Send the link" onPress={submit} busy={forgot.isPending} testID="forgot-submit" />
          </>
        )}
      </View>
    </AuthPage>
  );
}

const styles = StyleSheet.create({ form: { gap: space.lg } });
