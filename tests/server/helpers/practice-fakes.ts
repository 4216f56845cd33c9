// In-process fakes for the practice tests: the SMTP fake and the payments fake on free ports, wired into the
// services of the test's context (ctx.services, which its app was handed), with the app listening on a real port so the fake can post its webhooks.
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { startPaymentsFake, type PaymentsFake } from '@/sync-server/fakes/payments-fake';
import { startSmtpFake, type SmtpFake } from '@/sync-server/fakes/smtp-fake';
import { readSecrets } from '@/sync-server/src/config/secrets';
import { createSmtpMailService } from '@/sync-server/src/services/mail';
import { createStripePaymentsService } from '@/sync-server/src/services/payments';
import type { TestContext } from './test-app';

export type PracticeFakes = {
  mail: SmtpFake;
  payments: PaymentsFake;
  baseUrl: string;
  blobDir: string;
  close: () => Promise<void>;
};

export async function startPracticeFakes(ctx: TestContext): Promise<PracticeFakes> {
  const server = http.createServer(ctx.app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const mail = await startSmtpFake({ smtpPort: 0, httpPort: 0 });
  // The fake signs with the secrets this test run generated (tests/support/server-global-setup.ts).
  const { secretKey, webhookSecret } = readSecrets().payments;
  const payments = await startPaymentsFake(0, { retryDelayMs: 50, secretKey, webhookSecret });
  const mailService = createSmtpMailService({
    host: '127.0.0.1',
    port: mail.smtpPort,
    from: 'Fourpoint tests <tests@fourpoint.test>',
  });
  const blobDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-practice-blobs-'));
  // After the app is listening: the links in e-mails point at its port.
  Object.assign(ctx.services, {
    mail: mailService,
    payments: createStripePaymentsService({
      secretKey,
      webhookSecret,
      api: { host: '127.0.0.1', port: payments.port, protocol: 'http' },
    }),
    publicBaseUrl: baseUrl,
    registerWebhook: true,
    // The admin's Mailbox view reads this fake's listing.
    mailboxUrl: `http://127.0.0.1:${mail.httpPort}`,
  });
  return {
    mail,
    payments,
    baseUrl,
    blobDir,
    close: async () => {
      mailService.close();
      await payments.close();
      await mail.close();
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}

export function messagesTo(fake: SmtpFake, address: string) {
  return fake.messages.filter((m) => m.envelopeTo.includes(address.toLowerCase()));
}

export const linkIn = (text: string | null, pattern: RegExp): string => {
  const match = (text ?? '').match(pattern);
  if (!match) throw new Error(`No link matching ${pattern} in: ${text}`);
  return match[0];
};
