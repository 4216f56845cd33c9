// A local stand-in for the clinic's mail relay: accepts SMTP, keeps every message with its attachments, and
// lists them over HTTP so the admin mailbox page and the tests can read them back.
import { randomUUID } from 'node:crypto';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import express from 'express';
import { SMTPServer } from 'smtp-server';
import { parseMessage, type ParsedMessage } from './mime-message';

export type StoredMessage = ParsedMessage & {
  id: string;
  receivedAt: string;
  envelopeFrom: string;
  envelopeTo: string[];
  raw: Buffer;
};

export type SmtpFake = {
  smtpPort: number;
  httpPort: number;
  messages: StoredMessage[];
  /** The next `count` messages are refused with a temporary 451, as a busy relay would. */
  deferNext(count: number): void;
  /** The next `count` messages are refused for good with a 550, as for an address that does not exist. */
  refuseNext(count: number): void;
  close(): Promise<void>;
};

function summary(m: StoredMessage) {
  return {
    id: m.id,
    receivedAt: m.receivedAt,
    from: m.from,
    to: m.to,
    envelopeTo: m.envelopeTo,
    subject: m.subject,
    // The server's mailbox view reads the clinic header from here to show each clinic only its own mail.
    headers: m.headers,
    attachments: m.attachments.map((a, index) => ({
      index,
      filename: a.filename,
      contentType: a.contentType,
      size: a.content.length,
    })),
  };
}

function listen(
  server: {
    listen: (port: number, host: string, cb: () => void) => unknown;
    once: (e: 'error', cb: (err: Error) => void) => unknown;
  },
  port: number,
): Promise<void> {
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
}

export async function startSmtpFake(
  options: { smtpPort?: number; httpPort?: number; log?: (m: string) => void } = {},
): Promise<SmtpFake> {
  const messages: StoredMessage[] = [];
  let deferred = 0;
  let refused = 0;
  const log = options.log ?? (() => undefined);

  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    size: 25 * 1024 * 1024,
    onRcptTo(_address, _session, callback) {
      if (refused > 0) {
        refused--;
        const err = new Error('No such mailbox here') as Error & { responseCode: number };
        err.responseCode = 550;
        return callback(err);
      }
      if (deferred > 0) {
        deferred--;
        const err = new Error('Mailbox busy, try again later') as Error & { responseCode: number };
        err.responseCode = 451;
        return callback(err);
      }
      callback();
    },
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const raw = Buffer.concat(chunks);
        const parsed = parseMessage(raw);
        const message: StoredMessage = {
          ...parsed,
          id: randomUUID(),
          receivedAt: new Date().toISOString(),
          envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          envelopeTo: session.envelope.rcptTo.map((r) => r.address),
          raw,
        };
        messages.push(message);
        log(`mail fake: received "${message.subject}" for ${message.envelopeTo.join(', ')}`);
        callback();
      });
    },
  });
  await listen(smtp.server, options.smtpPort ?? 0);

  const app = express();
  app.use(express.json());
  // Which SMTP port this mailbox belongs to: the server shows its mailbox view only when its mail goes here.
  app.get('/api/identity', (_req, res) => {
    res.json({ fake: 'fourpoint-smtp-fake', smtpPort: (smtp.server.address() as AddressInfo).port });
  });
  app.get('/api/messages', (req, res) => {
    const to = typeof req.query.to === 'string' ? req.query.to.toLowerCase() : null;
    const list = messages.filter((m) => !to || m.envelopeTo.some((t) => t.toLowerCase() === to));
    res.json({ messages: list.map(summary).reverse() });
  });
  app.get('/api/messages/:id', (req, res) => {
    const m = messages.find((x) => x.id === req.params.id);
    if (!m) return void res.status(404).json({ error: { code: 'not_found', message: 'No such message.' } });
    res.json({ ...summary(m), text: m.text, html: m.html, headers: m.headers });
  });
  app.get('/api/messages/:id/raw', (req, res) => {
    const m = messages.find((x) => x.id === req.params.id);
    if (!m) return void res.status(404).end();
    res.type('message/rfc822').send(m.raw);
  });
  app.get('/api/messages/:id/attachments/:index', (req, res) => {
    const m = messages.find((x) => x.id === req.params.id);
    const a = m?.attachments[Number(req.params.index)];
    if (!a)
      return void res.status(404).json({ error: { code: 'not_found', message: 'No such attachment.' } });
    res.type(a.contentType);
    if (a.filename)
      res.setHeader('Content-Disposition', `inline; filename="${a.filename.replace(/"/g, '')}"`);
    res.send(a.content);
  });
  app.post('/api/faults', (req, res) => {
    deferred = Math.max(0, Number((req.body as { deferNext?: number }).deferNext ?? 0));
    res.json({ deferNext: deferred });
  });
  const httpServer = http.createServer(app);
  await listen(httpServer, options.httpPort ?? 0);

  return {
    smtpPort: (smtp.server.address() as AddressInfo).port,
    httpPort: (httpServer.address() as AddressInfo).port,
    messages,
    deferNext(count) {
      deferred = count;
    },
    refuseNext(count) {
      refused = count;
    },
    close: () =>
      new Promise<void>((resolve) => {
        httpServer.close(() => smtp.close(() => resolve()));
        httpServer.closeAllConnections();
      }),
  };
}
