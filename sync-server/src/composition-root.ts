// The one place the server's parts are built from its configuration (config/settings.ts): the blob store, the
// clinic keys, mail, payments, the clip worker, resumable uploads, the readiness probe and the job queue. main.ts
// builds them once (with the database handle) and hands them to the app (AppDeps.services, which routes pass to
// use cases as UseCaseDeps.services) and to the background jobs, so every path (receive, review, export,
// erasure) sees the same blob store. Nothing looks them up: a part that is not handed in is not reachable.
// Tests build their own with composeServices(config, sequelize, choices) (tests/server/helpers/test-app.ts).
import type { Sequelize } from 'sequelize';
import { openClip } from '@/shared/seal';
import type { Config } from './config/settings';
import { backgroundJobs } from './jobs/background-jobs';
import { startJobQueue, type JobQueue } from './jobs/job-queue';
import { SyncRepository } from './repositories/sync-repository';
import { LocalDiskBlobStore, type BlobStore } from './services/blob-store';
import { S3BlobStore } from './services/blob-store-s3';
import { ClinicKeyStore } from './services/clinic-keys';
import { clipWorker, type ClipWorker } from './services/clip-worker';
import { mailServiceFrom, type MailService } from './services/mail';
import { paymentsServiceFrom, type PaymentsService } from './services/payments';
import { s3Staging } from './services/tus-s3-staging';
import {
  createClipUploads,
  folderStaging,
  type ClipUploads,
  type TusHooks,
  type UploadStaging,
} from './services/tus-uploads';
import { PgUploadLocker } from './services/upload-locks';
import { ReadinessProbe } from './services/readiness-probe';
import { blobKeyFor } from './services/blob-store';
import { receiveClip } from './use-cases/sync/clips';

/** Opens a sealed clip with the clinic's key. */
export type ClipOpener = (clinicId: string, sealed: Uint8Array) => Promise<Uint8Array>;

function s3Options(config: Config) {
  const credentials = config.s3Credentials;
  return {
    bucket: config.S3_BUCKET!,
    endpoint: config.S3_ENDPOINT,
    region: config.S3_REGION,
    prefix: config.S3_PREFIX,
    forcePathStyle: config.S3_FORCE_PATH_STYLE,
    credentials: credentials && { accessKeyId: credentials.user, secretAccessKey: credentials.password },
  };
}

/** The blob store the configuration asks for: BLOB_STORE=local keeps clips under BLOB_DIR, s3 in S3_BUCKET. */
export function blobStoreFrom(config: Config): BlobStore {
  if (config.BLOB_STORE === 'local') return new LocalDiskBlobStore(config.BLOB_DIR);
  return new S3BlobStore(s3Options(config));
}

/**
 * Where uploads in progress live: with BLOB_STORE=s3 in the same bucket (every instance on any machine sees
 * them), else in UPLOAD_DIR (one folder all instances share).
 */
export function uploadStagingFrom(config: Config): UploadStaging {
  if (config.BLOB_STORE === 'local') return folderStaging(config.UPLOAD_DIR);
  const { bucket, endpoint, region, forcePathStyle, credentials } = s3Options(config);
  return s3Staging({
    bucket,
    client: {
      endpoint,
      region: region ?? 'us-east-1',
      forcePathStyle: forcePathStyle ?? Boolean(endpoint),
      credentials,
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
    },
  });
}

export interface Services {
  config: Config;
  blobStore: BlobStore;
  clinicKeys: ClinicKeyStore;
  mail: MailService;
  payments: PaymentsService;
  /** Register our webhook URL with the provider on first use (the local fake needs it). */
  registerWebhook: boolean;
  /** Where links in e-mails point (invitations, payment pages); otherwise taken from the request. */
  publicBaseUrl?: string;
  /** The local mail fake's HTTP listing, for the admin mailbox page; null where a real relay is used. */
  mailboxUrl: string | null;
  openClip: ClipOpener | null;
  /** Opens and analyses received clips off the request thread (one per process). */
  clipWorker: ClipWorker;
  /** Resumable clip uploads (tus); uploads in progress are locked in this database, so any instance serves them. */
  uploads: ClipUploads;
  /** What /api/health/ready answers: the database (on a connection of its own) and the blob store. */
  readiness: ReadinessProbe;
}

