// The push the sync bench sends, and the raw PostgreSQL writes it is measured against. The push is what a phone
// sends when an operator finishes a four-site session for a new client (hooks/local-store/finish-session.ts):
// the client, their consent, the session and four site recordings, each recording naming its sealed clip's
// hash (the clip itself follows by tus). The raw writes are the same seven rows, column for column, as plain
// INSERTs in one transaction per session: what the database costs with no server in front of it.
import { randomBytes, randomUUID } from 'node:crypto';
import http from 'node:http';
import type { Sequelize } from 'sequelize';
import { SYNC_PROTOCOL_VERSION, type Mutation, type PushRequest } from '@/shared/protocol/sync';

export const SITES = ['mitral', 'tricuspid', 'aortic', 'pulmonic'] as const;

const clientFields = {
  firstName: 'Bench',
  lastName: 'Client',
  dateOfBirth: '1990-04-12',
  email: 'bench.client@bench.fourpoint.test',
  phone: '+44 20 7946 0000',
  notes: null,
};
const sessionFields = {
  status: 'completed',
  startedAt: '2026-11-30T09:00:00.000Z',
  finishedAt: '2026-11-30T09:12:00.000Z',
  findings: null,
  plan: null,
  followUpDate: null,
};
const siteFields = {
  qualityVerdict: 'good',
  durationS: 15,
  recordedAt: '2026-11-30T09:03:00.000Z',
  skippedReason: null,
  keepAnywayNote: null,
};

/** One finished session as the phone pushes it: seven mutations. */
export function sessionPush(deviceId: string, consentTextId: string): PushRequest {
  const clientId = randomUUID();
  const sessionId = randomUUID();
  const m = (entity: Mutation['entity'], id: string, change: Record<string, unknown>): Mutation => ({
    mutationId: randomUUID(),
    entity,
    id,
    baseVersion: 0,
    change,
  });
  return {
    protocolVersion: SYNC_PROTOCOL_VERSION,
    deviceId,
    mutations: [
      m('clients', clientId, clientFields),
      m('consents', randomUUID(), {
        clientId,
        consentTextId,
        consentTextVersion: 1,
        typedName: 'Bench Client',
        consentDate: '2026-11-30',
      }),
      m('recording_sessions', sessionId, { clientId, ...sessionFields }),
      ...SITES.map((site) =>
        m('site_recordings', randomUUID(), {
          sessionId,
          site,
          clipSha256: randomBytes(32).toString('hex'),
          ...siteFields,
        }),
      ),
    ],
  };
}

/** The same seven rows as plain INSERTs (one statement a row, one transaction a session); its latency in ms. */
export async function rawSession(
  sequelize: Sequelize,
  clinicId: string,
  consentTextId: string,
  operatorId: string,
): Promise<number> {
  const t0 = performance.now();
  await sequelize.transaction(async (transaction) => {
    const insert = (sql: string, replacements: Record<string, unknown>) =>
      sequelize.query(sql, { replacements: { clinicId, ...replacements }, transaction });
    const clientId = randomUUID();
    const sessionId = randomUUID();
    await insert(
      `INSERT INTO clients (id, clinic_id, first_name, last_name, date_of_birth, email, phone, notes)
       VALUES (:id, :clinicId, :firstName, :lastName, :dateOfBirth, :email, :phone, :notes)`,
      { id: clientId, ...clientFields },
    );
    await insert(
      `INSERT INTO consents (id, clinic_id, client_id, consent_text_id, consent_text_version, typed_name, consent_date, recorded_by)
       VALUES (:id, :clinicId, :clientId, :consentTextId, 1, 'Bench Client', '2026-11-30', :operatorId)`,
      { id: randomUUID(), clientId, consentTextId, operatorId },
    );
    await insert(
      `INSERT INTO recording_sessions (id, clinic_id, client_id, operator_id, status, started_at, finished_at, findings, plan, follow_up_date)
       VALUES (:id, :clinicId, :clientId, :operatorId, :status, :startedAt, :finishedAt, :findings, :plan, :followUpDate)`,
      { id: sessionId, clientId, operatorId, ...sessionFields },
    );
    for (const site of SITES) {
      await insert(
        `INSERT INTO site_recordings (id, clinic_id, session_id, site, quality_verdict, clip_sha256, clip_state, duration_s, recorded_at, skipped_reason, keep_anyway_note)
         VALUES (:id, :clinicId, :sessionId, :site, :qualityVerdict, :clipSha256, 'pending', :durationS, :recordedAt, :skippedReason, :keepAnywayNote)`,
        { id: randomUUID(), sessionId, site, clipSha256: randomBytes(32).toString('hex'), ...siteFields },
      );
    }
  });
  return performance.now() - t0;
}

