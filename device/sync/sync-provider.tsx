import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import { useCallback, useEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import { api } from '@/api/client';
import { useAuth } from '@/features/auth/auth-context';
import { loadSession } from '@/features/auth/session-store';
import { clinicConsentTextKey } from '@/device/consent/clinic-consent-text';
import { localKeys, useUnsentSummary } from '@/device/local-store/queries';
import { localSyncStorage } from '@/device/local-store/sync-storage';
import { SyncEngine, createHttpTransport, type SyncStatus, type SyncStorage } from '@/shared/sync';
import { deviceId } from './device-id';
import { DeviceSyncContext, type DeviceSyncState } from './sync-context';

const drainEveryMs = 30_000;
const refreshScreensMs = 250;

function isOnline(): boolean {
  const nav = (globalThis as { navigator?: { onLine?: boolean } }).navigator;
  return nav?.onLine ?? true;
}

function onWindow(type: 'online' | 'offline', callback: () => void): () => void {
  const target = globalThis as unknown as {
    addEventListener?: (type: string, cb: () => void) => void;
    removeEventListener?: (type: string, cb: () => void) => void;
  };
  if (typeof target.addEventListener !== 'function') return () => undefined;
  target.addEventListener(type, callback);
  return () => target.removeEventListener?.(type, callback);
}

/** Items waiting out a retry delay become due now: the network is back, or the operator asked. */
async function makeWaitingDue(storage: SyncStorage): Promise<void> {
  const now = Date.now();
  for (const item of await storage.listOutbox())
    if (item.state === 'waiting' && item.nextAttemptAt > now)
      await storage.updateOutboxItem(item.id, { nextAttemptAt: now });
}

/**
 * The local store as the engine's storage, telling the screens when the engine changed something (state,
 * per-clip progress, pulled rows), so the outbox redraws while it drains rather than on its next poll.
 */
function observedStorage(base: SyncStorage, queryClient: QueryClient): SyncStorage {
  let pending: ReturnType<typeof setTimeout> | null = null;
  const changed = () => {
    pending ??= setTimeout(() => {
      pending = null;
      void queryClient.invalidateQueries({ queryKey: localKeys.root });
    }, refreshScreensMs);
  };
  const after =
    <A extends unknown[]>(fn: (...args: A) => Promise<void>) =>
    async (...args: A) => {
      await fn(...args);
      changed();
    };
  return {
    listOutbox: () => base.listOutbox(),
    putOutboxItem: after((item) => base.putOutboxItem(item)),
    updateOutboxItem: after((id, patch) => base.updateOutboxItem(id, patch)),
    getCheckpoint: () => base.getCheckpoint(),
    setCheckpoint: (checkpoint) => base.setCheckpoint(checkpoint),
    applyPulledRows: after((rows) => base.applyPulledRows(rows)),
    recordAcknowledged: after((ack) => base.recordAcknowledged(ack)),
    readBlob: (sha256) => base.readBlob(sha256),
  };
}

/**
 * Runs the device sync engine for a signed-in operator: drains the outbox at start, every 30 s, when the
 * network returns (retry waits cut short), after each local change (a finished session queues its rows and
 * clips) and on "Sync now"; while the browser says it is offline the engine rests.
 * Rows go through the API client, whose interceptor adds the bearer token and refreshes it on a 401; clips go
 * by tus with the stored token. Offline, or with a lapsed token, items stay in the outbox and wait.
 */
export function DeviceSyncProvider({ children }: { children: ReactNode }) {
  const auth = useAuth();
  const queryClient = useQueryClient();
  const signedIn = auth.status === 'signed-in';
  const engineRef = useRef<SyncEngine | null>(null);
  const storageRef = useRef<SyncStorage | null>(null);
  const [status, setStatus] = useState<SyncStatus>({ running: false });
  const [online, setOnline] = useState(isOnline);
  const [ready, setReady] = useState(false);

  useEffect(() => {
    const offOnline = onWindow('online', () => setOnline(true));
    const offOffline = onWindow('offline', () => setOnline(false));
    return () => {
      offOnline();
      offOffline();
    };
  }, []);

  useEffect(() => {
    if (!signedIn) return;
    let cancelled = false;
    let engine: SyncEngine | null = null;
    void deviceId().then((id) => {
      if (cancelled) return;
      const storage = observedStorage(localSyncStorage, queryClient);
      const origin = (globalThis as { location?: { origin?: string } }).location?.origin ?? '';
      engine = new SyncEngine({
        storage,
        deviceId: id,
        intervalMs: drainEveryMs,
        transport: createHttpTransport({
          baseUrl: origin,
          axiosInstance: api,
          getAccessToken: async () => (await loadSession())?.accessToken ?? null,
        }),
        // The provider starts and stops the engine with the network itself (below).
        onOnline: () => () => undefined,
        onStatus: (next) => {
          if (!cancelled) setStatus(next);
        },
      });
      engineRef.current = engine;
      storageRef.current = storage;
      setReady(true);
      if (isOnline()) engine.start();
    });
    // Offline, runs would only fail, mark items "sending" for nothing and lengthen their retry waits.
    const offOffline = onWindow('offline', () => engine?.stop());
    const offOnline = onWindow('online', () => {
      const storage = storageRef.current;
      if (!storage) return;
      // The clinic may have published a new consent wording meanwhile; the list and client page both follow it.
      void queryClient.invalidateQueries({ queryKey: clinicConsentTextKey });
      void makeWaitingDue(storage)
        .catch(() => undefined)
        .then(() => {
          engine?.start();
          void engine?.sync();
        });
    });
    return () => {
      cancelled = true;
      offOffline();
      offOnline();
      engine?.stop();
      engineRef.current = null;
      storageRef.current = null;
      setReady(false);
    };
  }, [signedIn, queryClient]);

  // A successful local write (above all, finishing a session) has queued something: send it now.
  useEffect(() => {
    if (!ready) return;
    return queryClient.getMutationCache().subscribe((event) => {
      if (event.type === 'updated' && event.action.type === 'success' && isOnline())
        void engineRef.current?.sync();
    });
  }, [ready, queryClient]);

  const unsent = useUnsentSummary(ready).data;

  const syncNow = useCallback(async () => {
    const engine = engineRef.current;
    const storage = storageRef.current;
    if (!engine || !storage) return null;
    await makeWaitingDue(storage).catch(() => undefined);
    return engine.sync();
  }, []);

  const value = useMemo<DeviceSyncState>(
    () => ({
      ready,
      running: status.running,
      online,
      lastRunAt: status.lastRunAt,
      lastError: status.lastError,
      outdated: status.outdated,
      unsent,
      syncNow,
    }),
    [ready, status, online, unsent, syncNow],
  );
  return <DeviceSyncContext.Provider value={value}>{children}</DeviceSyncContext.Provider>;
}
