import { randomBytes } from 'node:crypto';
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
  const address = await fake.run();
  return {
    endpoint: `http://127.0.0.1:${address.port}`,
    port: address.port,
    credentials,
    close: () => fake.close(),
  };
}
