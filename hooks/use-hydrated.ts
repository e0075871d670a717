import { useSyncExternalStore } from 'react';

const never = () => () => {};

/**
 * False while React hydrates a page rendered at build time (web static output) and during that
 * render itself; true in every other render. Lets markup that depends on the browser (window size,
 * the address's query) appear just after hydration, so it matches what the server wrote.
 */
export const useHydrated = (): boolean => useSyncExternalStore(never, () => true, () => false);
