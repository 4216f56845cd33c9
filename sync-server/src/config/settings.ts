import os from 'node:os';
import path from 'node:path';
import { z } from 'zod';
import { readSecrets, s3Credentials, smtpCredentials, type Credentials, type Secrets } from './secrets';

/**
 * Every setting the server reads, read and checked here and nowhere else (tests/server/config.test.ts fails for a
 * `process.env` or a data-folder path anywhere else under sync-server/src). Each row is the environment variable,
 * what it holds (one line, also the DEVELOPERS.md table: `npm run config:doc`), its default as shown there, and a
 * zod schema that turns the text into a value and refuses what cannot work, in a sentence a person can act on.
 * Secrets (no default; NODE_ENV=production refuses to start without them) are read by secrets.ts beside this.
 */

/** The repository's data folder, where development defaults live (ignored by git). */
export const DATA_DIR = path.resolve(__dirname, '../../../.data');

type Setting<T> = { doc: string; shown: string; schema: z.ZodType<T> };

const text = (fallback: string) => z.string().trim().min(1).catch(fallback);
const optionalText = z
  .string()
  .trim()
  .optional()
  .transform((value) => value || undefined);
const wholeNumber = (fallback: number, min: number, max: number) =>
  z
    .string()
    .trim()
    .optional()
    .transform((value, ctx) => {
      if (!value) return fallback;
      const n = Number(value);
      if (!Number.isInteger(n) || n < min || n > max) {
        ctx.addIssue({ code: 'custom', message: `must be a whole number from ${min} to ${max}` });
        return z.NEVER;
      }
      return n;
    });
const folder = (fallback: string) =>
  z
    .string()
    .trim()
    .optional()
    .transform((value) => path.resolve(value || fallback));
const oneOf = <const T extends readonly [string, ...string[]]>(values: T, fallback: T[number]) =>
  z
    .string()
    .trim()
    .toLowerCase()
    .optional()
    .transform((value, ctx) => {
      if (!value) return fallback;
      if (!(values as readonly string[]).includes(value)) {
        ctx.addIssue({ code: 'custom', message: `must be ${values.map((v) => `"${v}"`).join(' or ')}` });
        return z.NEVER;
      }
      return value as T[number];
    });
const flag = (truthy: readonly string[]) =>
  z
    .string()
    .trim()
    .optional()
    .transform((value) => (value ? truthy.includes(value.toLowerCase()) : undefined));

const setting = <T>(schema: z.ZodType<T>, shown: string, doc: string): Setting<T> => ({ schema, shown, doc });

export const SETTINGS = {
  NODE_ENV: setting(text('development'), 'development', '`production` refuses to start without every secret'),
  PORT: setting(wholeNumber(8080, 0, 65535), '8080', 'the port this process listens on (0: any free port)'),
  HOST: setting(text('127.0.0.1'), '127.0.0.1', 'the address it listens on (`0.0.0.0` for every interface)'),
  DATABASE_URL: setting(optionalText, '(required)', 'PostgreSQL URL; `npm start` sets up a local cluster'),
  WEB_DIST: setting(
    optionalText.transform((value) => value && path.resolve(value)),
    '(none: API only)',
    'folder of the web export served beside the API',
  ),
  LOG_LEVEL: setting(text('info'), 'info', "pino's level: fatal, error, warn, info, debug, trace or silent"),
  FOURPOINT_INSTANCE: setting(
    text(`${os.hostname()}-${process.pid}`),
    'host name and process id',
    'names this process in `X-Fourpoint-Instance` (the balancer sets i1, i2…)',
  ),
  TRUST_PROXY: setting(
    optionalText,
    '(none)',
    "Express's `trust proxy` (e.g. `loopback` behind a balancer on this machine) so limits see the client",
  ),
  SHUTDOWN_GRACE_MS: setting(
    wholeNumber(25_000, 0, 600_000),
    '25000',
    'after SIGTERM, how long requests in flight may take before they are cut',
  ),
  JOB_POLL_MS: setting(
    wholeNumber(2_000, 500, 600_000),
    '2000',
    'how often each instance asks the job queue for due work',
  ),
  PUBLIC_BASE_URL: setting(
    optionalText,
    '(from the request)',
    'where links in e-mails point (invitations, payment pages)',
  ),
  BLOB_STORE: setting(
    oneOf(['local', 's3'] as const, 'local'),
    'local',
    'where kept clips live: `local` or `s3`',
  ),
  BLOB_DIR: setting(
    folder(path.join(DATA_DIR, 'blobs')),
    '.data/blobs',
    'the folder of kept clips (BLOB_STORE=local)',
  ),
  UPLOAD_DIR: setting(
    folder(path.join(DATA_DIR, 'uploads')),
    '.data/uploads',
    'uploads in progress with BLOB_STORE=local: one folder every instance shares',
  ),
  S3_BUCKET: setting(optionalText, '(required for s3)', 'the bucket of kept clips and uploads in progress'),
  S3_ENDPOINT: setting(
    optionalText,
    "(the SDK's)",
    'object storage endpoint (the local fake, or a non-AWS service)',
  ),
  S3_REGION: setting(optionalText, "(the SDK's)", 'object storage region'),
  S3_PREFIX: setting(optionalText, '(none)', 'key prefix of every object the server writes'),
  S3_FORCE_PATH_STYLE: setting(
    flag(['true']),
    "(the SDK's)",
    '`true` for path-style bucket addresses (the fake)',
  ),
  SMTP_HOST: setting(text('127.0.0.1'), '127.0.0.1', 'the mail relay (default: the local SMTP fake)'),
  SMTP_PORT: setting(wholeNumber(2525, 1, 65535), '2525', "the mail relay's port"),
  SMTP_SECURE: setting(flag(['1', 'true']), 'off', '`1`: TLS from the first byte (port 465)'),
  MAIL_FROM: setting(
    text('Fourpoint reports <reports@fourpoint.test>'),
    '`Fourpoint reports <reports@fourpoint.test>`',
    'the sender of every e-mail',
  ),
  MAIL_FAKE_HTTP_PORT: setting(
    wholeNumber(0, 0, 65535),
    '(none)',
    "the local mail fake's listing, shown on the admin's Mailbox page (development only)",
  ),
  PAYMENTS_API_HOST: setting(
    optionalText,
    '(none: the local fake)',
    "set when payments go to the provider's API rather than the local fake",
  ),
  PAYMENTS_FAKE_PORT: setting(wholeNumber(12111, 1, 65535), '12111', "the local payments fake's port"),
} satisfies Record<string, Setting<unknown>>;

