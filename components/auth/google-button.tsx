import * as Linking from 'expo-linking';
import { Button } from '@/components/ui/button';
import { googleSignInUrl, useProviders } from '@/hooks/api/get-providers';

/** "Continue with Google", shown only when the server has Google sign-in set up. */
export function GoogleButton({ returnTo }: { returnTo?: string }) {
  const providers = useProviders();
  if (!providers.data?.google) return null;
  return <Button kind="quiet" label="Continue with Google" testID="google-sign-in" onPress={() => void Linking.openURL(googleSignInUrl(returnTo))} />;
}
