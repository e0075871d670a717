import { Redirect, Slot } from 'expo-router';
import { ActivityIndicator, View } from 'react-native';
import { colors, space } from '@/constants/theme';
import { useSession } from '@/hooks/api/get-session';
import { NavShell } from '@/components/nav/nav-shell';
import { Notice } from '@/components/ui/notice';

/** Everything inside a workspace needs a session; signed-out visitors go to the front page. */
export default function WorkspaceLayout() {
  const session = useSession();
  if (session.isPending) {
    return (
      <View style={{ flex: 1, alignItems: 'center', justifyContent: 'center', backgroundColor: colors.paper }}>
        <ActivityIndicator color={colors.loom} accessibilityLabel="Loading" />
      </View>
    );
  }
  if (session.isError) {
    return (
      <View style={{ flex: 1, padding: space.xl, backgroundColor: colors.paper }}>
        <Notice>{`Rotaloom could not load your session: ${session.error.message}`}</Notice>
      </View>
    );
  }
  if (!session.data) return <Redirect href="/" />;
  return (
    <NavShell session={session.data}>
      <Slot />
    </NavShell>
  );
}