/** Secrets: read by secrets.ts (no fallback in the code), listed here for the settings table. */
export const SECRETS_DOC: Record<string, string> = {
  JWT_SECRET: 'signs access tokens and invitation links',
  PAYMENTS_SECRET_KEY: "the payment provider's secret key",
  PAYMENTS_WEBHOOK_SECRET: "verifies the provider's webhook signatures",
  CLINIC_KEYS_DIR: "folder of each clinic's private key (files mode 600; development: .data/clinic-keys)",
  FOURPOINT_DEMO_PASSWORD: "the demo users' password when `prepare-db` loads the demo clinic (else random)",
  'SMTP_USER, SMTP_PASSWORD': 'mail relay sign-in, both or neither',
  'S3_ACCESS_KEY_ID, S3_SECRET_ACCESS_KEY': "object storage keys, both or neither (else the SDK's chain)",
};

type Values = { [K in keyof typeof SETTINGS]: z.output<(typeof SETTINGS)[K]['schema']> };
export type Config = Values & {
  secrets: Secrets;
  smtpCredentials?: Credentials;
  s3Credentials?: Credentials;
  production: boolean;
};

/** A setting that cannot work: one line naming it, for the person starting the server. */
export class ConfigError extends Error {}

export type Env = Readonly<Record<string, string | undefined>>;
const cache = new WeakMap<Env, Config>();

/** Reads and checks every setting (and every secret) from `env`; one result per environment object. */
export function loadConfig(env: Env = process.env): Config {
  const cached = cache.get(env);
  if (cached) return cached;
  const values: Record<string, unknown> = {};
  const problems: string[] = [];
  for (const [name, { schema }] of Object.entries(SETTINGS)) {
    const parsed = (schema as z.ZodType<unknown>).safeParse(env[name]);
    if (parsed.success) values[name] = parsed.data;
    else problems.push(`${name} ${parsed.error.issues[0]?.message ?? 'is not valid'}, not "${env[name]}"`);
  }
  if (problems.length > 0) throw new ConfigError(`${problems.join('; ')}.`);
  const config = values as Values;
  if (config.BLOB_STORE === 's3' && !config.S3_BUCKET)
    throw new ConfigError('BLOB_STORE=s3 needs S3_BUCKET (the bucket that keeps the clips).');
  const result: Config = {
    ...config,
    secrets: readSecrets(env),
    smtpCredentials: smtpCredentials(env),
    s3Credentials: s3Credentials(env),
    production: config.NODE_ENV === 'production',
  };
  cache.set(env, result);
  return result;
}

/** The DEVELOPERS.md table of settings, generated from the rows above (`npm run config:doc`). */
export function settingsTable(): string {
  const rows = [
    '| variable | default | what it sets |',
    '| --- | --- | --- |',
    ...Object.entries(SETTINGS).map(([name, s]) => `| \`${name}\` | ${s.shown} | ${s.doc} |`),
    ...Object.entries(SECRETS_DOC).map(([name, doc]) => `| \`${name}\` | (secret: no default) | ${doc} |`),
  ];
  return rows.join('\n');
}
