import type { ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import { Client } from 'pg';

type E2eGlobals = {
  __fourpointE2e?: {
    server: ChildProcess;
    fakes?: ChildProcess;
    cluster?: { stop: () => void };
    clusterUrl: string;
    databaseName: string;
    stateDir: string;
  };
};

export default async function globalTeardown(): Promise<void> {
  const state = (globalThis as E2eGlobals).__fourpointE2e;
  if (!state) return;
  for (const child of [state.server, state.fakes]) {
    if (!child || child.exitCode !== null) continue;
    const exited = new Promise((resolve) => child.once('exit', resolve));
    child.kill('SIGTERM');
    await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
  }
  const admin = new Client({ connectionString: state.clusterUrl.replace(/\/[^/]+$/, '/postgres') });
  await admin.connect();
  await admin.query(`DROP DATABASE IF EXISTS ${state.databaseName} WITH (FORCE)`);
  await admin.end();
  fs.rmSync(state.stateDir, { recursive: true, force: true });
  state.cluster?.stop();
}
