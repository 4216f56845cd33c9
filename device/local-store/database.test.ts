import { openDatabaseAsync } from 'expo-sqlite';
import { LocalStoreError, storageFullMessage, toLocalStoreError, transaction } from './database';

jest.mock('expo-sqlite', () => ({ openDatabaseAsync: jest.fn() }));

function quotaError(): Error {
  const error = new Error('The quota has been exceeded.');
  error.name = 'QuotaExceededError';
  return error;
}

describe('toLocalStoreError', () => {
  test.each([
    ['the browser refuses to grow the origin’s storage', quotaError()],
    ['SQLite reports a full disk', new Error('Error code 13: database or disk is full')],
    ['SQLite names the code', new Error('SQLITE_FULL: database or disk is full')],
  ])('when %s, then the operator is told storage is full and that nothing saved was lost', (_, error) => {
    const mapped = toLocalStoreError(error);
    expect(mapped).toBeInstanceOf(LocalStoreError);
    expect(mapped).toMatchObject({ code: 'storage-full', message: storageFullMessage });
  });

  test('when a second tab holds the database, then the message asks to close the other tab', () => {
    const error = new Error('Access Handles cannot be created if there is another open Access Handle');
    error.name = 'NoModificationAllowedError';
    expect(toLocalStoreError(error)).toMatchObject({ code: 'locked-by-other-tab' });
  });

  test('when an unrelated error occurs, then it passes through unchanged', () => {
    const error = new Error('no such table: things');
    expect(toLocalStoreError(error)).toBe(error);
  });
});

test('when storage fills up in the middle of a transaction, then it is rolled back and reported as storage full', async () => {
  const executed: string[] = [];
  const db = {
    execAsync: jest.fn(async (sql: string) => void executed.push(sql)),
    getFirstAsync: jest.fn(async () => ({ user_version: 99 })),
    runAsync: jest.fn(async () => {
      throw quotaError();
    }),
  };
  (openDatabaseAsync as jest.Mock).mockResolvedValue(db);
  const failure = await transaction((d) => d.runAsync('INSERT INTO site_recordings VALUES (1)')).catch(
    (e: unknown) => e,
  );
  expect(failure).toMatchObject({ code: 'storage-full' });
  expect(executed.slice(-2)).toEqual(['BEGIN IMMEDIATE', 'ROLLBACK']);
  expect(executed).not.toContain('COMMIT');
});
