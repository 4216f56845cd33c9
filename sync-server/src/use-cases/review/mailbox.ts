import { z } from 'zod';
import {
  mailboxMessageDetailSchema,
  mailboxMessageSchema,
  type MailboxMessage,
  type MailboxMessageDetail,
} from '@/shared/protocol/review';
import { AppError } from '../../errors';
import { CLINIC_HEADER } from '../../services/mail';
import type { Caller, UseCaseDeps } from '../context';

// The admin's Mailbox is a view of the local SMTP fake, which keeps every clinic's mail in one list. It shows a
// message only when the message carries the caller's clinic in CLINIC_HEADER (set by the mail service on every
// send): mail without it, or for another clinic, is never listed or readable, and reads as unknown (404).

const LOOPBACK = new Set(['127.0.0.1', 'localhost', '::1']);

const noMailbox = () =>
  new AppError(
    'no_mailbox',
    'This server sends through a real mail relay; there is no local mailbox to read.',
    404,
  );
const noSuchMessage = () =>
  new AppError('not_found', 'There is no such message in your clinic’s mailbox.', 404);
const unreachable = () =>
  new AppError(
    'mailbox_unreachable',
    'The local mailbox is not running: start the fakes (npm start does).',
    502,
  );

const fakeIdentitySchema = z.object({ fake: z.literal('fourpoint-smtp-fake'), smtpPort: z.number() });
const withHeaders = { headers: z.record(z.string(), z.string()) };
const fakeListSchema = z.object({ messages: z.array(mailboxMessageSchema.extend(withHeaders)) });
const fakeDetailSchema = mailboxMessageDetailSchema.extend(withHeaders);

async function fetchFake(url: string): Promise<Response> {
  try {
    return await fetch(url);
  } catch {
    throw unreachable();
  }
}

/**
 * The fake's address, only when the mail service the server sends through delivers to that very fake (same
 * loopback host, the SMTP port the fake says is its own). A real relay anywhere turns the view off, whatever
 * MAIL_FAKE_HTTP_PORT says.
 */
async function localMailbox(deps: UseCaseDeps): Promise<string> {
  const base = deps.services.mailboxUrl;
  if (!base) throw noMailbox();
  const { relay } = deps.services.mail;
  if (!LOOPBACK.has(relay.host)) throw noMailbox();
  const identity = fakeIdentitySchema.safeParse(
    await (await fetchFake(`${base}/api/identity`)).json().catch(() => null),
  );
  if (!identity.success || relay.port !== identity.data.smtpPort) throw noMailbox();
  return base;
}

const isTheCallers = (caller: Caller, headers: Record<string, string>) =>
  headers[CLINIC_HEADER.toLowerCase()] === caller.clinicId;

export async function listMailbox(deps: UseCaseDeps, caller: Caller): Promise<MailboxMessage[]> {
  const base = await localMailbox(deps);
  const response = await fetchFake(`${base}/api/messages`);
  if (!response.ok) throw unreachable();
  const { messages } = fakeListSchema.parse(await response.json());
  return messages.filter((m) => isTheCallers(caller, m.headers)).map((m) => mailboxMessageSchema.parse(m));
}

async function callersMessage(base: string, caller: Caller, messageId: string) {
  if (!z.uuid().safeParse(messageId).success) throw noSuchMessage();
  const response = await fetchFake(`${base}/api/messages/${messageId}`);
  if (response.status === 404) throw noSuchMessage();
  if (!response.ok) throw unreachable();
  const message = fakeDetailSchema.parse(await response.json());
  if (!isTheCallers(caller, message.headers)) throw noSuchMessage();
  return message;
}

export async function readMailboxMessage(
  deps: UseCaseDeps,
  caller: Caller,
  messageId: string,
): Promise<MailboxMessageDetail> {
  return mailboxMessageDetailSchema.parse(await callersMessage(await localMailbox(deps), caller, messageId));
}

export async function readMailboxAttachment(
  deps: UseCaseDeps,
  caller: Caller,
  messageId: string,
  index: string,
): Promise<{ contentType: string; filename: string | null; body: Buffer }> {
  const base = await localMailbox(deps);
  const message = await callersMessage(base, caller, messageId);
  const attachment = message.attachments.find((a) => String(a.index) === index);
  if (!attachment) throw new AppError('not_found', 'This message has no such attachment.', 404);
  const response = await fetchFake(`${base}/api/messages/${messageId}/attachments/${attachment.index}`);
  if (!response.ok) throw unreachable();
  return {
    contentType: attachment.contentType,
    filename: attachment.filename,
    body: Buffer.from(await response.arrayBuffer()),
  };
}
