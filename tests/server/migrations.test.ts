import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import { QueryTypes } from 'sequelize';
import { MIGRATIONS_DIR, runMigrations } from '@/sync-server/src/db/migrator';
import { execute, selectRows } from '@/sync-server/src/repositories/sql';
import { addClient } from './helpers/review-fixtures';
import { databaseUrl, makeClinic, makeTestContext } from './helpers/test-app';

const ctx = makeTestContext();
afterAll(() => ctx.close());

const SYNCABLE = ['clients', 'consents', 'recording_sessions', 'site_recordings'];

/** A session with no site recordings yet. */
async function addBareSession(clinicId: string, clientId: string): Promise<string> {
  const id = randomUUID();
  await execute(
    ctx.sequelize,
    `INSERT INTO recording_sessions (id, clinic_id, client_id, started_at) VALUES (:id, :clinicId, :clientId, now())`,
    { id, clinicId, clientId },
  );
  return id;
}

const changeSeq = async (table: 'clients' | 'recording_sessions', id: string) =>
  BigInt(
    (
      await selectRows<{ change_seq: string }>(
        ctx.sequelize,
        `SELECT change_seq FROM ${table} WHERE id = :id`,
        {
          id,
        },
      )
    )[0]!.change_seq,
  );

describe('migrations', () => {
  test('when migrations run again on a migrated database, then none run and each file is recorded once', async () => {
    expect(await runMigrations(databaseUrl())).toEqual([]);
    const files = fs.readdirSync(MIGRATIONS_DIR).filter((f) => /^\d{12}-.+\.ts$/.test(f));
    const rows = await ctx.sequelize.query<{ name: string }>('SELECT name FROM "SequelizeMeta"', {
      type: QueryTypes.SELECT,
    });
    expect(rows.map((r) => r.name).sort()).toEqual(files.map((f) => f.replace(/\.ts$/, '')).sort());
  });

  test('when the migration folder is read, then every file is named YYYYMMDDHHMM-what.ts', () => {
    for (const f of fs.readdirSync(MIGRATIONS_DIR)) expect(f).toMatch(/^\d{12}-[a-z0-9-]+\.ts$/);
  });

  test('when a device-creatable table is inspected, then it has uuid id, version, updated_at, deleted_at, clinic_id and change_seq', async () => {
    for (const table of SYNCABLE) {
      const columns = await ctx.sequelize.getQueryInterface().describeTable(table);
      expect(columns.id.type).toBe('UUID');
      expect(columns.version.type).toBe('INTEGER');
      expect(columns.change_seq.type).toBe('BIGINT');
      for (const c of ['updated_at', 'deleted_at', 'clinic_id']) expect(columns[c]).toBeDefined();
    }
  });

  test('when rows are inserted and updated, then change_seq takes fresh, rising numbers from one sequence', async () => {
    const clinic = await makeClinic('Seq');
    const clientId = await addClient(clinic.id, 'Seq', 'One');
    const sessionId = await addBareSession(clinic.id, clientId);
    const first = await changeSeq('clients', clientId);
    const sessionSeq = await changeSeq('recording_sessions', sessionId);
    expect(sessionSeq).toBeGreaterThan(first);
    await execute(ctx.sequelize, `UPDATE clients SET last_name = 'Two' WHERE id = :clientId`, { clientId });
    expect(await changeSeq('clients', clientId)).toBeGreaterThan(sessionSeq);
  });

  test('when an audit event is updated or deleted, then the database refuses', async () => {
    const [event] = await selectRows<{ id: string }>(
      ctx.sequelize,
      `INSERT INTO audit_events (action) VALUES (:action) RETURNING id`,
      { action: `test.${randomUUID()}` },
    );
    await expect(
      execute(ctx.sequelize, `UPDATE audit_events SET action = 'changed' WHERE id = :id`, event!),
    ).rejects.toThrow(/append-only/);
    await expect(execute(ctx.sequelize, `DELETE FROM audit_events WHERE id = :id`, event!)).rejects.toThrow(
      /append-only/,
    );
  });

  test('when a second recording of the same site is added to a session, then the database refuses it', async () => {
    const clinic = await makeClinic('Sites');
    const sessionId = await addBareSession(clinic.id, await addClient(clinic.id, 'Two', 'Mitral'));
    const insert = () =>
      ctx.sequelize.query(
        `INSERT INTO site_recordings (id, session_id, site, clinic_id) VALUES ('${randomUUID()}', '${sessionId}', 'mitral', '${clinic.id}')`,
      );
    await insert();
    await expect(insert()).rejects.toHaveProperty('parent.constraint', 'site_recordings_one_per_site');
  });
});
