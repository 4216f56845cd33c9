// The one place the server's parts are built from its configuration (config/settings.ts): the blob store, the
// clinic keys, mail, payments, the clip worker, resumable uploads and the job queue (main.ts builds the database
// handle and the app from the same configuration). Routes, use cases and jobs
// reach them through `services()` (and `syncServicesFor(sequelize)` for the parts that need the database), so
// every path (receive, review, export, erasure) sees the same blob store. Tests replace parts with
// `replaceServices` / `provideSyncServices`.
import type { Sequelize } from 'sequelize';
import { openClip } from '@/shared/seal';
import { loadConfig, type Config } from './config/settings';
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
}

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

export function composeServices(config: Config): Services {
  const clinicKeys = new ClinicKeyStore(config.secrets.clinicKeysDir);
  const payments = paymentsServiceFrom(config);
  return {
    config,
    blobStore: blobStoreFrom(config),
    clinicKeys,
    mail: mailServiceFrom(config),
    payments,
    registerWebhook: payments.usesFake,
    publicBaseUrl: config.PUBLIC_BASE_URL,
    mailboxUrl: config.MAIL_FAKE_HTTP_PORT ? `http://127.0.0.1:${config.MAIL_FAKE_HTTP_PORT}` : null,
    openClip: async (clinicId, sealed) => openClip(sealed, clinicKeys.privateKey(clinicId)),
    clipWorker: clipWorker(),
  };
}

let current: Services | undefined;

/** The process's services, composed from the configuration on first use (main.ts composes them at start). */
export function services(): Services {
  current ??= composeServices(loadConfig());
  return current;
}

/** Starts the process with these services (main.ts), or replaces some of them (tests). */
export function replaceServices(replacement: Partial<Services>): Services {
  current = { ...services(), ...replacement };
  return current;
}

export interface SyncServices {
  blobStore: BlobStore;
  clinicKeys: ClinicKeyStore;
  uploads: ClipUploads;
}

const bySequelize = new WeakMap<Sequelize, SyncServices>();

/** The upload side, one per database connection: uploads in progress are locked in that database. */
export function syncServicesFor(sequelize: Sequelize): SyncServices {
  return bySequelize.get(sequelize) ?? provideSyncServices(sequelize, {});
}

/** Builds the upload side for this database; tests pass their own blob store, keys, folder or staging. */
export function provideSyncServices(
  sequelize: Sequelize,
  options: {
    blobStore?: BlobStore;
    clinicKeysDir?: string;
    /** A folder for uploads in progress (folder staging), or `staging` itself. */
    uploadDir?: string;
    staging?: UploadStaging;
    afterLastByte?: TusHooks['afterLastByte'];
  },
): SyncServices {
  const shared = services();
  const blobStore = options.blobStore ?? shared.blobStore;
  const clinicKeys = options.clinicKeysDir ? new ClinicKeyStore(options.clinicKeysDir) : shared.clinicKeys;
  const staging =
    options.staging ??
    (options.uploadDir ? folderStaging(options.uploadDir) : uploadStagingFrom(shared.config));
  const uploads = createClipUploads(
    staging,
    {
      onComplete: async (clinicId, sha256, stagedFile) => {
        await receiveClip(
          { sequelize, blobStore, clinicKeys, clipWorker: shared.clipWorker },
          clinicId,
          sha256,
          stagedFile,
        );
      },
      storedSize: (clinicId, sha256) => new SyncRepository(sequelize).storedClipSize(clinicId, sha256),
      afterLastByte: options.afterLastByte,
    },
    // Every instance on this database may serve any request of an upload: the locks live in PostgreSQL.
    { locker: new PgUploadLocker(sequelize) },
  );
  const built = { blobStore, clinicKeys, uploads };
  bySequelize.set(sequelize, built);
  return built;
}

// A key no clip can have (the sha256 of nothing is never a sealed clip): asking for it reaches the store and
// answers "not there" when the store is up, and throws when it is not.
const STORAGE_PROBE_KEY = blobKeyFor('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');

const readinessBySequelize = new WeakMap<Sequelize, ReadinessProbe>();

/**
 * The readiness probe of this database handle and its blob store (services/readiness-probe.ts): one per process
 * in main.ts, on a connection of its own to the same database.
 */
export function readinessProbeFor(sequelize: Sequelize): ReadinessProbe {
  let probe = readinessBySequelize.get(sequelize);
  if (!probe) {
    const { host, port, database, username, password } = sequelize.config;
    probe = new ReadinessProbe(
      {
        host,
        port: port ? Number(port) : undefined,
        database,
        user: username,
        password: password ?? undefined,
      },
      () => syncServicesFor(sequelize).blobStore.has(STORAGE_PROBE_KEY),
    );
    readinessBySequelize.set(sequelize, probe);
  }
  return probe;
}

/**
 * The background jobs on this database (job-queue.ts), started by main.ts. Each is asked for once at start, as a
 * new instance may follow a crash (staged uploads) or a long stop; the queues keep that to one waiting run per job
 * however many instances start together.
 */
export async function startBackgroundWork(
  sequelize: Sequelize,
  config: Config,
  onError: (job: string, error: unknown) => void,
): Promise<JobQueue> {
  const jobs = backgroundJobs(sequelize, config.secrets.jwtSecret);
  const queue = await startJobQueue(config.DATABASE_URL!, jobs, { pollMs: config.JOB_POLL_MS, onError });
  for (const job of jobs) await queue.runSoon(job.name);
  return queue;
}
