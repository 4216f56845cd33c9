// The server's settings are read in one module (sync-server/src/config/) and its parts are built in one
// composition root: this fails for a file elsewhere under sync-server/src that reads the environment or finds the
// data folder itself, for a setting without its line of documentation, and for a value that cannot work.
import fs from 'node:fs';
import path from 'node:path';
import { composeServices } from '@/sync-server/src/composition-root';
import { createSequelize } from '@/sync-server/src/db/database';
import { ConfigError, loadConfig, SETTINGS, settingsTable } from '@/sync-server/src/config/settings';
import { LocalDiskBlobStore } from '@/sync-server/src/services/blob-store';

const SRC = path.join(__dirname, '../../sync-server/src');
const CONFIG_DIR = path.join(SRC, 'config');

function sourceFiles(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) return full === CONFIG_DIR ? [] : sourceFiles(full);
    return /\.(ts|js|mjs|cjs)$/.test(entry.name) ? [full] : [];
  });
}

// Ways a file can read the environment or resolve the data folder on its own.
const FORBIDDEN: { what: string; pattern: RegExp }[] = [
  { what: 'process.env', pattern: /process\s*(\.\s*env\b|\[\s*['"`]env['"`]\s*\])/ },
  { what: "env from 'node:process'", pattern: /\benv\b[^;]*from\s+['"](node:)?process['"]/ },
  { what: 'the .data folder', pattern: /['"`]\.data(['"`/\\])/ },
];

test('when a file under sync-server/src outside config/ reads the environment or the data folder, then this names it', () => {
  const files = sourceFiles(SRC);
  expect(files.length).toBeGreaterThan(50);
  const offenders = files.flatMap((file) => {
    const text = fs.readFileSync(file, 'utf8');
    return FORBIDDEN.filter(({ pattern }) => pattern.test(text)).map(
      ({ what }) => `${path.relative(SRC, file)}: ${what}`,
    );
  });
  expect(offenders).toEqual([]);
});

test('the check itself finds each way in', () => {
  const samples = [
    'const port = process.env.PORT;',
    "const e = process['env'];",
    "import { env } from 'node:process';",
    "const dir = path.join(root, '.data', 'blobs');",
    'const dir = `.data/uploads`;',
  ];
  for (const sample of samples) expect(FORBIDDEN.some(({ pattern }) => pattern.test(sample))).toBe(true);
  expect(FORBIDDEN.some(({ pattern }) => pattern.test('delete .data/ to start over'))).toBe(false);
});

// The parts are handed in (AppDeps.services, UseCaseDeps.services, backgroundJobs(deps)), never looked up: only
// main.ts takes values from the composition root; every other file may name its types alone.
const TAKES_FROM_ROOT = /import\s+(?!type\b)[^;]*from\s+['"][./]*composition-root['"]/;

test('when a file under sync-server/src other than main.ts takes a value from the composition root, then this names it', () => {
  const offenders = sourceFiles(SRC)
    .filter((file) => !['main.ts', 'composition-root.ts'].includes(path.relative(SRC, file)))
    .filter((file) => TAKES_FROM_ROOT.test(fs.readFileSync(file, 'utf8')))
    .map((file) => path.relative(SRC, file));
  expect(offenders).toEqual([]);
  expect(TAKES_FROM_ROOT.test("import { services } from '../../composition-root';")).toBe(true);
  expect(TAKES_FROM_ROOT.test("import type { Services } from '../composition-root';")).toBe(false);
});

test('every setting has one line of documentation and a default shown, and the table lists each once', () => {
  for (const [name, s] of Object.entries(SETTINGS)) {
    expect(s.doc.length).toBeGreaterThan(10);
    expect(s.doc).not.toContain('\n');
    expect(s.shown.length).toBeGreaterThan(0);
    expect(
      settingsTable()
        .split('\n')
        .filter((line) => line.startsWith(`| \`${name}\` |`)),
    ).toHaveLength(1);
  }
});

test('when nothing is set, then every default applies and the parts are built from them', async () => {
  const config = loadConfig({});
  expect(config.PORT).toBe(8080);
  expect(config.HOST).toBe('127.0.0.1');
  expect(config.BLOB_STORE).toBe('local');
  expect(config.SMTP_PORT).toBe(2525);
  expect(config.SHUTDOWN_GRACE_MS).toBe(25_000);
  expect(path.isAbsolute(config.BLOB_DIR)).toBe(true);
  // A handle that never connects: building the parts asks nothing of the database.
  const sequelize = createSequelize('postgres://fourpoint@127.0.0.1:1/unused');
  const composed = composeServices(config, sequelize);
  expect(composed.blobStore).toBeInstanceOf(LocalDiskBlobStore);
  expect(composed.mail.relay).toEqual({ host: '127.0.0.1', port: 2525 });
  expect(composed.mailboxUrl).toBeNull();
  composed.mail.close();
  await composed.readiness.stop();
  await sequelize.close();
});

test('when settings cannot work, then one line names each and says what it must be', () => {
  const attempt = (env: Record<string, string>) => {
    try {
      loadConfig(env);
    } catch (error) {
      expect(error).toBeInstanceOf(ConfigError);
      return (error as Error).message;
    }
    throw new Error('accepted');
  };
  expect(attempt({ PORT: '80a', SMTP_PORT: '70000' })).toBe(
    'PORT must be a whole number from 0 to 65535, not "80a"; SMTP_PORT must be a whole number from 1 to 65535, not "70000".',
  );
  expect(attempt({ BLOB_STORE: 'ftp' })).toBe('BLOB_STORE must be "local" or "s3", not "ftp".');
  expect(attempt({ BLOB_STORE: 's3' })).toContain('needs S3_BUCKET');
});

test("DEVELOPERS.md's Settings table is the one the configuration module prints", () => {
  const doc = fs.readFileSync(path.resolve(__dirname, '../../DEVELOPERS.md'), 'utf8');
  const section = doc.split(/^## /m).find((part) => part.startsWith('Settings')) ?? '';
  const documented = section
    .split('\n')
    .filter((line) => line.startsWith('|'))
    .join('\n');
  // When this fails: paste the output of `npm run config:doc` into DEVELOPERS.md.
  expect(documented).toBe(settingsTable());
});
