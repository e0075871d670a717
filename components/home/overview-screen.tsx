import { StyleSheet, View } from 'react-native';
import { space } from '@/constants/theme';
import { useSession } from '@/hooks/api/get-session';
import { Body, Heading } from '@/components/ui/typography';
import { Notice } from '@/components/ui/notice';
import { WORKING_TIME_CAUTION } from '@/shared/caution';
import { NoWorkspace } from '@/components/auth/no-workspace';
import { NextSteps } from './next-steps';

/** The first page after sign-in: where you are, as whom, what to do next (coordinators) and the caution every roster carries. */
export function OverviewScreen() {
  const { data: session } = useSession();
  if (!session) return null;
  const first = session.user.displayName.split(' ')[0];
  return (
    <View style={styles.page}>
      <Heading>Hello, {first}</Heading>
      <Body muted>
        {session.workspace ? `You are signed in to ${session.workspace.name} as ${session.role}.` : 'You are not a member of a workspace yet.'}
      </Body>
      {session.workspace ? null : <NoWorkspace />}
      {session.workspace && (session.role === 'coordinator' || session.role === 'admin') ? <NextSteps /> : null}
      <Notice kind="caution">{WORKING_TIME_CAUTION}</Notice>
    </View>
  );
}

const styles = StyleSheet.create({ page: { gap: space.lg } });
