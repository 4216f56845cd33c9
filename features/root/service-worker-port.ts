// The part of the Service Worker API the update banner uses (features/root/app-update.ts), narrowed so a test
// can stand in for the browser: service-worker.web.ts is the browser's, service-worker.ts the native targets'.

type Listener = () => void;

/** A service worker: the one installed and waiting, or one still installing. */
export interface AppWorker {
  readonly state: ServiceWorkerState;
  postMessage(message: unknown): void;
  addEventListener(type: 'statechange', listener: Listener): void;
}

export interface AppRegistration {
  readonly waiting: AppWorker | null;
  readonly installing: AppWorker | null;
  addEventListener(type: 'updatefound', listener: Listener): void;
  update(): Promise<unknown>;
}

export interface ServiceWorkerPort {
  /** Registers the app's service worker; resolves with null where there is none. */
  register(): Promise<AppRegistration | null>;
  /** Whether a service worker already serves this page (not on the very first visit). */
  hasController(): boolean;
  onControllerChange(listener: Listener): () => void;
  reloadPage(): void;
}
