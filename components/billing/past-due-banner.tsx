import { StyleSheet, View } from 'react-native';
import { usePathname, useRouter } from 'expo-router';
import { colors, radius, space } from '@/constants/theme';
import { useBilling } from '@/hooks/api/get-billing';
import { Button } from '@/components/ui/button';
import { Body } from '@/components/ui/typography';

/**
 * For admins only (the caller checks the role): when the last payment failed, a band saying what
 * still works and where to fix it. Coordinators and staff are told by the run refusal instead.
 */
export function PastDueBanner() {
  const billing = useBilling();
  const router = useRouter();
  const pathname = usePathname();
  if (!billing.data?.pastDue) return null;
  return (
    <View style={styles.band} role="alert" testID="past-due-banner">
      <Body bold>Payment overdue</Body>
      <Body>{`${billing.data.pastDue.message} Everything stays readable, but new runs are paused until the payment is settled.`}</Body>
      {pathname.startsWith('/billing') ? null : <Button kind="quiet" label="Go to Plan & billing" onPress={() => router.push('/billing')} />}
    </View>
  );
}

const styles = StyleSheet.create({
  band: { backgroundColor: colors.dangerSoft, borderLeftWidth: 4, borderLeftColor: colors.danger, borderRadius: radius.sm, padding: space.md, gap: space.sm, marginBottom: space.lg },
});
