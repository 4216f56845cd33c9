import { execFile, spawn } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { databaseUrl } from './helpers/test-app';

const run = promisify(execFile);
const ROOT = path.resolve(__dirname, '../..');
const TSX = path.join(ROOT, 'node_modules/.bin/tsx');
jest.setTimeout(60_000);

async function exitOf(args: string[], env: Record<string, string>) {
  try {
    const { stdout, stderr } = await run(TSX, args, { cwd: ROOT, env: { ...process.env, ...env } });
    return { code: 0, stdout, stderr };
  } catch (error) {
    const e = error as { code: number; stdout: string; stderr: string };
    return { code: e.code, stdout: e.stdout, stderr: e.stderr };
  }
}

describe('sync-server/src/main.ts', () => {
  test('when the port is in use, then it prints one line saying what to do and exits 1', async () => {
    const blocker = net.createServer();
    await new Promise<void>((resolve) => blocker.listen(0, '127.0.0.1', resolve));
    const { port } = blocker.address() as net.AddressInfo;
    try {
      const result = await exitOf(['sync-server/src/main.ts'], {
        PORT: String(port),
        DATABASE_URL: databaseUrl(),
      });
      expect(result.code).toBe(1);
      expect(result.stderr.trim()).toBe(
        `Port ${port} is in use: stop what uses it or set PORT=... npm start`,
      );
    } finally {
      blocker.close();
    }
  });

  test('when it starts, then it prints the URL, answers health, and stops cleanly on SIGTERM', async () => {
    // Node with tsx's loader, not the tsx wrapper: the wrapper relays signals and reports its own exit code.
    const child = spawn(process.execPath, ['--import', 'tsx', 'sync-server/src/main.ts'], {
      cwd: ROOT,
      env: { ...process.env, PORT: '0', DATABASE_URL: databaseUrl(), LOG_LEVEL: 'silent' },
    });
    let out = '';
    const url = await new Promise<string>((resolve, reject) => {
      child.stdout.on('data', (chunk: Buffer) => {
        out += chunk.toString();
        const match = /Fourpoint is running at (http:\/\/127\.0\.0\.1:\d+)/.exec(out);
        if (match) resolve(match[1]);
      });
      child.on('exit', (code) => reject(new Error(`exited ${code}: ${out}`)));
    });
    const health = await fetch(`${url}/api/health`);
    expect(await health.json()).toEqual({ ok: true, db: 'up' });
    const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
    child.kill('SIGTERM');
    expect(await exited).toBe(0);
  });
});

describe('sync-server/src/main.ts with NODE_ENV=production', () => {
  // The test set-up generated this run's secrets into the environment (tests/support/server-global-setup.ts).
  const configured = {
    NODE_ENV: 'production',
    PORT: '0',
    DATABASE_URL: databaseUrl(),
    CLINIC_KEYS_DIR: fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-clinic-keys-')),
  };

  test.each(['JWT_SECRET', 'PAYMENTS_SECRET_KEY', 'PAYMENTS_WEBHOOK_SECRET', 'CLINIC_KEYS_DIR'])(
    'when %s is missing, then it prints one line naming it and exits 1 without serving',
    async (name) => {
      const result = await exitOf(['sync-server/src/main.ts'], { ...configured, [name]: '' });
      expect(result.code).toBe(1);
      expect(result.stdout).not.toContain('Fourpoint is running');
      const lines = result.stderr.trim().split('\n');
      expect(lines).toHaveLength(1);
      expect(lines[0]).toBe(
        `Missing setting ${name}: NODE_ENV=production needs it in the environment (npm start generates them into .data/secrets.env).`,
      );
    },
  );
});

describe('sync-server/src/cli/prepare-db.ts', () => {
  test('when the database cannot be reached, then it prints the one-line migration message and exits 1', async () => {
    const blocker = net.createServer();
    await new Promise<void>((resolve) => blocker.listen(0, '127.0.0.1', resolve));
    const { port } = blocker.address() as net.AddressInfo;
    await new Promise<void>((resolve) => blocker.close(() => resolve()));
    const result = await exitOf(['sync-server/src/cli/prepare-db.ts'], {
      DATABASE_URL: `postgres://fourpoint@127.0.0.1:${port}/none`,
    });
    expect(result.code).toBe(1);
    const lines = result.stderr.trim().split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/^Database migration failed: .+\. Fix it, or delete \.data\/ to start over\.$/);
  });

  test('when it runs twice, then the demo clinic is loaded once and the second run adds nothing', async () => {
    const blobDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-blobs-'));
    const env = { DATABASE_URL: databaseUrl(), BLOB_DIR: blobDir };
    const first = await exitOf(['sync-server/src/cli/prepare-db.ts'], env);
    expect(first.code).toBe(0);
    const second = await exitOf(['sync-server/src/cli/prepare-db.ts'], env);
    expect(second.code).toBe(0);
    expect(second.stdout).toContain('Demo data: already loaded.');
  });
});