/**
 * Parts a caller chooses itself (tests, benches): each one given replaces the one the configuration would build.
 * The uploads and the readiness probe are always built here, over the chosen blob store and keys.
 */
export interface ServiceChoices extends Partial<Omit<Services, 'config' | 'uploads' | 'readiness'>> {
  /** Where uploads in progress live; by default from the configuration (uploadStagingFrom). */
  staging?: UploadStaging;
  afterLastByte?: TusHooks['afterLastByte'];
}

// A key no clip can have (the sha256 of nothing is never a sealed clip): asking for it reaches the store and
// answers "not there" when the store is up, and throws when it is not.
const STORAGE_PROBE_KEY = blobKeyFor('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');

/** The readiness probe of this database (services/readiness-probe.ts), on a connection of its own. */
function readinessProbe(sequelize: Sequelize, storageAnswers: () => Promise<unknown>): ReadinessProbe {
  const { host, port, database, username, password } = sequelize.config;
  return new ReadinessProbe(
    {
      host,
      port: port ? Number(port) : undefined,
      database,
      user: username,
      password: password ?? undefined,
    },
    storageAnswers,
  );
}

/** Every part, built once over this database handle (main.ts; tests through makeTestContext). */
export function composeServices(
  config: Config,
  sequelize: Sequelize,
  choices: ServiceChoices = {},
): Services {
  const { staging, afterLastByte, ...given } = choices;
  // A part passed as undefined is not chosen: the configuration's stays.
  const chosen = Object.fromEntries(
    Object.entries(given).filter(([, part]) => part !== undefined),
  ) as typeof given;
  const clinicKeys = chosen.clinicKeys ?? new ClinicKeyStore(config.secrets.clinicKeysDir);
  const payments = chosen.payments ?? paymentsServiceFrom(config);
  // The uploads, the probe and openClip read their parts from `built` when they run, so a test that swaps a
  // part of its own context (Object.assign on ctx.services) is seen by all of them.
  const built: Services = {
    config,
    blobStore: chosen.blobStore ?? blobStoreFrom(config),
    clinicKeys,
    mail: chosen.mail ?? mailServiceFrom(config),
    payments,
    registerWebhook: 'usesFake' in payments && payments.usesFake === true,
    publicBaseUrl: config.PUBLIC_BASE_URL,
    mailboxUrl: config.MAIL_FAKE_HTTP_PORT ? `http://127.0.0.1:${config.MAIL_FAKE_HTTP_PORT}` : null,
    openClip: async (clinicId, sealed) => openClip(sealed, built.clinicKeys.privateKey(clinicId)),
    clipWorker: clipWorker(),
    ...chosen,
    uploads: createClipUploads(
      staging ?? uploadStagingFrom(config),
      {
        onComplete: async (clinicId, sha256, stagedFile) => {
          const { blobStore, clinicKeys: keys, clipWorker: worker } = built;
          await receiveClip(
            { sequelize, blobStore, clinicKeys: keys, clipWorker: worker },
            clinicId,
            sha256,
            stagedFile,
          );
        },
        storedSize: (clinicId, sha256) => new SyncRepository(sequelize).storedClipSize(clinicId, sha256),
        afterLastByte,
      },
      // Every instance on this database may serve any request of an upload: the locks live in PostgreSQL.
      { locker: new PgUploadLocker(sequelize) },
    ),
    readiness: readinessProbe(sequelize, () => built.blobStore.has(STORAGE_PROBE_KEY)),
  };
  return built;
}

/**
 * The background jobs on this database (job-queue.ts), started by main.ts. Each is asked for once at start, as a
 * new instance may follow a crash (staged uploads) or a long stop; the queues keep that to one waiting run per job
 * however many instances start together.
 */
export async function startBackgroundWork(
  sequelize: Sequelize,
  services: Services,
  onError: (job: string, error: unknown) => void,
): Promise<JobQueue> {
  const { config } = services;
  const jobs = backgroundJobs({ sequelize, jwtSecret: config.secrets.jwtSecret, services });
  const queue = await startJobQueue(config.DATABASE_URL!, jobs, { pollMs: config.JOB_POLL_MS, onError });
  for (const job of jobs) await queue.runSoon(job.name);
  return queue;
}
