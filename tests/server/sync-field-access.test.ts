// What this proves: every role reads through sync exactly the fields the field table gives it, and a push of any
// field by any role applies exactly when the table lets that role write it; a refused change names why, leaves
// the row as it was, does not stop the rest of the batch, and a device shows it as failed without sending it
// again. The REST routes that change synced rows apply the same table. Cases are generated from the table, so a
// new field is tested as soon as it has a line there.
// Field-level authorisation: OWASP ASVS 5.0 V8.2.3 ("field-level access is restricted to consumers with explicit
// permissions to specific fields") and OWASP API Security Top 10 2023, API3 (broken object property level
// authorisation).
import { randomUUID } from 'node:crypto';
import axios from 'axios';
import { QueryTypes } from 'sequelize';
import type { Role } from '@/shared/protocol';
import { fieldAccess, fieldWriteRefusal, type FieldRule } from '@/shared/protocol/field-access';
import {
  INITIAL_CHECKPOINT,
  SYNC_PROTOCOL_VERSION,
  serverOwnedFields,
  syncEntities,
  type Mutation,
  type MutationResult,
  type PullResponse,
  type PushResponse,
  type RowData,
  type SyncEntity,
} from '@/shared/protocol/sync';
import { AppError } from '@/sync-server/src/errors';
import { SyncRepository } from '@/sync-server/src/repositories/sync-repository';
import { createClientRecord, updateClientRecord } from '@/sync-server/src/use-cases/clients/client-records';
import { eraseClient } from '@/sync-server/src/use-cases/clients/erase-client';
import type { Caller } from '@/sync-server/src/use-cases/context';
import { saveNotes } from '@/sync-server/src/use-cases/review/notes';
import { resolveConflict } from '@/sync-server/src/use-cases/sync/conflicts';
import { makeClinic, tokensFor, type TestClinic } from './helpers/test-app';
import { SimDevice, clientFields, startSyncServer, type SyncTestServer } from './sync-helpers/devices';

const roles: readonly Role[] = ['operator', 'practitioner', 'admin'];
const FINDINGS = 'Soft systolic murmur at the pulmonic site; refer.';
const PLAN = 'Echocardiogram within four weeks.';
const CLIENT_NOTES = 'Anxious about results; call the daughter first.';

let server: SyncTestServer;
let clinic: TestClinic;
let tokens: Record<Role, string>;
beforeAll(async () => {
  server = await startSyncServer();
  clinic = await makeClinic('Fields');
  tokens = await tokensFor(server.ctx.app, clinic);
});
afterAll(() => server.close());

const rulesOf = (entity: SyncEntity) => Object.entries(fieldAccess[entity]) as [string, FieldRule][];
const callerOf = (role: Role): Caller => ({
  userId: clinic.users[role].id,
  role,
  clinicId: clinic.id,
  ip: null,
});

interface Rows {
  clients: string;
  consents: string;
  recording_sessions: string;
  site_recordings: string;
  /** A second client and session, for changes that move a row to another parent. */
  otherClient: string;
  otherSession: string;
  consentText: string;
}

