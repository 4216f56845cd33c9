import { randomBytes } from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';
import S3rver from 's3rver';
import AWSAccount from 's3rver/lib/models/account';

/** s3rver's own key pair, published in its README and code: refused here, like any other published key. */
const PUBLISHED_ACCESS_KEY_ID = 'S3RVER';

/** A local stand-in for S3 (s3rver) on loopback, with the given buckets made at start. Port 0 picks a free one. */
export async function startS3Fake(options: { port: number; directory: string; buckets: string[] }) {
  const credentials = {
    accessKeyId: randomBytes(10).toString('hex').toUpperCase(),
    secretAccessKey: randomBytes(30).toString('base64url'),
  };
  AWSAccount.DUMMY_ACCOUNT.revokeAccessKey(PUBLISHED_ACCESS_KEY_ID);
  AWSAccount.DUMMY_ACCOUNT.createKeyPair(credentials.accessKeyId, credentials.secretAccessKey);
  const fake = new S3rver({
    address: '127.0.0.1',
    port: options.port,
    directory: options.directory,
    silent: true,
    configureBuckets: options.buckets.map((name) => ({ name })),
  });
  // Before s3rver's router (the last middleware), which has no ListParts or AbortMultipartUpload.
  const { middleware } = fake as unknown as { middleware: Middleware[] };
  middleware.splice(middleware.length - 1, 0, multipartListing(fake, credentials.accessKeyId));
  const address = await fake.run();
  return {
    endpoint: `http://127.0.0.1:${address.port}`,
    port: address.port,
    credentials,
    close: () => fake.close(),
  };
}

// The parts of Koa's context (s3rver is a Koa app) this uses; koa's own types are not among the packages.
type Context = {
  method: string;
  path: string;
  query: Record<string, string | string[] | undefined>;
  headers: Record<string, string | string[] | undefined>;
  status: number;
  type: string;
  body: unknown;
};
type Next = () => Promise<unknown>;
type Middleware = (ctx: Context, next: Next) => Promise<unknown>;

/**
 * The two multipart calls @tus/s3-store needs and s3rver lacks: ListParts (GET ?uploadId=) and
 * AbortMultipartUpload (DELETE ?uploadId=), answered from s3rver's own part files in the S3 API's XML. A request
 * must name this fake's access key; unlike s3rver's other calls its signature is not re-verified (a local fake).
 */
function multipartListing(fake: S3rver, accessKeyId: string) {
  const store = (
    fake as unknown as { store: { getResourcePath(b: string, k: undefined, r: string): string } }
  ).store;
  return async (ctx: Context, next: Next) => {
    const uploadId = ctx.query.uploadId;
    const match = /^\/([^/]+)\/(.+)$/.exec(ctx.path);
    const listing =
      ctx.method === 'GET' &&
      Object.keys(ctx.query).every((q) => ['uploadId', 'part-number-marker', 'x-id'].includes(q));
    const aborting = ctx.method === 'DELETE';
    if (typeof uploadId !== 'string' || !match || !(listing || aborting)) return next();
    if (!String(ctx.headers.authorization ?? '').includes(`Credential=${accessKeyId}/`)) {
      ctx.status = 403;
      ctx.type = 'application/xml';
      ctx.body = '<?xml version="1.0" encoding="UTF-8"?><Error><Code>AccessDenied</Code></Error>';
      return;
    }
    const [, bucket, key] = match;
    const dir = path.join(store.getResourcePath(bucket, undefined, 'uploads'), path.basename(uploadId));
    const names = await fs.readdir(dir).catch(() => null);
    ctx.type = 'application/xml';
    if (!names) {
      ctx.status = 404;
      ctx.body = `<?xml version="1.0" encoding="UTF-8"?><Error><Code>NoSuchUpload</Code><Message>The specified upload does not exist.</Message></Error>`;
      return;
    }
    if (aborting) {
      await fs.rm(dir, { recursive: true, force: true });
      ctx.status = 204;
      ctx.body = null;
      return;
    }
    const numbers = names
      .filter((n) => /^\d+$/.test(n))
      .map(Number)
      .sort((a, b) => a - b);
    const parts = await Promise.all(
      numbers.map(async (n) => {
        const stat = await fs.stat(path.join(dir, String(n)));
        const md5 = (await fs.readFile(path.join(dir, `${n}.md5`), 'utf8')).trim();
        return `<Part><PartNumber>${n}</PartNumber><LastModified>${stat.mtime.toISOString()}</LastModified><ETag>"${md5}"</ETag><Size>${stat.size}</Size></Part>`;
      }),
    );
    ctx.status = 200;
    ctx.body = `<?xml version="1.0" encoding="UTF-8"?><ListPartsResult xmlns="http://s3.amazonaws.com/doc/2006-03-01/"><Bucket>${bucket}</Bucket><Key>${key}</Key><UploadId>${uploadId}</UploadId><PartNumberMarker>0</PartNumberMarker><NextPartNumberMarker>${numbers.at(-1) ?? 0}</NextPartNumberMarker><MaxParts>1000</MaxParts><IsTruncated>false</IsTruncated>${parts.join('')}</ListPartsResult>`;
  };
}
