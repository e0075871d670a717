import { Workbox } from 'workbox-window';

let registered = false;

/**
 * Registers the service worker the web build writes (/sw.js), once per page, when someone is
 * signed in (hooks/offline/offline-copies): what it is for, the app shell of a person's screens and
 * their own shifts offline, needs a person, and a signed-out visitor's landing page is spared its
 * 8 KB. workbox-window waits for the page's load event first, so installing it never competes
 * with the first screen for the network. The development server has no worker: only exported
 * builds register one.
 */
export function registerServiceWorker(): void {
  if (registered || process.env.NODE_ENV !== 'production' || typeof navigator === 'undefined' || !('serviceWorker' in navigator)) return;
  registered = true;
  void new Workbox('/sw.js').register();
}
