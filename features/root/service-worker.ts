import type { ServiceWorkerPort } from './service-worker-port';

// iOS and Android have no service worker: the app there is updated as a whole, by the store.
export const serviceWorkerPort: ServiceWorkerPort = {
  register: async () => null,
  hasController: () => false,
  onControllerChange: () => () => undefined,
  reloadPage: () => undefined,
};
