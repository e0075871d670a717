import { useSyncExternalStore } from 'react';
import { Dimensions } from 'react-native';
import { WIDE_BREAKPOINT } from '@/constants/theme';

const subscribe = (onChange: () => void) => {
  const subscription = Dimensions.addEventListener('change', onChange);
  return () => subscription.remove();
};

/**
 * The build renders web pages without a window, as a phone: hydration starts narrow (the markup
 * the server wrote) and turns wide just after, instead of keeping narrow styles React will not patch.
 */
export const useIsWide = () =>
  useSyncExternalStore(subscribe, () => Dimensions.get('window').width >= WIDE_BREAKPOINT, () => false);
