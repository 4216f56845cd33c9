import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import axios from 'axios';
import {
  SYNC_PROTOCOL_VERSION,
  type Mutation,
  type PushResponse,
  type RowData,
  type SyncEntity,
} from '@/shared/protocol/sync';
import {
  MemorySyncStorage,
  SyncEngine,
  createHttpTransport,
  mutationItem,
  type SyncEngineOptions,
} from '@/shared/sync';
import { LocalDiskBlobStore, type BlobStore } from '@/sync-server/src/services/blob-store';
import type { Services } from '@/sync-server/src/composition-root';
import { ClinicKeyStore } from '@/sync-server/src/services/clinic-keys';
import { folderStaging } from '@/sync-server/src/services/tus-uploads';
import { makeClinic, makeTestContext, signIn, type TestClinic, type TestContext } from '../helpers/test-app';

export interface SyncTestServer {
  ctx: TestContext;
  services: Services;
  url: string;
  dataDir: string;
  /** keepData leaves the folders for a restarted server, as a killed process would. */
  close(keepData?: boolean): Promise<void>;
}

/** The real app on a loopback port with its own key, blob and upload folders. */
export async function startSyncServer(
  options: { dataDir?: string; jwtSecret?: string; port?: number; blobStore?: BlobStore } = {},
): Promise<SyncTestServer> {
  const dataDir = options.dataDir ?? fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-sync-'));
  const ctx = makeTestContext(options.jwtSecret ? { jwtSecret: options.jwtSecret } : {}, {
    services: {
      blobStore: options.blobStore ?? new LocalDiskBlobStore(path.join(dataDir, 'blobs')),
      clinicKeys: new ClinicKeyStore(path.join(dataDir, 'keys')),
      staging: folderStaging(path.join(dataDir, 'uploads')),
    },
  });
  if (options.jwtSecret) ctx.jwtSecret = options.jwtSecret;
  const { services } = ctx;
  const server = http.createServer(ctx.app);
  await new Promise<void>((resolve) => server.listen(options.port ?? 0, '127.0.0.1', resolve));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  return {
    ctx,
    services,
    url,
    dataDir,
    close: async (keepData = false) => {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await ctx.close();
      if (!keepData) fs.rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

/** A push as the phone sends it, answered as the server answers it (a refused push throws axios's error). */
export async function pushTo(
  server: SyncTestServer,
  token: string,
  mutations: Mutation[],
  deviceId: string = randomUUID(),
): Promise<PushResponse> {
  const res = await axios.post(
    `${server.url}/api/sync/push`,
    { protocolVersion: SYNC_PROTOCOL_VERSION, deviceId, mutations },
    { headers: { authorization: `Bearer ${token}` } },
  );
  return res.data as PushResponse;
}

/**
 * One sync server for the whole test file: started before its first test and closed after its last. Read
 * `server` inside tests (it exists once beforeAll has run); `push` sends a batch to it as the phone does.
 */
export function syncServerPerFile(): {
  readonly server: SyncTestServer;
  push: (token: string, mutations: Mutation[], deviceId?: string) => Promise<PushResponse>;
} {
  let started: SyncTestServer | undefined;
  beforeAll(async () => {
    started = await startSyncServer();
  });
  afterAll(() => started?.close());
  const file = {
    get server(): SyncTestServer {
      if (!started) throw new Error('The sync server starts in beforeAll: read it inside a test or hook.');
      return started;
    },
    push: (token: string, mutations: Mutation[], deviceId?: string) =>
      pushTo(file.server, token, mutations, deviceId),
  };
  return file;
}

/** One mutation with a fresh id; a new row unless `baseVersion` says which version it edits. */
export const mutation = (
  entity: Mutation['entity'],
  id: string,
  change: Record<string, unknown>,
  baseVersion = 0,
): Mutation => ({ mutationId: randomUUID(), entity, id, baseVersion, change });

let clock = Date.now();
const tick = () => ++clock;

/** A simulated device: the app's sync engine over in-memory storage, talking HTTP to the server. */
export class SimDevice {
  readonly deviceId = randomUUID();
  readonly storage = new MemorySyncStorage();
  readonly engine: SyncEngine;

  constructor(baseUrl: string, token: string, options: Partial<SyncEngineOptions> = {}) {
    this.engine = new SyncEngine({
      storage: this.storage,
      transport: createHttpTransport({ baseUrl, getAccessToken: () => token, timeoutMs: 10_000 }),
      deviceId: this.deviceId,
      onOnline: () => () => undefined,
      backoff: { baseMs: 20, maxMs: 200 },
      ...options,
    });
  }

  async create(entity: SyncEntity, fields: RowData, id: string = randomUUID()): Promise<string> {
    await this.storage.putOutboxItem(
      mutationItem({
        mutationId: randomUUID(),
        entity,
        rowId: id,
        baseVersion: 0,
        change: fields,
        now: tick(),
      }),
    );
    return id;
  }

  async edit(entity: SyncEntity, id: string, change: RowData): Promise<string> {
    const mutationId = randomUUID();
    const baseVersion = this.storage.baseVersionOf(entity, id);
    await this.storage.putOutboxItem(
      mutationItem({ mutationId, entity, rowId: id, baseVersion, change, now: tick() }),
    );
    return mutationId;
  }

  async remove(entity: SyncEntity, id: string): Promise<string> {
    return this.edit(entity, id, { deletedAt: new Date().toISOString() });
  }

  sync() {
    return this.engine.sync();
  }

  /** Sync until nothing is due, for tests whose transport drops calls at random. */
  async syncUntilSettled(maxRounds = 200): Promise<void> {
    for (let round = 0; round < maxRounds; round++) {
      const report = await this.engine.sync();
      const pending = (await this.storage.listOutbox()).filter(
        (i) => i.state === 'waiting' || i.state === 'sending',
      );
      if (pending.length === 0 && !report.error) return;
      const next = Math.min(...pending.map((i) => i.nextAttemptAt), Date.now());
      await new Promise((r) => setTimeout(r, Math.max(0, Math.min(250, next - Date.now()))));
    }
    throw new Error(`device ${this.deviceId} did not settle`);
  }
}

export async function clinicWithTokens(
  server: SyncTestServer,
  label: string,
): Promise<{ clinic: TestClinic; operator: string; admin: string }> {
  const clinic = await makeClinic(label);
  const operator = (await signIn(server.ctx.app, clinic.users.operator.email)).accessToken;
  const admin = (await signIn(server.ctx.app, clinic.users.admin.email)).accessToken;
  return { clinic, operator, admin };
}

export const clientFields = (tag: string): RowData => ({
  firstName: `Ada${tag}`,
  lastName: 'Testwood',
  dateOfBirth: '1980-04-02',
  email: null,
  phone: null,
  notes: null,
});

export const sessionFields = (clientId: string): RowData => ({
  clientId,
  status: 'completed',
  startedAt: '2026-11-30T09:00:00.000Z',
  finishedAt: '2026-11-30T09:12:00.000Z',
  findings: null,
  plan: null,
  followUpDate: null,
});

export const siteFields = (sessionId: string, site: string, clipSha256: string | null = null): RowData => ({
  sessionId,
  site,
  qualityVerdict: 'good',
  clipSha256,
  durationS: 15,
  recordedAt: '2026-11-30T09:03:00.000Z',
  skippedReason: null,
  keepAnywayNote: null,
});

export const SITES = ['mitral', 'tricuspid', 'aortic', 'pulmonic'] as const;
