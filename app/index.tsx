import { Redirect } from 'expo-router';
import { LandingScreen } from '@/components/landing/landing-screen';
import { useSession } from '@/hooks/api/get-session';

export default function Index() {
  const session = useSession();
  if (session.data) return <Redirect href="/home" />;
  return <LandingScreen />;
}
