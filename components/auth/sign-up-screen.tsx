import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { space } from '@/constants/theme';
import { signUpSchema } from '@/shared/auth/schemas';
import { useSignUp } from '@/hooks/api/sign-up';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body } from '@/components/ui/typography';
import { AuthPage } from './auth-page';
import { GoogleButton } from './google-button';
import { checkForm, fieldError, formError, type FieldErrors } from '@/components/forms/form-errors';

const FIELDS = ['displayName', 'email', 'password', 'workspaceName'];

/**
 * A new account and a new workspace with it, whose admin the new person is. Nothing is made until
 * the e-mailed link is opened, and the screen says "check your e-mail" whether or not the address
 * already has an account: the owner of a taken address hears about it by mail instead.
 */
export function SignUpScreen() {
  const signUp = useSignUp();
  const [values, setValues] = useState({ displayName: '', email: '', password: '', workspaceName: '' });
  const [errors, setErrors] = useState<FieldErrors>({});
  const set = (name: keyof typeof values) => (text: string) => setValues((v) => ({ ...v, [name]: text }));

  const submit = () => {
    const timeZone = Intl.DateTimeFormat().resolvedOptions().timeZone;
    const checked = checkForm(signUpSchema, { ...values, timeZone });
    setErrors(checked.errors ?? {});
    if (checked.data) signUp.mutate(checked.data);
  };
  const err = (name: string) => fieldError(errors, signUp.error, name);
  const message = formError(signUp.error, FIELDS);

  if (signUp.isSuccess) {
    return (
      <AuthPage title="Check your e-mail">
        <View style={styles.form} testID="sign-up-check-email">
          <Notice kind="info">{signUp.data.message}</Notice>
          <Body>{`Open the link in that message to make ${values.workspaceName.trim()} and sign in. If you open it on another device, it asks for the password you just chose.`}</Body>
          <Body muted>Nothing after a few minutes? Look in your spam folder, or check the address and send it again.</Body>
          <Button kind="quiet" label="Change the address" onPress={() => signUp.reset()} testID="sign-up-again" />
        </View>
      </AuthPage>
    );
  }

  return (
    <AuthPage title="Make a workspace" lead="Your team's rosters live in a workspace. You will be its admin and can invite coordinators and staff.">
      <View style={styles.form} role="form" aria-label="Sign up">
        <TextField label="Your name" value={values.displayName} onChangeText={set('displayName')} autoComplete="name" error={err('displayName')} testID="sign-up-name" />
        <TextField label="E-mail" value={values.email} onChangeText={set('email')} autoCapitalize="none" autoComplete="email" inputMode="email" error={err('email')} testID="sign-up-email" />
        <TextField label="Password" value={values.password} onChangeText={set('password')} secureTextEntry autoComplete="new-password" error={err('password')} testID="sign-up-password" />
        <TextField label="Workspace name" placeholder="e.g. Harbour Clinic" value={values.workspaceName} onChangeText={set('workspaceName')} error={err('workspaceName')} onSubmitEditing={submit} testID="sign-up-workspace" />
        {message ? <Notice>{message}</Notice> : null}
        <Button label="Make my workspace" onPress={submit} busy={signUp.isPending} testID="sign-up-submit" />
        <GoogleButton />
      </View>
    </AuthPage>
  );
}

const styles = StyleSheet.create({ form: { gap: space.lg } });
