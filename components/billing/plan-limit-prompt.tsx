import { StyleSheet, View } from 'react-native';
import { useRouter } from 'expo-router';
import { colors, radius, space } from '@/constants/theme';
import { ApiError } from '@/hooks/api/api-client';
import { useSession } from '@/hooks/api/get-session';
import { Button } from '@/components/ui/button';
import { Body } from '@/components/ui/typography';
import { PAYMENT_OVERDUE_CODE, PLAN_LIMIT_CODE } from '@/shared/billing/plans';

/** True for the API's plan-limit and overdue-payment refusals (402), which deserve an upgrade prompt rather than a plain error. */
export const isBillingRefusal = (error: unknown): error is ApiError =>
  error instanceof ApiError && (error.code === PLAN_LIMIT_CODE || error.code === PAYMENT_OVERDUE_CODE);

/**
 * Shown where a create or run was refused by the plan: the server's words, and for admins a way
 * straight to Plan & billing. Renders nothing for other errors, so screens can place it beside
 * their usual error notice: `<PlanLimitPrompt error={mutation.error} />`.
 */
export function PlanLimitPrompt({ error }: { error: unknown }) {
  const { data: session } = useSession();
  const router = useRouter();
  if (!isBillingRefusal(error)) return null;
  return (
    <View style={styles.box} role="alert" testID="plan-limit-prompt">
      <Body bold>{error.code === PLAN_LIMIT_CODE ? 'Your plan is full' : 'Payment overdue'}</Body>
      <Body>{error.message}</Body>
      {session?.role === 'admin' ? <Button label={error.code === PLAN_LIMIT_CODE ? 'See plans' : 'Settle the payment'} onPress={() => router.push('/billing')} testID="plan-limit-upgrade" /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  box: { backgroundColor: colors.threadSoft, borderLeftWidth: 4, borderLeftColor: colors.thread, borderRadius: radius.sm, padding: space.md, gap: space.sm },
});
