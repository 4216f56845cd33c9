// What this proves: the one-statement batch is a named prepared statement of each pooled connection, so
// PostgreSQL parses and plans it once per connection and then only executes it; every connection of the pool
// prepares its own copy; and when a connection's copy is gone under it (a pooler's DISCARD ALL, a restart of the
// statement cache), the push still lands in full, one mutation at a time, that connection is replaced, and the
// next push prepares the statement afresh. What PostgreSQL holds is read from its own view,
// pg_prepared_statements (PostgreSQL 15 manual, section 54.16), on the connection in question.
import { randomBytes, randomUUID } from 'node:crypto';
import type { ClientBase } from 'pg';
import { QueryTypes, type Sequelize } from 'sequelize';
import { SYNC_PROTOCOL_VERSION, type Mutation } from '@/shared/protocol/sync';
import { createSequelize } from '@/sync-server/src/db/database';
import { SyncRepository } from '@/sync-server/src/repositories/sync-repository';
import { batchForOneStatement, checkMutation, pushChanges } from '@/sync-server/src/use-cases/sync/push';
import { databaseUrl, type TestClinic } from './helpers/test-app';
import { listConsentTexts } from '@/sync-server/src/repositories/consent-texts-repository';
import {
  SITES,
  clientFields,
  clinicWithTokens,
  sessionFields,
  siteFields,
  startSyncServer,
  type SyncTestServer,
} from './sync-helpers/devices';

let server: SyncTestServer;
let clinic: TestClinic;
let consentTextId: string;
beforeAll(async () => {
  server = await startSyncServer();
  ({ clinic } = await clinicWithTokens(server, 'Prepared'));
  // Every clinic is made with the built-in wording as its version 1; the consents name that row.
  [{ id: consentTextId }] = await listConsentTexts(server.ctx.sequelize, clinic.id);
});
afterAll(() => server.close());

/** A pool of its own, so the test knows which connections the pushes can have used. */
async function withPool<T>(size: number, work: (sequelize: Sequelize) => Promise<T>): Promise<T> {
  const sequelize = createSequelize(databaseUrl(), { poolMax: size });
  try {
    return await work(sequelize);
  } finally {
    await sequelize.close();
  }
}

interface Pool {
  getConnection(options: { type: 'write' }): Promise<ClientBase>;
  releaseConnection(connection: ClientBase): void;
}
const poolOf = (sequelize: Sequelize) => sequelize.connectionManager as unknown as Pool;

/** Takes every connection of the pool at once (so each is a different one), runs `look` on each, gives them back. */
async function onEachConnection<T>(
  sequelize: Sequelize,
  size: number,
  look: (c: ClientBase) => Promise<T>,
): Promise<T[]> {
  const pool = poolOf(sequelize);
  const connections = await Promise.all(
    Array.from({ length: size }, () => pool.getConnection({ type: 'write' })),
  );
  try {
    return await Promise.all(connections.map(look));
  } finally {
    connections.forEach((c) => pool.releaseConnection(c));
  }
}

/** The batch statements this connection holds, with how often PostgreSQL has run each. */
async function batchStatements(connection: ClientBase) {
  const { rows } = await connection.query<{ runs: number; pid: number }>(
    `SELECT (generic_plans + custom_plans)::int AS runs, pg_backend_pid() AS pid
     FROM pg_prepared_statements WHERE name LIKE 'sync_batch_%'`,
  );
  return rows;
}

const backendPid = async (connection: ClientBase) =>
  (await connection.query<{ pid: number }>('SELECT pg_backend_pid() AS pid')).rows[0].pid;

const m = (entity: Mutation['entity'], id: string, change: Record<string, unknown>): Mutation => ({
  mutationId: randomUUID(),
  entity,
  id,
  baseVersion: 0,
  change,
});