/** One row of each entity with every field filled, as after capture, review and analysis. */
async function makeRows(): Promise<Rows> {
  const q = (sql: string, replacements: Record<string, unknown>) =>
    server.ctx.sequelize.query(sql, { replacements });
  const r: Rows = {
    clients: randomUUID(),
    consents: randomUUID(),
    recording_sessions: randomUUID(),
    site_recordings: randomUUID(),
    otherClient: randomUUID(),
    otherSession: randomUUID(),
    consentText: randomUUID(),
  };
  const { operator, practitioner } = clinic.users;
  const c = { clinicId: clinic.id, ...r, operator: operator.id, practitioner: practitioner.id };
  await q(
    `INSERT INTO consent_texts (id, clinic_id, version, title, body, created_at, updated_at)
     VALUES (:consentText, :clinicId, (SELECT coalesce(max(version), 0) + 1 FROM consent_texts WHERE clinic_id = :clinicId),
             'Consent', 'Recording heart sounds.', now(), now())`,
    c,
  );
  for (const id of [r.clients, r.otherClient]) {
    await q(
      `INSERT INTO clients (id, clinic_id, first_name, last_name, date_of_birth, email, phone, notes)
       VALUES (:id, :clinicId, 'Wren', 'Castellan', '1980-04-02', 'wren@client.fourpoint.test', '555 0100', :notes)`,
      { ...c, id, notes: CLIENT_NOTES },
    );
  }
  await q(
    `INSERT INTO consents (id, clinic_id, client_id, consent_text_id, consent_text_version, typed_name, consent_date, recorded_by)
     VALUES (:consents, :clinicId, :clients, :consentText, 1, 'Wren Castellan', '2026-11-30', :operator)`,
    c,
  );
  for (const [id, client] of [
    [r.recording_sessions, r.clients],
    [r.otherSession, r.otherClient],
  ]) {
    await q(
      `INSERT INTO recording_sessions (id, clinic_id, client_id, operator_id, status, started_at, finished_at, findings, plan,
         follow_up_date, reviewed_by, reviewed_at)
       VALUES (:id, :clinicId, :client, :operator, 'reviewed', '2026-11-30T09:00:00Z', '2026-11-30T09:12:00Z', :findings, :plan,
         '2026-12-28', :practitioner, '2026-12-01T10:00:00Z')`,
      { ...c, id, client, findings: FINDINGS, plan: PLAN },
    );
  }
  await q(
    `INSERT INTO site_recordings (id, clinic_id, session_id, site, quality_verdict, clip_sha256, clip_state, duration_s,
       recorded_at, skipped_reason, keep_anyway_note, analysis)
     VALUES (:site_recordings, :clinicId, :recording_sessions, 'mitral', 'usable', :sha, 'stored', 15, '2026-11-30T09:03:00Z',
       'none skipped', 'Noisy room', '{"heartRateBpm": 72}')`,
    { ...c, sha: 'a'.repeat(64) },
  );
  return r;
}

/** A valid new value for each field, different from what makeRows stored. */
function newValue(entity: SyncEntity, field: string, rows: Rows): unknown {
  const values: Record<string, unknown> = {
    firstName: 'Rowan',
    lastName: 'Ashdown',
    dateOfBirth: '1975-01-09',
    email: 'rowan@client.fourpoint.test',
    phone: '555 0199',
    notes: 'Prefers mornings.',
    clientId: rows.otherClient,
    consentTextId: rows.consentText,
    consentTextVersion: 2,
    typedName: 'R. Ashdown',
    consentDate: '2026-12-01',
    status: 'cancelled',
    startedAt: '2026-11-30T08:00:00.000Z',
    finishedAt: '2026-11-30T08:30:00.000Z',
    findings: 'Nothing abnormal.',
    plan: 'No follow-up needed.',
    followUpDate: '2027-01-15',
    sessionId: rows.otherSession,
    site: 'pulmonic',
    qualityVerdict: 'good',
    clipSha256: 'b'.repeat(64),
    durationS: 20,
    recordedAt: '2026-11-30T09:05:00.000Z',
    skippedReason: 'Client asked to stop.',
    keepAnywayNote: 'Kept: best of three.',
    deletedAt: '2026-12-02T12:00:00.000Z',
  };
  if (entity === 'consents' && field === 'consentTextId') return rows.consentText;
  return field in values ? values[field] : 'set by a device';
}

async function push(role: Role, mutations: Mutation[]): Promise<MutationResult[]> {
  const res = await axios.post(
    `${server.url}/api/sync/push`,
    { protocolVersion: SYNC_PROTOCOL_VERSION, deviceId: randomUUID(), mutations },
    { headers: { authorization: `Bearer ${tokens[role]}` } },
  );
  return (res.data as PushResponse).results;
}

async function pullAll(role: Role): Promise<PullResponse['rows']> {
  const rows: PullResponse['rows'] = [];
  let checkpoint = INITIAL_CHECKPOINT;
  for (;;) {
    const res = await axios.post(
      `${server.url}/api/sync/pull`,
      { protocolVersion: SYNC_PROTOCOL_VERSION, deviceId: randomUUID(), checkpoint, limit: 1000 },
      { headers: { authorization: `Bearer ${tokens[role]}` } },
    );
    const page = res.data as PullResponse;
    rows.push(...page.rows);
    checkpoint = page.nextCheckpoint;
    if (!page.hasMore) return rows;
  }
}

