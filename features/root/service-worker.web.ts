import type { AppRegistration, ServiceWorkerPort } from './service-worker-port';

// The service worker (scripts/build-pwa.mjs) precaches the whole export, several times what the first screen
// needs. Registering it only once the page has loaded and the browser is idle keeps those downloads from
// competing with the first screen on a slow link.
function afterFirstScreen(): Promise<void> {
  return new Promise((resolve) => {
    const whenIdle = () =>
      'requestIdleCallback' in window
        ? window.requestIdleCallback(() => resolve(), { timeout: 3000 })
        : setTimeout(resolve, 1000);
    if (document.readyState === 'complete') whenIdle();
    else window.addEventListener('load', whenIdle, { once: true });
  });
}

export const serviceWorkerPort: ServiceWorkerPort = {
  async register(): Promise<AppRegistration | null> {
    if (!('serviceWorker' in navigator)) return null;
    await afterFirstScreen();
    return navigator.serviceWorker.register('/sw.js');
  },
  hasController: () => 'serviceWorker' in navigator && navigator.serviceWorker.controller !== null,
  onControllerChange(listener) {
    if (!('serviceWorker' in navigator)) return () => undefined;
    navigator.serviceWorker.addEventListener('controllerchange', listener);
    return () => navigator.serviceWorker.removeEventListener('controllerchange', listener);
  },
  reloadPage: () => window.location.reload(),
};
