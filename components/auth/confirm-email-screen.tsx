import { useEffect } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { useLocalSearchParams } from 'expo-router';
import { colors, space } from '@/constants/theme';
import { useConfirmEmail } from '@/hooks/api/confirm-email';
import { Notice } from '@/components/ui/notice';
import { AuthPage } from './auth-page';

/** Opened from the e-mailed link; confirms at once (the link itself is the proof). */
export function ConfirmEmailScreen() {
  const { token = '' } = useLocalSearchParams<{ token?: string }>();
  const confirm = useConfirmEmail();
  const { mutate } = confirm;
  useEffect(() => {
    if (token) mutate({ token });
  }, [token, mutate]);
  return (
    <AuthPage title="Confirm your e-mail address">
      <View style={styles.box}>
        {!token ? <Notice>This link is not complete; open it from the e-mail again.</Notice> : null}
        {confirm.isPending ? <ActivityIndicator color={colors.loom} accessibilityLabel="Confirming" /> : null}
        {confirm.isSuccess ? <Notice kind="info">{`Thank you: ${confirm.data.email} is confirmed.`}</Notice> : null}
        {confirm.error ? <Notice>{confirm.error.message}</Notice> : null}
      </View>
    </AuthPage>
  );
}

const styles = StyleSheet.create({ box: { gap: space.lg } });