/** Times travel as PostgreSQL writes them ('+00:00') in a pull and as ISO ('Z') from a row read. */
const sameTime = (value: unknown) =>
  typeof value === 'string' && /^\d{4}-\d{2}-\d{2}T/.test(value) ? Date.parse(value) : value;

const stored = (entity: SyncEntity, id: string) =>
  new SyncRepository(server.ctx.sequelize).findRow(entity, clinic.id, id);

describe('pull carries exactly the fields each role may read', () => {
  let rows: Rows;
  beforeAll(async () => {
    rows = await makeRows();
  });

  for (const role of roles) {
    for (const entity of syncEntities) {
      test(`when ${role}s pull ${entity}, then exactly the fields the table lets them read come back`, async () => {
        const pulled = (await pullAll(role)).find((r) => r.entity === entity && r.id === rows[entity]);
        const expected = rulesOf(entity)
          .filter(([field, rule]) => field !== 'deletedAt' && rule.read.includes(role))
          .map(([field]) => field);
        expect(Object.keys(pulled!.data).sort()).toEqual(expected.sort());
        // Each field sent carries the stored value (nothing blanked instead of left out).
        const row = await stored(entity, rows[entity]);
        for (const field of expected)
          expect(sameTime(pulled!.data[field])).toEqual(sameTime(row!.data[field]));
        expect(pulled).toHaveProperty('deletedAt', null);
      });
    }
  }

  test("when an operator pulls, then no practitioner's findings, plan or client notes are anywhere in it", async () => {
    const text = JSON.stringify(await pullAll('operator'));
    for (const secret of [FINDINGS, PLAN, CLIENT_NOTES]) expect(text).not.toContain(secret);
  });
});

