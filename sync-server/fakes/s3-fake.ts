import S3rver from 's3rver';

export const S3_FAKE_CREDENTIALS = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' } as const;

/** A local stand-in for S3 (s3rver) on loopback, with the given buckets made at start. Port 0 picks a free one. */
export async function startS3Fake(options: { port: number; directory: string; buckets: string[] }) {
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
    credentials: S3_FAKE_CREDENTIALS,
    close: () => fake.close(),
  };
}
