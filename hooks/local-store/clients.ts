import { v4 as uuid } from 'uuid';
import { read, transaction } from './database';
import type { LocalClient, LocalConsent } from './records';

type ClientRow = {
  id: string;
  first_name: string;
  last_name: string;
  date_of_birth: string | null;
  email: string | null;
  phone: string | null;
  origin: 'device' | 'server';
  version: number;
  created_at: string;
  updated_at: string;
};

type ConsentRow = {
  id: string;
  client_id: string;
  signed_name: string;
  signed_on: string;
  text_version: string;
  created_at: string;
};

function toClient(row: ClientRow): LocalClient {
  return {
    id: row.id,
    firstName: row.first_name,
    lastName: row.last_name,
    dateOfBirth: row.date_of_birth,
    email: row.email,
    phone: row.phone,
    origin: row.origin,
    version: row.version,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

function toConsent(row: ConsentRow): LocalConsent {
  return {
    id: row.id,
    clientId: row.client_id,
    signedName: row.signed_name,
    signedOn: row.signed_on,
    textVersion: row.text_version,
    createdAt: row.created_at,
  };
}

export type NewClient = Pick<LocalClient, 'firstName' | 'lastName' | 'dateOfBirth' | 'email' | 'phone'>;

export async function addClient(input: NewClient, now = new Date()): Promise<LocalClient> {
  const stamp = now.toISOString();
  const client: LocalClient = {
    ...input,
    id: uuid(),
    origin: 'device',
    version: 0,
    createdAt: stamp,
    updatedAt: stamp,
  };
  await transaction(async (db) => {
    await db.runAsync(
      `INSERT INTO clients (id, first_name, last_name, date_of_birth, email, phone, origin, version, created_at, updated_at)
       VALUES (?, ?, ?, ?, ?, ?, 'device', 0, ?, ?)`,
      client.id,
      client.firstName,
      client.lastName,
      client.dateOfBirth,
      client.email,
      client.phone,
      stamp,
      stamp,
    );
  });
  return client;
}

/** Keeps a copy of a client read from the clinic server, so the device can record them offline later. */
export async function rememberServerClient(
  input: Omit<LocalClient, 'origin' | 'createdAt' | 'phone'> & { phone?: string | null },
): Promise<void> {
  await transaction(async (db) => {
    await db.runAsync(
      `INSERT INTO clients (id, first_name, last_name, date_of_birth, email, phone, origin, version, created_at, updated_at)
       VALUES (?, ?, ?, ?, ?, ?, 'server', ?, ?, ?)
       ON CONFLICT(id) DO UPDATE SET first_name = excluded.first_name, last_name = excluded.last_name,
         date_of_birth = excluded.date_of_birth, email = excluded.email, version = excluded.version,
         updated_at = excluded.updated_at
       WHERE clients.origin = 'server'`,
      input.id,
      input.firstName,
      input.lastName,
      input.dateOfBirth,
      input.email,
      input.phone ?? null,
      input.version,
      input.updatedAt,
      input.updatedAt,
    );
  });
}

export function getClient(id: string): Promise<LocalClient | null> {
  return read(async (db) => {
    const row = await db.getFirstAsync<ClientRow>(
      'SELECT * FROM clients WHERE id = ? AND deleted_at IS NULL',
      id,
    );
    return row ? toClient(row) : null;
  });
}

export function listClients(search = ''): Promise<LocalClient[]> {
  const like = `%${search.trim().toLowerCase()}%`;
  return read(async (db) => {
    const rows = await db.getAllAsync<ClientRow>(
      `SELECT * FROM clients WHERE deleted_at IS NULL
         AND (lower(first_name || ' ' || last_name) LIKE ? OR lower(coalesce(email, '')) LIKE ?)
       ORDER BY updated_at DESC LIMIT 200`,
      like,
      like,
    );
    return rows.map(toClient);
  });
}

export type NewConsent = Pick<LocalConsent, 'clientId' | 'signedName' | 'signedOn' | 'textVersion'>;

export async function recordConsent(input: NewConsent, now = new Date()): Promise<LocalConsent> {
  const stamp = now.toISOString();
  const consent: LocalConsent = { ...input, id: uuid(), createdAt: stamp };
  await transaction(async (db) => {
    await db.runAsync(
      `INSERT INTO consents (id, client_id, signed_name, signed_on, text_version, created_at, updated_at)
       VALUES (?, ?, ?, ?, ?, ?, ?)`,
      consent.id,
      consent.clientId,
      consent.signedName,
      consent.signedOn,
      consent.textVersion,
      stamp,
      stamp,
    );
  });
  return consent;
}

/**
 * Keeps a consent the clinic already holds for a client known from the server, so the operator does not ask for it
 * again. Its version (1 or more) marks it as the server's: finishing a session does not send it back.
 */
export async function rememberServerConsent(
  clientId: string,
  consent: { id: string; signedName: string; signedOn: string; textVersion: number; version: number },
  now = new Date(),
): Promise<void> {
  const stamp = now.toISOString();
  await transaction(async (db) => {
    await db.runAsync(
      `INSERT INTO consents (id, client_id, signed_name, signed_on, text_version, version, created_at, updated_at)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?)
       ON CONFLICT(id) DO NOTHING`,
      consent.id,
      clientId,
      consent.signedName,
      consent.signedOn,
      String(consent.textVersion),
      Math.max(1, consent.version),
      stamp,
      stamp,
    );
  });
}

/** The newest consent on this device for the client and the current text version, if any. */
export function currentConsent(clientId: string, textVersion: string): Promise<LocalConsent | null> {
  return read(async (db) => {
    const row = await db.getFirstAsync<ConsentRow>(
      `SELECT * FROM consents WHERE client_id = ? AND text_version = ? AND deleted_at IS NULL
       ORDER BY created_at DESC LIMIT 1`,
      clientId,
      textVersion,
    );
    return row ? toConsent(row) : null;
  });
}
