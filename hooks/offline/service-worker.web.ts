import { Workbox } from 'workbox-window';

/**
 * Registers the service worker the web build writes (/sw.js). workbox-window waits for the page's
 * load event first, so installing it never competes with the first screen for the network.
 * The development server has no worker: only exported builds register one.
 */
export function registerServiceWorker(): void {
  if (process.env.NODE_ENV !== 'production' || typeof navigator === 'undefined' || !('serviceWorker' in navigator)) return;
  void new Workbox('/sw.js').register();
}
