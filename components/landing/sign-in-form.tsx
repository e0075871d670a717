import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { useRouter } from 'expo-router';
import { space } from '@/constants/theme';
import { signInSchema } from '@/shared/auth/schemas';
import { useSignIn } from '@/hooks/api/sign-in';
import { ApiError } from '@/hooks/api/api-client';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/text-field';
import { Notice } from '@/components/ui/notice';

type Fields = { email?: string; password?: string };

/** E-mail and password; checked with the same schema the server uses before anything is sent. */
export function SignInForm() {
  const router = useRouter();
  const signIn = useSignIn();
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [fieldErrors, setFieldErrors] = useState<Fields>({});

  const submit = () => {
    const parsed = signInSchema.safeParse({ email, password });
    if (!parsed.success) {
      const next: Fields = {};
      for (const issue of parsed.error.issues) next[issue.path[0] as keyof Fields] ??= issue.message;
      setFieldErrors(next);
      return;
    }
    setFieldErrors({});
    signIn.mutate(parsed.data, { onSuccess: () => router.replace('/home') });
  };

  const serverError = signIn.error instanceof ApiError ? signIn.error : null;
  const message =
    serverError?.status === 404 ? 'Sign-in is not available on this server yet.' : serverError?.message ?? (signIn.error ? 'Sign-in failed; please try again.' : null);

  return (
    <View style={styles.form} role="form" aria-label="Sign in">
      <TextField
        label="E-mail"
        value={email}
        onChangeText={setEmail}
        autoCapitalize="none"
        autoComplete="email"
        keyboardType="email-address"
        inputMode="email"
        error={fieldErrors.email ?? serverError?.fieldMessage('email')}
        onSubmitEditing={submit}
      />
      <TextField
        label="Password"
        value={password}
        onChangeText={setPassword}
        secureTextEntry
        autoComplete="current-password"
        error={fieldErrors.password ?? serverError?.fieldMessage('password')}
        onSubmitEditing={submit}
      />
      {message ? <Notice>{message}</Notice> : null}
      <Button label="Sign in" onPress={submit} busy={signIn.isPending} testID="sign-in-submit" />
    </View>
  );
}

const styles = StyleSheet.create({ form: { gap: space.lg } });
