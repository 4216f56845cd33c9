import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { decodeWav } from '@/shared/analysis';
import { analyseDemoClip } from '@/sync-server/seeders/analyse-demo-clip';
import { assertAcceptablePassword } from '@/sync-server/src/services/password-policy';
import { DEMO_CLINIC_ID, DEMO_USERS, seedDemo } from '@/sync-server/seeders/demo';
import { selectRows } from '@/sync-server/src/repositories/sql';
import { demoId } from '@/sync-server/seeders/demo';
import { LocalDiskBlobStore, sha256Hex } from '@/sync-server/src/services/blob-store';
import { demoPassword } from '@/sync-server/src/config/secrets';
import { makeTestContext } from './helpers/test-app';

// The demo clinic has fixed ids by design, so this file shares it with any other run; it only reads and re-seeds.
const ctx = makeTestContext();
const blobDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-demo-blobs-'));
const blobStore = new LocalDiskBlobStore(blobDir);
// This run's own (tests/support/server-global-setup.ts); demo users seeded by an earlier run get it too.
const password = demoPassword();
jest.setTimeout(120_000);

const counts = async () =>
  (
    await selectRows<Record<'users' | 'clients' | 'consents' | 'sessions' | 'sites', number>>(
      ctx.sequelize,
      `SELECT (SELECT count(*)::int FROM users WHERE clinic_id = :clinicId) AS users,
         (SELECT count(*)::int FROM clients WHERE clinic_id = :clinicId) AS clients,
         (SELECT count(*)::int FROM consents WHERE clinic_id = :clinicId) AS consents,
         (SELECT count(*)::int FROM recording_sessions WHERE clinic_id = :clinicId) AS sessions,
         (SELECT count(*)::int FROM site_recordings WHERE clinic_id = :clinicId) AS sites`,
      { clinicId: DEMO_CLINIC_ID },
    )
  )[0]!;

beforeAll(async () => {
  await seedDemo({ sequelize: ctx.sequelize, blobStore, password, analyse: analyseDemoClip });
});
afterAll(() => ctx.close());

describe('demo seed', () => {
  test('when the demo is loaded, then the admin has one conflict to settle, made by the real push, and seeding again adds none', async () => {
    const ofPendleford = () =>
      selectRows<{ client_version: unknown }>(
        ctx.sequelize,
        `SELECT client_version FROM sync_conflicts WHERE clinic_id = :clinicId AND row_id = :rowId`,
        { clinicId: DEMO_CLINIC_ID, rowId: demoId('client/saoirse-pendleford') },
      );
    const before = await ofPendleford();
    expect(before).toHaveLength(1);
    expect(before[0]!.client_version).toMatchObject({ change: { phone: '555 0138' } });
    await seedDemo({ sequelize: ctx.sequelize, blobStore, password, analyse: analyseDemoClip });
    expect(await ofPendleford()).toHaveLength(1);
  });

  test('when it runs again, then it adds no rows', async () => {
    const before = await counts();
    const again = await seedDemo({ sequelize: ctx.sequelize, blobStore, password, analyse: analyseDemoClip });
    expect(again.created).toBe(0);
    expect(await counts()).toEqual(before);
    expect(before.users).toBe(3);
    expect(before.sessions).toBeGreaterThanOrEqual(6);
    expect(before.sites).toBe(before.sessions * 4);
  });

  test('when two seeds run at the same time, then both finish and nothing is doubled', async () => {
    const before = await counts();
    await Promise.all(
      [1, 2].map(() => seedDemo({ sequelize: ctx.sequelize, blobStore, password, analyse: analyseDemoClip })),
    );
    expect(await counts()).toEqual(before);
  });

  test.each(DEMO_USERS.map((u) => [u.email] as const))(
    'when the demo password is checked against the rule for new passwords for %s, then it passes',
    (email) => {
      expect(() => assertAcceptablePassword(password, email)).not.toThrow();
    },
  );

  test.each(DEMO_USERS.map((u) => [u.email, u.role] as const))(
    'when %s signs in with the demo password, then they get the %s role',
    async (email, role) => {
      const res = await request(ctx.app).post('/api/auth/sign-in').send({ email, password });
      expect(res.status).toBe(200);
      expect(res.body.user).toMatchObject({ role, clinicId: DEMO_CLINIC_ID });
    },
  );

  test('when a seeded clip is read back, then its bytes match their hash and form a 4000 Hz mono WAV of about 15 s', async () => {
    const [blob] = await selectRows<{
      sha256: string;
      state: string;
      content_type: string;
      clinic_id: string;
      storage_key: string;
      size_bytes: string;
    }>(
      ctx.sequelize,
      `SELECT b.sha256, b.state, b.content_type, b.clinic_id, b.storage_key, b.size_bytes
       FROM site_recordings r JOIN clip_blobs b ON b.sha256 = r.clip_sha256
       WHERE r.clinic_id = :clinicId AND r.clip_state = 'stored' AND r.deleted_at IS NULL LIMIT 1`,
      { clinicId: DEMO_CLINIC_ID },
    );
    expect(blob).toMatchObject({ state: 'stored', content_type: 'audio/wav', clinic_id: DEMO_CLINIC_ID });
    // The store may be another run's folder; re-seeding here wrote the same content-addressed files.
    const bytes = await blobStore.get(blob!.storage_key);
    expect(bytes).not.toBeNull();
    expect(sha256Hex(bytes!)).toBe(blob!.sha256);
    expect(Number(blob!.size_bytes)).toBe(bytes!.length);
    const wav = decodeWav(new Uint8Array(bytes!));
    expect(wav.sampleRate).toBe(4000);
    expect(wav.channels).toBe(1);
    expect(wav.samples.length / wav.sampleRate).toBeCloseTo(15, 1);
  });

  test('when the seed has run, then every stored clip has the analysis of record and its verdict, and skipped sites a reason', async () => {
    const sites = await selectRows<{
      clip_state: string;
      analysis: unknown;
      quality_verdict: string | null;
      skipped_reason: string | null;
    }>(
      ctx.sequelize,
      `SELECT clip_state, analysis, quality_verdict, skipped_reason FROM site_recordings
       WHERE clinic_id = :clinicId AND deleted_at IS NULL`,
      { clinicId: DEMO_CLINIC_ID },
    );
    expect(sites.length).toBeGreaterThan(0);
    for (const s of sites) {
      if (s.clip_state === 'stored') {
        expect(s.analysis).toMatchObject({ quality: { verdict: s.quality_verdict } });
      } else {
        expect(s.skipped_reason).toEqual(expect.any(String));
      }
    }
  });
});
