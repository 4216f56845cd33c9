// The clinic server's API, called straight from a test: signing in, and pushing rows as a phone's sync engine
// would (shared/sync), to set up what a test needs without a second browser.
import { randomUUID } from 'node:crypto';
import { SYNC_PROTOCOL_VERSION, type SyncEntity } from '@/shared/protocol/sync';
import { baseUrl } from '@/tests/support/browser';
import { demoPassword } from './operator';

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
