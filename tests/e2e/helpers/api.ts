// The clinic server's API, called straight from a test: signing in, and pushing rows as a phone's sync engine
// would (shared/sync), to set up what a test needs without a second browser.
import { randomUUID } from 'node:crypto';
import { SYNC_PROTOCOL_VERSION, type SyncEntity } from '@/shared/protocol/sync';
import { baseUrl } from '@/tests/support/browser';
import { demoPassword, operatorEmail } from './operator';

export async function tokenFor(email: string): Promise<string> {
  const response = await fetch(`${baseUrl()}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password: demoPassword }),
  });
  if (response.status !== 200) throw new Error(`Sign-in of ${email} answered ${response.status}.`);
  return ((await response.json()) as { accessToken: string }).accessToken;
}

export type PushResult = { status: string; newVersion?: number; conflictId?: string; reason?: string };

export async function push(
  token: string,
  deviceId: string,
  mutation: { entity: SyncEntity; id: string; baseVersion: number; change: Record<string, unknown> },
): Promise<PushResult> {
  const response = await fetch(`${baseUrl()}/api/sync/push`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
    body: JSON.stringify({
      protocolVersion: SYNC_PROTOCOL_VERSION,
      deviceId,
      mutations: [{ mutationId: randomUUID(), ...mutation }],
    }),
  });
  if (response.status !== 200) throw new Error(`Push answered ${response.status}.`);
  return ((await response.json()) as { results: PushResult[] }).results[0]!;
}

export async function currentConsentText(token: string): Promise<{ id: string; version: number }> {
  const response = await fetch(`${baseUrl()}/api/consent-texts`, {
    headers: { authorization: `Bearer ${token}` },
  });
  const { texts } = (await response.json()) as {
    texts: { id: string; version: number; isCurrent: boolean }[];
  };
  const current = texts.find((t) => t.isCurrent);
  if (!current) throw new Error('The clinic has no current consent text.');
  return current;
}

/**
 * A client another phone added, with consent to the wording in force, already at the clinic (pushed by the
 * real sync as the demo operator). Returns the client's id and the push results, for the caller to assert.
 */
export async function clientWithConsentAtTheClinic(
  firstName: string,
  lastName: string,
): Promise<{ clientId: string; results: PushResult[] }> {
  const token = await tokenFor(operatorEmail);
  const text = await currentConsentText(token);
  const otherPhone = randomUUID();
  const clientId = randomUUID();
  const results = [
    await push(token, otherPhone, {
      entity: 'clients',
      id: clientId,
      baseVersion: 0,
      change: { firstName, lastName, dateOfBirth: null, email: null, phone: null, notes: null },
    }),
    await push(token, otherPhone, {
      entity: 'consents',
      id: randomUUID(),
      baseVersion: 0,
      change: {
        clientId,
        consentTextId: text.id,
        consentTextVersion: text.version,
        typedName: `${firstName} ${lastName}`,
        consentDate: new Date().toISOString().slice(0, 10),
      },
    }),
  ];
  return { clientId, results };
}
