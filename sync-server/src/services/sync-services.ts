import path from 'node:path';
import type { Sequelize } from 'sequelize';
import { readSecrets } from '../config/secrets';
import { receiveClip } from '../use-cases/sync/clips';
import type { BlobStore } from './blob-store';
import { blobStoreFromEnv } from './blob-store-config';
import { ClinicKeyStore } from './clinic-keys';
import { clipWorker } from './clip-worker';
import { SyncRepository } from '../repositories/sync-repository';
import { createClipUploads, type ClipUploads, type TusHooks } from './tus-uploads';
import { PgUploadLocker } from './upload-locks';

export interface SyncServices {
  blobStore: BlobStore;
  clinicKeys: ClinicKeyStore;
  uploadDir: string;
  uploads: ClipUploads;
}

const REPO_ROOT = path.resolve(__dirname, '../../..');
const bySequelize = new WeakMap<Sequelize, SyncServices>();

/**
 * The sync routes' services, one set per database connection. Configuration: CLINIC_KEYS_DIR (private keys),
 * BLOB_STORE with BLOB_DIR or S3_* (kept clips, see blob-store-config.ts), UPLOAD_DIR (uploads in progress);
 * folders default under .data/.
 */
export function syncServicesFor(sequelize: Sequelize): SyncServices {
  const existing = bySequelize.get(sequelize);
  if (existing) return existing;
  return provideSyncServices(sequelize, {});
}

export function provideSyncServices(
  sequelize: Sequelize,
  options: {
    blobStore?: BlobStore;
    clinicKeysDir?: string;
    uploadDir?: string;
    afterLastByte?: TusHooks['afterLastByte'];
  },
): SyncServices {
  const data = path.join(REPO_ROOT, '.data');
  const blobStore =
    options.blobStore ?? blobStoreFromEnv(process.env, process.env.BLOB_DIR ?? path.join(data, 'blobs'));
  const clinicKeys = new ClinicKeyStore(options.clinicKeysDir ?? readSecrets().clinicKeysDir);
  const uploadDir = options.uploadDir ?? process.env.UPLOAD_DIR ?? path.join(data, 'uploads');
  const uploads = createClipUploads(
    uploadDir,
    {
      onComplete: async (clinicId, sha256, stagedFile) => {
        await receiveClip(
          { sequelize, blobStore, clinicKeys, clipWorker: clipWorker() },
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
  const services = { blobStore, clinicKeys, uploadDir, uploads };
  bySequelize.set(sequelize, services);
  return services;
}
