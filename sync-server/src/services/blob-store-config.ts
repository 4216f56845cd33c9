import { s3Credentials } from '../config/secrets';
import { LocalDiskBlobStore, type BlobStore } from './blob-store';
import { S3BlobStore } from './blob-store-s3';

/**
 * The blob store the configuration asks for. BLOB_STORE=local (the default) keeps clips under `localDir`;
 * BLOB_STORE=s3 needs S3_BUCKET and takes S3_ENDPOINT, S3_REGION, S3_PREFIX, S3_FORCE_PATH_STYLE and
 * S3_ACCESS_KEY_ID with S3_SECRET_ACCESS_KEY (without them the SDK's usual credential chain applies).
 */
export function blobStoreFromEnv(
  env: Readonly<Record<string, string | undefined>>,
  localDir: string,
): BlobStore {
  const kind = (env.BLOB_STORE ?? 'local').trim().toLowerCase();
  if (kind === 'local') return new LocalDiskBlobStore(localDir);
  if (kind !== 's3') throw new Error(`BLOB_STORE must be "local" or "s3", not "${env.BLOB_STORE}".`);
  const bucket = env.S3_BUCKET?.trim();
  if (!bucket) throw new Error('BLOB_STORE=s3 needs S3_BUCKET (the bucket that keeps the clips).');
  const credentials = s3Credentials(env);
  return new S3BlobStore({
    bucket,
    endpoint: env.S3_ENDPOINT || undefined,
    region: env.S3_REGION || undefined,
    prefix: env.S3_PREFIX || undefined,
    forcePathStyle: env.S3_FORCE_PATH_STYLE ? env.S3_FORCE_PATH_STYLE === 'true' : undefined,
    credentials: credentials && { accessKeyId: credentials.user, secretAccessKey: credentials.password },
  });
}
