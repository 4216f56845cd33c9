// Starts every local fake of a hosted service, on the ports that `npm start` and the e2e set-up pass.
import { startPaymentsFake } from './payments-fake';
import { startSmtpFake } from './smtp-fake';

type Started = { name: string; close: () => Promise<void> };

function port(name: string, fallback: number): number {
  const value = Number(process.env[name] ?? fallback);
  if (!Number.isInteger(value) || value <= 0)
    throw new Error(`${name} must be a port number, got ${process.env[name]}`);
  return value;
}

async function main(): Promise<void> {
  const started: Started[] = [];
  const mail = await startSmtpFake({
    smtpPort: port('SMTP_PORT', 2525),
    httpPort: port('MAIL_FAKE_HTTP_PORT', 8025),
    log: (m) => console.log(m),
  });
  started.push({ name: 'mail', close: mail.close });
  console.log(
    `mail fake: SMTP on 127.0.0.1:${mail.smtpPort}, mailbox on http://127.0.0.1:${mail.httpPort}/api/messages`,
  );

  const payments = await startPaymentsFake(port('PAYMENTS_FAKE_PORT', 12111));
  started.push({ name: 'payments', close: payments.close });
  console.log(`payments fake: API and test payment pages on ${payments.url}`);

  const stop = async () => {
    await Promise.allSettled(started.map((s) => s.close()));
    process.exit(0);
  };
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
}

main().catch((error) => {
  console.error(`The local fakes could not start: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});
