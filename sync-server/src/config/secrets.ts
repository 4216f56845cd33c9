import { randomBytes } from 'node:crypto';
import path from 'node:path';

/**
 * Every secret the server and its local fakes use, read here and nowhere else. Each comes from the environment:
 * `npm start` generates them into .data/secrets.env (scripts/bootstrap/secrets.mjs) and the test set-ups make
 * a fresh set per run. No value has a fallback in the code: with NODE_ENV=production a missing one stops the
 * server; otherwise it is made up at random for this process, so nothing published can ever match it.
 */
export type Secrets = {
  /** Signs access tokens and invitation links. */
  jwtSecret: string;
  payments: {
    secretKey: string;
    /** Verifies the provider's webhook signatures; the local fake signs with the same one. */
    webhookSecret: string;
  };
  /** The folder of each clinic's private key (files mode 600). */
  clinicKeysDir: string;
};

export type Credentials = { user: string; password: string };

type Env = Readonly<Record<string, string | undefined>>;

export class MissingSecretError extends Error {}

const REPO_ROOT = path.resolve(__dirname, '../../..');
const random = (bytes: number) => randomBytes(bytes).toString('base64url');

/** Names and what an unconfigured development process makes up in their place. */
const REQUIRED = {
  JWT_SECRET: () => random(48),
  PAYMENTS_SECRET_KEY: () => `sk_test_${random(24)}`,
  PAYMENTS_WEBHOOK_SECRET: () => `whsec_${random(32)}`,
  CLINIC_KEYS_DIR: () => path.join(REPO_ROOT, '.data', 'clinic-keys'),
} as const;
type RequiredName = keyof typeof REQUIRED;

// One set per environment object: the server and an in-process fake made up the same values.
const cache = new WeakMap<Env, Secrets>();

export function readSecrets(env: Env = process.env): Secrets {
  const cached = cache.get(env);
  if (cached) return cached;
  const production = env.NODE_ENV === 'production';
  const names = Object.keys(REQUIRED) as RequiredName[];
  const missing = names.filter((name) => !env[name]?.trim());
  if (production && missing.length > 0) {
    throw new MissingSecretError(
      `Missing setting${missing.length > 1 ? 's' : ''} ${missing.join(', ')}: NODE_ENV=production needs ${missing.length > 1 ? 'them' : 'it'} in the environment (npm start generates them into .data/secrets.env).`,
    );
  }
  const value = (name: RequiredName) => env[name]?.trim() || REQUIRED[name]();
  const secrets: Secrets = {
    jwtSecret: value('JWT_SECRET'),
    payments: {
      secretKey: value('PAYMENTS_SECRET_KEY'),
      webhookSecret: value('PAYMENTS_WEBHOOK_SECRET'),
    },
    clinicKeysDir: path.resolve(value('CLINIC_KEYS_DIR')),
  };
  cache.set(env, secrets);
  return secrets;
}

/** An optional name-and-password pair (SMTP, S3): both or neither. */
function credentialPair(env: Env, userName: string, passwordName: string): Credentials | undefined {
  const user = env[userName];
  const password = env[passwordName];
  if (Boolean(user) !== Boolean(password))
    throw new MissingSecretError(`Set both ${userName} and ${passwordName}, or neither.`);
  return user && password ? { user, password } : undefined;
}

/** SMTP sign-in for a relay that asks for one; the local fake asks for none. */
export const smtpCredentials = (env: Env = process.env) => credentialPair(env, 'SMTP_USER', 'SMTP_PASSWORD');

/** Object storage keys; without them the S3 SDK's usual credential chain applies. */
export const s3Credentials = (env: Env = process.env) =>
  credentialPair(env, 'S3_ACCESS_KEY_ID', 'S3_SECRET_ACCESS_KEY');

/** The demo clinic's sign-in password; made up when unset, so a demo load never uses a published one. */
export const demoPassword = (env: Env = process.env) => env.FOURPOINT_DEMO_PASSWORD?.trim() || random(12);