export const percentile = (sorted: number[], p: number) =>
  sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];

export interface Figures {
  p50: number;
  p95: number;
  /** Sessions (or requests) per second over the whole run. */
  rate: number;
}

export function figures(latencies: number[], seconds: number): Figures {
  const sorted = [...latencies].sort((a, b) => a - b);
  return { p50: percentile(sorted, 50), p95: percentile(sorted, 95), rate: latencies.length / seconds };
}

/** `workers` at once, each running `rounds` sessions one after another, as the devices do. */
export async function rawSessions(
  sequelize: Sequelize,
  ids: { clinicId: string; consentTextId: string; operatorId: string },
  workers: number,
  rounds: number,
): Promise<Figures> {
  const latencies: number[] = [];
  const start = performance.now();
  await Promise.all(
    Array.from({ length: workers }, async () => {
      for (let i = 0; i < rounds; i++)
        latencies.push(await rawSession(sequelize, ids.clinicId, ids.consentTextId, ids.operatorId));
    }),
  );
  return figures(latencies, (performance.now() - start) / 1000);
}

export type LoadJob = {
  url: string;
  token: string;
  consentTextId: string;
  devices: number;
  rounds: number;
  kind: 'push' | 'health' | 'pull';
};
export type LoadResult = {
  latencies: number[];
  seconds: number;
  notApplied: number;
  /** Requests per X-Fourpoint-Instance, to show how a balancer spread them. */
  instances: Record<string, number>;
};

function post(
  agent: http.Agent,
  url: URL,
  path: string,
  token: string,
  body: unknown,
): Promise<{ status: number; body: string; instance: string }> {
  const payload = JSON.stringify(body);
  return new Promise((resolve, reject) => {
    const req = http.request(
      {
        host: url.hostname,
        port: url.port,
        path,
        method: body === undefined ? 'GET' : 'POST',
        agent,
        headers: {
          authorization: `Bearer ${token}`,
          'content-type': 'application/json',
          'content-length': body === undefined ? 0 : Buffer.byteLength(payload),
        },
      },
      (res) => {
        let text = '';
        res.setEncoding('utf8');
        res.on('data', (chunk: string) => (text += chunk));
        res.on('end', () =>
          resolve({
            status: res.statusCode ?? 0,
            body: text,
            instance: String(res.headers['x-fourpoint-instance'] ?? 'unnamed'),
          }),
        );
      },
    );
    req.on('error', reject);
    req.end(body === undefined ? undefined : payload);
  });
}

/**
 * The simulated devices: `devices` at once, each sending `rounds` requests one after another. Plain node:http
 * with a keep-alive agent: on this machine the devices share the server's two cores, so they use as little of
 * them as a device can.
 */
export async function runLoad(job: LoadJob): Promise<LoadResult> {
  const agent = new http.Agent({ keepAlive: true, maxSockets: 64 });
  const url = new URL(job.url);
  const latencies: number[] = [];
  const instances: Record<string, number> = {};
  let notApplied = 0;
  const start = performance.now();
  await Promise.all(
    Array.from({ length: job.devices }, async () => {
      const deviceId = randomUUID();
      for (let i = 0; i < job.rounds; i++) {
        const body =
          job.kind === 'push'
            ? sessionPush(deviceId, job.consentTextId)
            : job.kind === 'pull'
              ? {
                  protocolVersion: SYNC_PROTOCOL_VERSION,
                  deviceId,
                  checkpoint: '9223372036854775806',
                  limit: 1,
                }
              : undefined;
        const path = { push: '/api/sync/push', pull: '/api/sync/pull', health: '/api/health' }[job.kind];
        const t0 = performance.now();
        const res = await post(agent, url, path, job.token, body);
        latencies.push(performance.now() - t0);
        instances[res.instance] = (instances[res.instance] ?? 0) + 1;
        if (res.status !== 200) throw new Error(`${path} answered ${res.status}: ${res.body.slice(0, 300)}`);
        if (job.kind === 'push') {
          const { results } = JSON.parse(res.body) as { results: { status: string }[] };
          if (results.some((r) => r.status !== 'applied')) notApplied += 1;
        }
      }
    }),
  );
  agent.destroy();
  return { latencies, seconds: (performance.now() - start) / 1000, notApplied, instances };
}
