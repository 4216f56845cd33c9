import { v4 as uuid } from 'uuid';
import type { Mutation } from '@/shared/protocol/sync';
import { read, transaction } from './database';
import { enqueue } from './outbox';
import type { LocalClient, LocalConsent } from './records';
import { selectInto } from './columns';

/** A client row read straight into `LocalClient`. */
export const clientColumns = selectInto<LocalClient>()(
  'id first_name last_name date_of_birth email phone origin version created_at updated_at',
);

/** A consent row read straight into `LocalConsent`. */
export const consentColumns = selectInto<LocalConsent>()(
  'id client_id signed_name signed_on text_version created_at',
);

export type NewClient = Pick<LocalClient, 'firstName' | 'lastName' | 'dateOfBirth' | 'email' | 'phone'>;

export const clientDetailsLabel = 'Client details';

/** The client's fields as a sync change; `extra` carries the practice's fields a new row sends empty. */
export function clientChange(
  client: Pick<LocalClient, 'firstName' | 'lastName' | 'dateOfBirth' | 'email' | 'phone'>,
  extra: Record<string, null> = {},
): Record<string, unknown> {
  const { firstName, lastName, dateOfBirth, email, phone } = client;
  return { firstName, lastName, dateOfBirth, email, phone, ...extra };
}

/** Adds the client and queues them for the clinic in one transaction: they go with the next sync, session or not. */
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
    const mutation: Mutation = {
      mutationId: uuid(),
      entity: 'clients',
      id: client.id,
      baseVersion: 0,
      change: clientChange(client, { notes: null }),
    };
    await enqueue(
      db,
      {
        kind: 'mutation',
        entity: 'clients',
        rowId: client.id,
        mutation,
        sizeBytes: JSON.stringify(mutation).length,
        label: clientDetailsLabel,
        clientId: client.id,
        sessionId: null,
      },
      now,
    );
  });
  return client;
}

export function getClient(id: string): Promise<LocalClient | null> {
  return read(async (db) => {
    return db.getFirstAsync<LocalClient>(
      `SELECT ${clientColumns} FROM clients WHERE id = ? AND deleted_at IS NULL`,
      id,
    );
  });
}

/** A client as the list shows them: consent for the wording in force, and whether anything of theirs still waits. */
export type ListedClient = LocalClient & { hasConsent: boolean; unsent: boolean };

export function listClients(search: string, consentTextVersion: string): Promise<ListedClient[]> {
  const like = `%${search.trim().toLowerCase()}%`;
  return read(async (db) => {
    const rows = await db.getAllAsync<LocalClient & { hasConsent: number; unsent: number }>(
      `SELECT ${clientColumns},
         EXISTS (SELECT 1 FROM consents WHERE consents.client_id = clients.id AND consents.text_version = ?
           AND consents.deleted_at IS NULL) AS "hasConsent",
         EXISTS (SELECT 1 FROM outbox WHERE outbox.client_id = clients.id AND outbox.state <> 'sent') AS unsent
       FROM clients WHERE deleted_at IS NULL
         AND (lower(first_name || ' ' || last_name) LIKE ? OR lower(coalesce(email, '')) LIKE ?)
       ORDER BY lower(last_name), lower(first_name) LIMIT 500`,
      consentTextVersion,
      like,
      like,
    );
    return rows.map((row) => ({
      ...row,
      hasConsent: Boolean(row.hasConsent),
      unsent: Boolean(row.unsent),
    }));
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

/** The newest consent on this device for the client and the current text version, if any. */
export function currentConsent(clientId: string, textVersion: string): Promise<LocalConsent | null> {
  return read(async (db) => {
    return db.getFirstAsync<LocalConsent>(
      `SELECT ${consentColumns} FROM consents WHERE client_id = ? AND text_version = ? AND deleted_at IS NULL
       ORDER BY created_at DESC LIMIT 1`,
      clientId,
      textVersion,
    );
  });
}
