/** Native apps keep their code on the device; only the web build has a service worker. */
export function registerServiceWorker(): void {}