describe('push writes a field only for the roles the table lets write it', () => {
  for (const role of roles) {
    for (const entity of syncEntities) {
      for (const [field, rule] of rulesOf(entity)) {
        const allowed = rule.write.includes(role);
        test(`when a ${role} pushes a change of ${entity}.${field}, then it is ${allowed ? 'applied' : 'refused and the row is unchanged'}`, async () => {
          const rows = await makeRows();
          const id = rows[entity];
          const before = await stored(entity, id);
          const value = newValue(entity, field, rows);
          const other = randomUUID();
          const [result, next] = await push(role, [
            {
              mutationId: randomUUID(),
              entity,
              id,
              baseVersion: before!.version,
              change: { [field]: value },
            },
            // Another client of the same batch: the role may write it, and it applies whatever happens above.
            {
              mutationId: randomUUID(),
              entity: 'clients',
              id: other,
              baseVersion: 0,
              change: clientFields(other),
            },
          ]);
          expect(next.status).toBe('applied');
          const after = await stored(entity, id);
          if (allowed) {
            expect(result).toMatchObject({ status: 'applied', newVersion: before!.version + 1 });
            if (field === 'deletedAt') expect(after!.deletedAt).toBe(value);
            else expect(after!.data[field]).toEqual(value);
            return;
          }
          const serverOwned = (serverOwnedFields[entity] as readonly string[]).includes(field);
          expect(result).toEqual({
            mutationId: expect.any(String),
            status: 'rejected',
            code: serverOwned ? 'invalid_change' : 'forbidden',
            reason: serverOwned
              ? `${field} is set by the server, not by a device.`
              : fieldWriteRefusal(role, entity, [field]),
          });
          expect(after).toEqual(before);
        });
      }
    }
  }

  test('when an operator pushes findings, then the reason says in words who writes them', async () => {
    const rows = await makeRows();
    const [result] = await push('operator', [
      {
        mutationId: randomUUID(),
        entity: 'recording_sessions',
        id: rows.recording_sessions,
        baseVersion: 1,
        change: { findings: 'Looks fine to me.', plan: null },
      },
    ]);
    expect(result).toMatchObject({
      status: 'rejected',
      code: 'forbidden',
      reason:
        'Operators may not change the findings and plan of a session; only practitioners do. This change was not applied.',
    });
  });

  // Who moves a visit to which step: the phone starts, finishes or cancels it; a practitioner marks it reviewed
  // (common practice, no source: a capture operator does not sign off a review).
  test.each([
    [
      'operator',
      'reviewed',
      'Operators may not set the status of a session to “reviewed”; they may set “in progress”, “completed” or “cancelled”. This change was not applied.',
    ],
    [
      'practitioner',
      'in_progress',
      'Practitioners may not set the status of a session to “in progress”; they may set “reviewed” or “cancelled”. This change was not applied.',
    ],
    [
      'practitioner',
      'completed',
      'Practitioners may not set the status of a session to “completed”; they may set “reviewed” or “cancelled”. This change was not applied.',
    ],
  ] as const)(
    'when %ss set a session %s, then it is refused in words and nothing changes',
    async (role, status, reason) => {
      const rows = await makeRows();
      const before = await stored('recording_sessions', rows.recording_sessions);
      const [result] = await push(role, [
        {
          mutationId: randomUUID(),
          entity: 'recording_sessions',
          id: rows.recording_sessions,
          baseVersion: before!.version,
          change: { status },
        },
      ]);
      expect(result).toMatchObject({ status: 'rejected', code: 'forbidden', reason });
      expect(await stored('recording_sessions', rows.recording_sessions)).toEqual(before);
    },
  );

  test('when an operator finishes a session, then the step is theirs to set', async () => {
    const rows = await makeRows();
    const before = await stored('recording_sessions', rows.recording_sessions);
    const [result] = await push('operator', [
      {
        mutationId: randomUUID(),
        entity: 'recording_sessions',
        id: rows.recording_sessions,
        baseVersion: before!.version,
        change: { status: 'completed' },
      },
    ]);
    expect(result).toMatchObject({ status: 'applied', newVersion: before!.version + 1 });
    expect((await stored('recording_sessions', rows.recording_sessions))!.data.status).toBe('completed');
  });

  test('when an operator creates a client, then notes may come as null (empty) but not with words in them', async () => {
    const empty = randomUUID();
    const filled = randomUUID();
    const results = await push('operator', [
      { mutationId: randomUUID(), entity: 'clients', id: empty, baseVersion: 0, change: clientFields('e') },
      {
        mutationId: randomUUID(),
        entity: 'clients',
        id: filled,
        baseVersion: 0,
        change: { ...clientFields('f'), notes: 'Written on the phone.' },
      },
    ]);
    expect(results.map((r) => r.status)).toEqual(['applied', 'rejected']);
    expect(await stored('clients', filled)).toBeNull();
  });

  test('when the device engine gets a refusal, then the change shows as failed with the reason and is not sent again', async () => {
    const rows = await makeRows();
    const device = new SimDevice(server.url, tokens.operator);
    await device.engine.sync();
    const refused = await device.edit('recording_sessions', rows.recording_sessions, {
      plan: 'From the phone.',
    });
    const phone = await device.edit('clients', rows.clients, { phone: '555 0142' });
    await device.sync();
    const outbox = new Map((await device.storage.listOutbox()).map((i) => [i.id, i]));
    expect(outbox.get(refused)).toMatchObject({
      state: 'failed',
      attempts: 1,
      lastError: fieldWriteRefusal('operator', 'recording_sessions', ['plan']),
    });
    expect(outbox.get(phone)).toMatchObject({ state: 'sent' });

    const [{ count }] = await server.ctx.sequelize.query<{ count: string }>(
      `SELECT count(*) FROM applied_mutations WHERE clinic_id = $1`,
      { bind: [clinic.id], type: QueryTypes.SELECT },
    );
    await device.sync();
    expect((await device.storage.listOutbox()).find((i) => i.id === refused)).toMatchObject({
      state: 'failed',
      attempts: 1,
    });
    const [again] = await server.ctx.sequelize.query<{ count: string }>(
      `SELECT count(*) FROM applied_mutations WHERE clinic_id = $1`,
      { bind: [clinic.id], type: QueryTypes.SELECT },
    );
    expect(again.count).toBe(count);
    expect((await stored('recording_sessions', rows.recording_sessions))!.data.plan).toBe(PLAN);
  });
});

/** Runs a use case as a role; 'refused' when it answers with the field rule's 403. */
async function outcome(run: () => Promise<unknown>): Promise<'done' | 'refused'> {
  try {
    await run();
    return 'done';
  } catch (error) {
    if (error instanceof AppError && error.code === 'field_not_writable' && error.httpStatus === 403)
      return 'refused';
    throw error;
  }
}

const mayWriteAll = (role: Role, entity: SyncEntity, fields: string[]) =>
  fields.every((f) => (fieldAccess[entity] as Record<string, FieldRule>)[f]!.write.includes(role));

