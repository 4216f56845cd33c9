import { openDatabaseAsync, type SQLiteDatabase } from 'expo-sqlite';
import { migrate } from './schema';

// The web build runs expo-sqlite's async API only (the sync one needs cross-origin isolation and stalls).
export const databaseName = 'fourpoint-local.db';

let opening: Promise<SQLiteDatabase> | null = null;
let writes: Promise<unknown> = Promise.resolve();

export function openLocalDatabase(): Promise<SQLiteDatabase> {
  opening ??= (async () => {
    const db = await openDatabaseAsync(databaseName);
    await migrate(db);
    return db;
  })().catch((error: unknown) => {
    opening = null;
    throw toLocalStoreError(error);
  });
  return opening;
}

/**
 * One writer at a time: expo-sqlite's transactions are not exclusive, so two screens writing at once could
 * interleave statements inside each other's BEGIN/COMMIT.
 */
export function write<T>(task: (db: SQLiteDatabase) => Promise<T>): Promise<T> {
  const run = writes.then(async () => {
    const db = await openLocalDatabase();
    try {
      return await task(db);
    } catch (error) {
      throw toLocalStoreError(error);
    }
  });
  writes = run.catch(() => undefined);
  return run;
}

export async function read<T>(task: (db: SQLiteDatabase) => Promise<T>): Promise<T> {
  const db = await openLocalDatabase();
  try {
    return await task(db);
  } catch (error) {
    throw toLocalStoreError(error);
  }
}

/** A write that either lands whole or not at all. */
export function transaction<T>(task: (db: SQLiteDatabase) => Promise<T>): Promise<T> {
  return write(async (db) => {
    await db.execAsync('BEGIN IMMEDIATE');
    try {
      const result = await task(db);
      await db.execAsync('COMMIT');
      return result;
    } catch (error) {
      await db.execAsync('ROLLBACK').catch(() => undefined);
      throw error;
    }
  });
}

export type LocalStoreErrorCode = 'storage-full' | 'locked-by-other-tab' | 'unavailable';

export class LocalStoreError extends Error {
  constructor(
    readonly code: LocalStoreErrorCode,
    message: string,
  ) {
    super(message);
    this.name = 'LocalStoreError';
  }
}

export const storageFullMessage =
  'This device is out of storage space, so the take was not saved. Free some space (or send the outbox) and try again; nothing already saved was lost.';

/** Maps the engine's and the browser's failures to words an operator can act on. */
export function toLocalStoreError(error: unknown): Error {
  if (error instanceof LocalStoreError) return error;
  const text = error instanceof Error ? `${error.name} ${error.message}` : String(error);
  if (/QuotaExceeded|SQLITE_FULL|database or disk is full|disk is full/i.test(text)) {
    return new LocalStoreError('storage-full', storageFullMessage);
  }
  if (/NoModificationAllowed|Access Handles cannot be created|already open|locked/i.test(text)) {
    return new LocalStoreError(
      'locked-by-other-tab',
      'Fourpoint is open in another tab or window. Close the other one, then try again: only one tab at a time can hold the records kept on this device.',
    );
  }
  return error instanceof Error ? error : new Error(text);
}
