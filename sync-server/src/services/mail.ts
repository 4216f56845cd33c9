import nodemailer, { type Transporter } from 'nodemailer';
import type { Config } from '../config/settings';

export type MailAttachment = { filename: string; content: Buffer; contentType: string };

export type OutgoingMail = {
  /** The clinic the mail is sent for; it goes out in CLINIC_HEADER so the local mailbox can show each clinic its own. */
  clinicId: string;
  to: string;
  subject: string;
  text: string;
  html?: string;
  attachments?: MailAttachment[];
};

export type SentMail = { messageId: string; accepted: string[]; rejected: string[] };

/** Thrown when a message could not be handed to the SMTP server; `temporary` says whether a retry can help. */
export class MailSendError extends Error {
  constructor(
    message: string,
    readonly temporary: boolean,
    readonly smtpCode?: number,
  ) {
    super(message);
    this.name = 'MailSendError';
  }
}

/**
 * Set on every message the server sends. The admin's mailbox (a view of the local SMTP fake, which holds every
 * clinic's mail) lists only messages carrying the caller's clinic, and nothing without it.
 */
export const CLINIC_HEADER = 'X-Fourpoint-Clinic';

/** The one interface the rest of the server uses to send e-mail. */
export interface MailService {
  readonly from: string;
  /** Where messages go; the mailbox view is on only when this is the local fake. */
  readonly relay: { host: string; port: number };
  send(mail: OutgoingMail): Promise<SentMail>;
  close(): void;
}

export type SmtpOptions = {
  host: string;
  port: number;
  from: string;
  secure?: boolean;
  user?: string;
  password?: string;
  /** Give up on an unreachable server quickly: the outbox keeps the message and retries. */
  timeoutMs?: number;
};

function describe(error: unknown): MailSendError {
  const e = error as { code?: string; responseCode?: number; message?: string };
  const code = e.responseCode;
  if (code && code >= 500)
    return new MailSendError(
      `The mail server refused the message (${code}): ${e.message ?? ''}`.trim(),
      false,
      code,
    );
  if (code && code >= 400)
    return new MailSendError(
      `The mail server deferred the message (${code}); it can be retried.`,
      true,
      code,
    );
  if (
    e.code === 'ECONNREFUSED' ||
    e.code === 'ETIMEDOUT' ||
    e.code === 'ESOCKET' ||
    e.code === 'ECONNECTION'
  ) {
    return new MailSendError(
      'The mail server could not be reached; the message is kept and can be retried.',
      true,
    );
  }
  return new MailSendError(`Sending failed: ${e.message ?? String(error)}`, true);
}

export function createSmtpMailService(options: SmtpOptions): MailService {
  const timeout = options.timeoutMs ?? 10_000;
  const transporter: Transporter = nodemailer.createTransport({
    host: options.host,
    port: options.port,
    secure: options.secure ?? false,
    // The local fake speaks plain SMTP; a real relay is reached over TLS through `secure` or STARTTLS.
    ignoreTLS: !options.secure && options.host === '127.0.0.1',
    auth: options.user && options.password ? { user: options.user, pass: options.password } : undefined,
    connectionTimeout: timeout,
    greetingTimeout: timeout,
    socketTimeout: timeout,
  });
  return {
    from: options.from,
    relay: { host: options.host, port: options.port },
    async send(mail) {
      try {
        const info = await transporter.sendMail({
          from: options.from,
          to: mail.to,
          subject: mail.subject,
          headers: { [CLINIC_HEADER]: mail.clinicId },
          text: mail.text,
          html: mail.html,
          attachments: mail.attachments?.map((a) => ({
            filename: a.filename,
            content: a.content,
            contentType: a.contentType,
          })),
        });
        const accepted = (info.accepted as (string | { address: string })[]).map((a) =>
          typeof a === 'string' ? a : a.address,
        );
        const rejected = (info.rejected as (string | { address: string })[]).map((a) =>
          typeof a === 'string' ? a : a.address,
        );
        if (accepted.length === 0)
          throw new MailSendError(`The mail server accepted no recipient (${rejected.join(', ')}).`, false);
        return { messageId: info.messageId, accepted, rejected };
      } catch (error) {
        if (error instanceof MailSendError) throw error;
        throw describe(error);
      }
    },
    close() {
      transporter.close();
    },
  };
}

/** SMTP settings from the configuration; defaults reach the local fake that `npm start` runs. */
export function mailServiceFrom(config: Config): MailService {
  const credentials = config.smtpCredentials;
  return createSmtpMailService({
    host: config.SMTP_HOST,
    port: config.SMTP_PORT,
    from: config.MAIL_FROM,
    secure: config.SMTP_SECURE === true,
    user: credentials?.user,
    password: credentials?.password,
  });
}
