import type { SQLiteDatabase } from 'expo-sqlite';

// Each step runs once, in order; PRAGMA user_version records how far a device has come.
const steps: string[] = [
  `
  CREATE TABLE clients (
    id TEXT PRIMARY KEY NOT NULL,
    first_name TEXT NOT NULL,
    last_name TEXT NOT NULL,
    date_of_birth TEXT,
    email TEXT,
    phone TEXT,
    origin TEXT NOT NULL DEFAULT 'device',
    version INTEGER NOT NULL DEFAULT 0,
    created_at TEXT NOT NULL,
    updated_at TEXT NOT NULL,
    deleted_at TEXT
  );
  CREATE TABLE consents (
    id TEXT PRIMARY KEY NOT NULL,
    client_id TEXT NOT NULL REFERENCES clients(id),
    signed_name TEXT NOT NULL,
    signed_on TEXT NOT NULL,
    text_version TEXT NOT NULL,
    version INTEGER NOT NULL DEFAULT 0,
    created_at TEXT NOT NULL,
    updated_at TEXT NOT NULL,
    deleted_at TEXT
  );
  CREATE INDEX consents_by_client ON consents(client_id);
  CREATE TABLE sessions (
    id TEXT PRIMARY KEY NOT NULL,
    client_id TEXT NOT NULL REFERENCES clients(id),
    consent_id TEXT NOT NULL REFERENCES consents(id),
    status TEXT NOT NULL,
    current_site TEXT NOT NULL,
    clip_seconds INTEGER NOT NULL,
    started_at TEXT NOT NULL,
    finished_at TEXT,
    version INTEGER NOT NULL DEFAULT 0,
    updated_at TEXT NOT NULL,
    deleted_at TEXT
  );
  CREATE INDEX sessions_by_client ON sessions(client_id);
  CREATE TABLE site_recordings (
    id TEXT PRIMARY KEY NOT NULL,
    session_id TEXT NOT NULL REFERENCES sessions(id),
    site TEXT NOT NULL,
    outcome TEXT NOT NULL,
    source TEXT,
    skip_reason TEXT,
    note TEXT,
    verdict TEXT,
    heart_rate_bpm REAL,
    duration_s REAL,
    sample_rate INTEGER,
    analysis_json TEXT,
    trace_json TEXT,
    clip_wav BLOB,
    blob_hash TEXT,
    size_bytes INTEGER,
    version INTEGER NOT NULL DEFAULT 0,
    updated_at TEXT NOT NULL,
    deleted_at TEXT,
    UNIQUE (session_id, site)
  );
  CREATE TABLE sealed_blobs (
    hash TEXT PRIMARY KEY NOT NULL,
    bytes BLOB NOT NULL,
    size_bytes INTEGER NOT NULL,
    created_at TEXT NOT NULL
  );
  CREATE TABLE outbox (
    id TEXT PRIMARY KEY NOT NULL,
    kind TEXT NOT NULL,
    entity TEXT,
    row_id TEXT NOT NULL,
    mutation_json TEXT,
    blob_hash TEXT,
    size_bytes INTEGER NOT NULL,
    state TEXT NOT NULL,
    attempts INTEGER NOT NULL DEFAULT 0,
    last_error TEXT,
    next_attempt_at INTEGER NOT NULL,
    progress REAL NOT NULL DEFAULT 0,
    created_at INTEGER NOT NULL,
    upload_url TEXT,
    conflict_id TEXT,
    label TEXT
  );
  CREATE TABLE synced_rows (
    entity TEXT NOT NULL,
    id TEXT NOT NULL,
    version INTEGER NOT NULL,
    change_seq TEXT NOT NULL,
    deleted_at TEXT,
    data_json TEXT NOT NULL,
    PRIMARY KEY (entity, id)
  );
  CREATE INDEX outbox_by_state ON outbox(state, next_attempt_at);
  CREATE TABLE kv (
    key TEXT PRIMARY KEY NOT NULL,
    value TEXT NOT NULL
  );
  `,
  // Each outbox item names its client and session, so the outbox groups by session, a client's badge derives
  // from what still waits, and erasing a client finds every item about them. Labels no longer carry names.
  `
  ALTER TABLE outbox ADD COLUMN client_id TEXT;
  ALTER TABLE outbox ADD COLUMN session_id TEXT;
  UPDATE outbox SET client_id = row_id WHERE entity = 'clients';
  UPDATE outbox SET client_id = (SELECT client_id FROM consents WHERE consents.id = outbox.row_id)
    WHERE entity = 'consents';
  UPDATE outbox SET session_id = row_id WHERE entity = 'recording_sessions';
  UPDATE outbox SET session_id = (SELECT session_id FROM site_recordings WHERE site_recordings.id = outbox.row_id)
    WHERE entity = 'site_recordings' OR kind = 'clip';
  UPDATE outbox SET client_id = (SELECT client_id FROM sessions WHERE sessions.id = outbox.session_id)
    WHERE session_id IS NOT NULL;
  UPDATE outbox SET label = NULL;
  CREATE INDEX outbox_by_client ON outbox(client_id);
  `,
];

export async function migrate(db: SQLiteDatabase): Promise<void> {
  // Deleted rows are zeroed on disk, so removed plaintext audio cannot be read back from free pages.
  await db.execAsync('PRAGMA secure_delete = ON; PRAGMA foreign_keys = ON;');
  const row = await db.getFirstAsync<{ user_version: number }>('PRAGMA user_version');
  const current = row?.user_version ?? 0;
  for (let index = current; index < steps.length; index++) {
    await db.execAsync('BEGIN IMMEDIATE');
    try {
      await db.execAsync(steps[index]!);
      await db.execAsync(`PRAGMA user_version = ${index + 1}`);
      await db.execAsync('COMMIT');
    } catch (error) {
      await db.execAsync('ROLLBACK').catch(() => undefined);
      throw error;
    }
  }
}
