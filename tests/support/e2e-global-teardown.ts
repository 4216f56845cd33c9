import type { ChildProcess } from 'node:child_process';

type E2eGlobals = { __fourpointE2e?: { server: ChildProcess; fakes?: ChildProcess; cluster?: { stop: () => void } } };

export default async function globalTeardown(): Promise<void> {
  const state = (globalThis as E2eGlobals).__fourpointE2e;
  if (!state) return;
  for (const child of [state.server, state.fakes]) {
    if (!child || child.exitCode !== null) continue;
    const exited = new Promise((resolve) => child.once('exit', resolve));
    child.kill('SIGTERM');
    await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
  }
  state.cluster?.stop();
}
