import { createContext, useContext } from 'react';
import type { SyncReport } from '@/shared/sync';

/** What would wait on the phone after a sign-out: items not yet acknowledged by the clinic. */
export type UnsentSummary = { items: number; recordings: number; sessions: number; clients: number };

export interface DeviceSyncState {
  /** False until the engine is built (device id read) and after sign-out. */
  ready: boolean;
  running: boolean;
  online: boolean;
  lastRunAt?: number;
  /** The last run's failure in words (offline, server down, signed out); items stay queued. */
  lastError?: string;
  /** The server refused this app version (426); the text is the server's. */
  outdated?: string;
  /** Read from the outbox while the operator is signed in; none elsewhere. */
  unsent?: UnsentSummary;
  /** Drains now, ignoring the retry wait of items that failed before. */
  syncNow: () => Promise<SyncReport | null>;
}

export const DeviceSyncContext = createContext<DeviceSyncState | null>(null);

const idle: DeviceSyncState = {
  ready: false,
  running: false,
  online: true,
  syncNow: () => Promise.resolve(null),
};

/** The device sync status; outside the operator's provider it reads as "not running". */
export function useDeviceSync(): DeviceSyncState {
  return useContext(DeviceSyncContext) ?? idle;
}
