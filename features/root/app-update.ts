import { useCallback, useEffect, useRef, useState, useSyncExternalStore } from 'react';
import type { AppWorker, ServiceWorkerPort } from './service-worker-port';

// A new version of the web app arrives as a new service worker. It waits (scripts/build-pwa.mjs sets no
// skipWaiting) until the person chooses to reload, because taking over a running page would swap the files under
// it, and a reload in the middle of a take or an unsealed session would throw away what is on screen.

/** Screens that must not be reloaded while they are open hold updates (the capture screen of an unsealed session). */
let holds = 0;
const holdListeners = new Set<() => void>();
const notifyHolds = () => holdListeners.forEach((listener) => listener());

export function useHoldUpdates(active: boolean): void {
  useEffect(() => {
    if (!active) return;
    holds += 1;
    notifyHolds();
    return () => {
      holds -= 1;
      notifyHolds();
    };
  }, [active]);
}

function subscribeToHolds(listener: () => void): () => void {
  holdListeners.add(listener);
  return () => holdListeners.delete(listener);
}

const isHeld = () => holds > 0;

/** The browser looks for a new service worker on navigations; an app left open all day asks as well. */
export const updateCheckIntervalMs = 30 * 60 * 1000;

export type AppUpdate = {
  /** A new version is installed and waiting for a reload. */
  ready: boolean;
  /** An open screen holds updates: the reload is offered once it lets go. */
  held: boolean;
  reload: () => void;
};

export function useAppUpdate(port: ServiceWorkerPort): AppUpdate {
  const [waiting, setWaiting] = useState<AppWorker | null>(null);
  const held = useSyncExternalStore(subscribeToHolds, isHeld, isHeld);
  const reloadAsked = useRef(false);

  useEffect(() => {
    let stopped = false;
    let timer: ReturnType<typeof setInterval> | undefined;
    // The first service worker of a visit is no new version: only one that arrives while another serves the page.
    const offer = (worker: AppWorker) => {
      if (!stopped && port.hasController()) setWaiting(worker);
    };
    port
      .register()
      .then((registration) => {
        if (!registration || stopped) return;
        const whenInstalled = (worker: AppWorker | null) =>
          worker?.addEventListener('statechange', () => {
            if (worker.state === 'installed') offer(worker);
          });
        if (registration.waiting) offer(registration.waiting);
        // One may already be installing: the browser checks for a new version on every page load.
        whenInstalled(registration.installing);
        registration.addEventListener('updatefound', () => whenInstalled(registration.installing));
        timer = setInterval(() => {
          // Offline, or the server is away: the next check will tell.
          registration.update().catch(() => undefined);
        }, updateCheckIntervalMs);
      })
      // Without a service worker the app works online only; nothing for the person to do about it.
      .catch(() => undefined);
    // The page reloads only after the person asked for it, once the new version serves it.
    const stopListening = port.onControllerChange(() => {
      if (reloadAsked.current) port.reloadPage();
    });
    return () => {
      stopped = true;
      if (timer) clearInterval(timer);
      stopListening();
    };
  }, [port]);

  const reload = useCallback(() => {
    if (!waiting || held) return;
    reloadAsked.current = true;
    // Another tab may have let the new version take over already; then there is nothing to wait for.
    if (waiting.state === 'installed') waiting.postMessage({ type: 'SKIP_WAITING' });
    else port.reloadPage();
  }, [waiting, held, port]);

  return { ready: waiting !== null, held, reload };
}