/** A finished session as the phone sends it: client, consent, session, four sites. */
function finishedSession(): Mutation[] {
  const clientId = randomUUID();
  const sessionId = randomUUID();
  return [
    m('clients', clientId, clientFields('prepared')),
    m('consents', randomUUID(), {
      clientId,
      consentTextId,
      consentTextVersion: 1,
      typedName: 'Ada Testwood',
      consentDate: '2026-11-30',
    }),
    m('recording_sessions', sessionId, sessionFields(clientId)),
    ...SITES.map((site) =>
      m('site_recordings', randomUUID(), siteFields(sessionId, site, randomBytes(32).toString('hex'))),
    ),
  ];
}

const operator = () => ({
  clinicId: clinic.id,
  userId: clinic.users.operator.id,
  role: 'operator' as const,
  ip: null,
});

/** The batch through the repository: true when the one statement wrote it. */
async function atOnce(sequelize: Sequelize, mutations: Mutation[]): Promise<boolean> {
  const batch = batchForOneStatement(mutations.map((x) => checkMutation(x, 'operator')));
  expect(batch).not.toBeNull();
  return new SyncRepository(sequelize).applyBatchAtOnce(
    { clinicId: clinic.id, userId: clinic.users.operator.id, deviceId: randomUUID() },
    batch!,
  );
}

const storedClients = async (mutations: Mutation[]) => {
  const ids = mutations.filter((x) => x.entity === 'clients').map((x) => x.id);
  const [{ count }] = await server.ctx.sequelize.query<{ count: string }>(
    `SELECT count(*) FROM clients WHERE id IN (:ids) AND clinic_id = :clinicId`,
    { replacements: { ids, clinicId: clinic.id }, type: QueryTypes.SELECT },
  );
  return Number(count);
};

test('when one connection writes three finished sessions, then it holds one batch statement, prepared once and run three times', async () => {
  await withPool(1, async (sequelize) => {
    for (let i = 0; i < 3; i++) expect(await atOnce(sequelize, finishedSession())).toBe(true);
    const [held] = await onEachConnection(sequelize, 1, batchStatements);
    expect(held.map((s) => s.runs)).toEqual([3]);
  });
});

test('when two connections each take a push, then each prepares its own copy of the statement and both write in one statement', async () => {
  await withPool(2, async (sequelize) => {
    // Both connections exist and are idle, so two pushes at once take one each.
    await onEachConnection(sequelize, 2, async () => undefined);
    const written = await Promise.all([
      atOnce(sequelize, finishedSession()),
      atOnce(sequelize, finishedSession()),
    ]);
    expect(written).toEqual([true, true]);
    const held = await onEachConnection(sequelize, 2, batchStatements);
    expect(held.map((statements) => statements.map((s) => s.runs))).toEqual([[1], [1]]);
  });
});

test('when the connection lost its prepared statement under it, then the push still lands whole one mutation at a time, the connection is replaced, and the next push prepares afresh', async () => {
  await withPool(1, async (sequelize) => {
    expect(await atOnce(sequelize, finishedSession())).toBe(true);
    // As a pooler's DISCARD ALL would: the server forgets the statement, pg still thinks it is prepared.
    const [before] = await onEachConnection(sequelize, 1, async (connection) => {
      await connection.query('DEALLOCATE ALL');
      return backendPid(connection);
    });

    const mutations = finishedSession();
    const response = await pushChanges(sequelize, operator(), {
      protocolVersion: SYNC_PROTOCOL_VERSION,
      deviceId: randomUUID(),
      mutations,
    });
    expect(response.results.map((r) => r.status)).toEqual(mutations.map(() => 'applied'));
    expect(await storedClients(mutations)).toBe(1);
    // A duplicate delivery of the same push changes nothing.
    const again = await pushChanges(sequelize, operator(), {
      protocolVersion: SYNC_PROTOCOL_VERSION,
      deviceId: randomUUID(),
      mutations,
    });
    expect(again.results.map((r) => r.status)).toEqual(mutations.map(() => 'already_applied'));

    expect(await atOnce(sequelize, finishedSession())).toBe(true);
    const [[after]] = await onEachConnection(sequelize, 1, batchStatements);
    expect(after.pid).not.toBe(before);
    // On the new connection: the duplicate delivery (which the statement declined) and the last push.
    expect(after.runs).toBe(2);
  });
});
