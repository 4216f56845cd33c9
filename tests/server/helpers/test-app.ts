import { randomUUID } from 'node:crypto';
import pino from 'pino';
import type { Sequelize } from 'sequelize';
import request from 'supertest';
import type { Express } from 'express';
import type { Role, SignInResponse } from '@/shared/protocol';
import { createApp, type AppDeps } from '@/sync-server/src/app';
import { createSequelize } from '@/sync-server/src/db/database';
import { createClinic } from '@/sync-server/src/repositories/clinics-repository';
import { selectRows } from '@/sync-server/src/repositories/sql';
import { createUser } from '@/sync-server/src/repositories/users-repository';
import { hashPassword } from '@/sync-server/src/services/passwords';

export const TEST_PASSWORD = 'correct horse battery staple';

export interface TestContext {
  sequelize: Sequelize;
  app: Express;
  jwtSecret: string;
  close: () => Promise<void>;
}

export function databaseUrl(): string {
  const url = process.env.DATABASE_URL;
  if (!url)
    throw new Error(
      'DATABASE_URL is not set: run server tests through jest, whose global setup provides it.',
    );
  return url;
}

// The database of this test file's context: fixtures such as makeClinic write there.
let contextDatabase: Sequelize | undefined;

/** The database of this test file's context, for fixtures that write rows (makeClinic, review-fixtures). */
export function testDatabase(): Sequelize {
  if (!contextDatabase) throw new Error('A fixture ran before makeTestContext()');
  return contextDatabase;
}

export function makeTestContext(
  overrides: Partial<AppDeps> = {},
  options: { databaseUrl?: string } = {},
): TestContext {
  const sequelize = createSequelize(options.databaseUrl ?? databaseUrl(), { poolMax: 5 });
  contextDatabase = sequelize;
  const jwtSecret = `test-secret-${randomUUID()}`;
  const app = createApp({
    sequelize,
    jwtSecret,
    logger: pino({ level: 'silent' }),
    // Counters of its own: test files share one database and one client address.
    rateLimitPrefix: `test-${randomUUID()}`,
    ...overrides,
  });
  return { sequelize, app, jwtSecret, close: () => sequelize.close() };
}

/** Another app on the same connection, e.g. with its own rate limits. */
export function makeSiblingApp(ctx: TestContext, overrides: Partial<AppDeps> = {}): Express {
  return createApp({
    sequelize: ctx.sequelize,
    jwtSecret: ctx.jwtSecret,
    logger: pino({ level: 'silent' }),
    rateLimitPrefix: `test-${randomUUID()}`,
    ...overrides,
  });
}

export interface TestUser {
  id: string;
  email: string;
  role: Role;
  name: string;
}

export interface TestClinic {
  id: string;
  name: string;
  users: Record<Role, TestUser>;
}

/** A fresh clinic with one user per role, all with TEST_PASSWORD; names carry a unique tag. */
export async function makeClinic(label = 'Clinic'): Promise<TestClinic> {
  const tag = randomUUID().slice(0, 8);
  const sequelize = testDatabase();
  const clinic = { id: randomUUID(), name: `${label} ${tag}` };
  await createClinic(sequelize, clinic);
  const passwordHash = await hashPassword(TEST_PASSWORD);
  const users = {} as Record<Role, TestUser>;
  for (const role of ['operator', 'practitioner', 'admin'] as const) {
    const user = {
      id: randomUUID(),
      email: `${role}.${tag}@test.fourpoint.test`,
      name: `${role[0].toUpperCase()}${role.slice(1)} ${tag}`,
      role,
    };
    await createUser(sequelize, clinic.id, { ...user, passwordHash });
    users[role] = user;
  }
  return { id: clinic.id, name: clinic.name, users };
}

export interface AuditEventRow {
  clinicId: string | null;
  userId: string | null;
  action: string;
  entityId: string | null;
  details: Record<string, unknown> | null;
}

const AUDIT_FILTER_COLUMNS = {
  clinicId: 'clinic_id',
  userId: 'user_id',
  action: 'action',
  entityId: 'entity_id',
};

/** The audit log's rows with every given field equal (a null field: none recorded), oldest first. */
export async function auditEventsWhere(
  filter: Partial<Record<keyof typeof AUDIT_FILTER_COLUMNS, string | null>>,
): Promise<AuditEventRow[]> {
  const conditions = Object.entries(filter).map(([field, value]) => {
    const column = AUDIT_FILTER_COLUMNS[field as keyof typeof AUDIT_FILTER_COLUMNS];
    return value === null ? `${column} IS NULL` : `${column} = :${field}`;
  });
  return selectRows<AuditEventRow>(
    testDatabase(),
    `SELECT clinic_id AS "clinicId", user_id AS "userId", action, entity_id AS "entityId", details
     FROM audit_events WHERE ${conditions.join(' AND ') || 'true'} ORDER BY id`,
    filter,
  );
}

export async function signIn(app: Express, email: string, password = TEST_PASSWORD): Promise<SignInResponse> {
  const res = await request(app).post('/api/auth/sign-in').send({ email, password });
  if (res.status !== 200)
    throw new Error(`sign-in of ${email} answered ${res.status}: ${JSON.stringify(res.body)}`);
  return res.body as SignInResponse;
}

export async function tokensFor(app: Express, clinic: TestClinic): Promise<Record<Role, string>> {
  const tokens = {} as Record<Role, string>;
  for (const role of ['operator', 'practitioner', 'admin'] as const)
    tokens[role] = (await signIn(app, clinic.users[role].email)).accessToken;
  return tokens;
}