// The use cases themselves enforce the table, whatever roles the access table lets reach their routes.
describe('REST routes that change synced rows follow the same table', () => {
  const deps = () => ({
    sequelize: server.ctx.sequelize,
    jwtSecret: server.ctx.jwtSecret,
    services: server.ctx.services,
  });
  const clientDetails = { firstName: 'Rowan', lastName: 'Ashdown', notes: 'Prefers mornings.' };

  for (const role of roles) {
    const clientsAllowed = mayWriteAll(role, 'clients', Object.keys(clientFields('x')));
    test(`when a ${role} creates or edits a client record, then it is ${clientsAllowed ? 'done' : 'refused'}`, async () => {
      const rows = await makeRows();
      const before = await stored('clients', rows.clients);
      expect(await outcome(() => createClientRecord(deps(), callerOf(role), clientDetails))).toBe(
        clientsAllowed ? 'done' : 'refused',
      );
      expect(
        await outcome(() =>
          updateClientRecord(deps(), callerOf(role), rows.clients, {
            ...clientDetails,
            version: before!.version,
          }),
        ),
      ).toBe(clientsAllowed ? 'done' : 'refused');
      if (!clientsAllowed) expect(await stored('clients', rows.clients)).toEqual(before);
    });

    const notesAllowed = mayWriteAll(role, 'recording_sessions', [
      'findings',
      'plan',
      'followUpDate',
      'status',
    ]);
    test(`when a ${role} saves findings through review, then it is ${notesAllowed ? 'done' : 'refused'}`, async () => {
      const rows = await makeRows();
      const before = await stored('recording_sessions', rows.recording_sessions);
      const save = () =>
        saveNotes(deps(), callerOf(role), rows.recording_sessions, {
          findings: 'Rewritten.',
          plan: null,
          followUpDate: null,
          baseVersion: before!.version,
        });
      expect(await outcome(save)).toBe(notesAllowed ? 'done' : 'refused');
      if (!notesAllowed) expect(await stored('recording_sessions', rows.recording_sessions)).toEqual(before);
    });

    const eraseAllowed = syncEntities.every((e) => mayWriteAll(role, e, ['deletedAt']));
    test(`when a ${role} erases a client, then it is ${eraseAllowed ? 'done' : 'refused'}`, async () => {
      const rows = await makeRows();
      const before = await stored('clients', rows.clients);
      expect(await outcome(() => eraseClient(deps(), callerOf(role), rows.clients, 'Wren Castellan'))).toBe(
        eraseAllowed ? 'done' : 'refused',
      );
      if (!eraseAllowed) expect(await stored('clients', rows.clients)).toEqual(before);
    });
  }

  test("when an admin keeps the device's side of a conflict, then only fields its author may write are kept", async () => {
    // A conflict recorded before pushes were checked: an operator's device changed a client's notes.
    const rows = await makeRows();
    const before = await stored('clients', rows.clients);
    const conflictId = randomUUID();
    const change: RowData = { notes: 'Written on the phone.', phone: '555 0177' };
    await new SyncRepository(server.ctx.sequelize).insertConflict({
      id: conflictId,
      clinicId: clinic.id,
      entity: 'clients',
      rowId: rows.clients,
      mutationId: randomUUID(),
      deviceId: randomUUID(),
      userId: clinic.users.operator.id,
      serverVersion: { version: before!.version, deletedAt: null, data: before!.data },
      clientVersion: {
        version: before!.version - 1,
        deletedAt: null,
        data: { ...before!.data, ...change },
        change,
      },
    });
    const resolve = (keep: 'client' | 'fields') =>
      resolveConflict(server.ctx.sequelize, callerOf('admin'), conflictId, {
        keep,
        fields: keep === 'fields' ? { notes: 'server', phone: 'client' } : undefined,
        note: 'Checked with the front desk.',
      });
    expect(await outcome(() => resolve('client'))).toBe('refused');
    expect(await stored('clients', rows.clients)).toEqual(before);
    expect(await outcome(() => resolve('fields'))).toBe('done');
    const after = await stored('clients', rows.clients);
    expect(after!.data).toMatchObject({ notes: CLIENT_NOTES, phone: '555 0177' });
  });
});
