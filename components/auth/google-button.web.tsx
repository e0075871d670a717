import { Button } from '@/components/ui/button';
import { googleSignInUrl, useProviders } from '@/hooks/api/get-providers';

/** "Continue with Google": on the web a full page load, since the provider's pages are not ours. */
export function GoogleButton({ returnTo }: { returnTo?: string }) {
  const providers = useProviders();
  if (!providers.data?.google) return null;
  return <Button kind="quiet" label="Continue with Google" testID="google-sign-in" onPress={() => window.location.assign(googleSignInUrl(returnTo))} />;
}
