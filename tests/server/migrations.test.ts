import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import { QueryTypes } from 'sequelize';
import { MIGRATIONS_DIR, runMigrations } from '@/sync-server/src/db/migrator';
import { AuditEvent, Client, RecordingSession } from '@/sync-server/src/models';
import { databaseUrl, makeClinic, makeTestContext } from './helpers/test-app';

const ctx = makeTestContext();
afterAll(() => ctx.close());

const SYNCABLE = ['clients', 'consents', 'recording_sessions', 'site_recordings'];

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
    const client = await Client.create({
      id: randomUUID(),
      clinicId: clinic.id,
      firstName: 'Seq',
      lastName: 'One',
    });
    const session = await RecordingSession.create({
      id: randomUUID(),
      clinicId: clinic.id,
      clientId: client.id,
      startedAt: new Date(),
    });
    await client.reload();
    await session.reload();
    const first = BigInt(client.changeSeq);
    expect(BigInt(session.changeSeq)).toBeGreaterThan(first);
    await Client.update({ lastName: 'Two' }, { where: { id: client.id } });
    await client.reload();
    expect(BigInt(client.changeSeq)).toBeGreaterThan(BigInt(session.changeSeq));
  });

  test('when an audit event is updated or deleted, then the database refuses', async () => {
    const event = await AuditEvent.create({ clinicId: null, userId: null, action: `test.${randomUUID()}` });
    await expect(
      ctx.sequelize.query(`UPDATE audit_events SET action = 'changed' WHERE id = ${event.id}`),
    ).rejects.toThrow(/append-only/);
    await expect(ctx.sequelize.query(`DELETE FROM audit_events WHERE id = ${event.id}`)).rejects.toThrow(
      /append-only/,
    );
  });

  test('when a second recording of the same site is added to a session, then the database refuses it', async () => {
    const clinic = await makeClinic('Sites');
    const client = await Client.create({
      id: randomUUID(),
      clinicId: clinic.id,
      firstName: 'Two',
      lastName: 'Mitral',
    });
    const sessionId = randomUUID();
    await RecordingSession.create({
      id: sessionId,
      clinicId: clinic.id,
      clientId: client.id,
      startedAt: new Date(),
    });
    const insert = () =>
      ctx.sequelize.query(
        `INSERT INTO site_recordings (id, session_id, site, clinic_id) VALUES ('${randomUUID()}', '${sessionId}', 'mitral', '${clinic.id}')`,
      );
    await insert();
    await expect(insert()).rejects.toHaveProperty('parent.constraint', 'site_recordings_one_per_site');
  });
});
