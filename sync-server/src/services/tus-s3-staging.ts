// Uploads in progress in object storage (BLOB_STORE=s3), so an upload started through one instance resumes through
// any other, on any machine. @tus/s3-store keeps each upload as a multipart upload plus `<id>.info` (and
// `<id>.part` for a piece smaller than a part); a complete upload is the object `<id>`, copied to a temporary
// file for processing and then deleted with its bookkeeping.
import { createWriteStream } from 'node:fs';
import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import type { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { DeleteObjectsCommand, ListObjectsV2Command, S3, type S3ClientConfig } from '@aws-sdk/client-s3';
import { S3Store, type MetadataValue } from '@tus/s3-store';
import type { KvStore } from '@tus/server';
import type { UploadStaging } from './tus-uploads';

/**
 * No cache of upload bookkeeping in the process: another instance may have advanced or finished the upload, so
 * every request reads `<id>.info` from the bucket (s3-store's default keeps it in this process's memory).
 */
const noCache: KvStore<MetadataValue> = {
  get: async () => undefined,
  set: async () => undefined,
  delete: async () => undefined,
  list: async () => [],
};

export function s3Staging(options: { bucket: string; client: S3ClientConfig }): UploadStaging {
  const config = { ...options.client, bucket: options.bucket };
  const client = new S3(options.client);
  const datastore = new S3Store({
    // The smallest part S3 accepts: a clip is a few megabytes, and smaller parts resume with less resent.
    partSize: 5 * 1024 * 1024,
    // Expiry tags need the provider's lifecycle rules (and the fake has no tagging); abandoned uploads are
    // removed by the bucket's own lifecycle rule for incomplete multipart uploads.
    useTags: false,
    cache: noCache,
    s3ClientConfig: config,
  });
  return {
    datastore,
    async localCopy(uploadId) {
      const dir = await fs.mkdtemp(path.join(os.tmpdir(), 'fourpoint-upload-'));
      const file = path.join(dir, 'clip');
      const body = await datastore.read(uploadId);
      await pipeline(body as Readable, createWriteStream(file));
      return { file, release: () => fs.rm(dir, { recursive: true, force: true }) };
    },
    async remove(uploadId) {
      // Not s3-store's remove(): it first aborts the multipart upload, which a complete upload no longer has.
      await client.send(
        new DeleteObjectsCommand({
          Bucket: options.bucket,
          Delete: {
            Objects: [uploadId, `${uploadId}.info`, `${uploadId}.part`].map((Key) => ({ Key })),
            Quiet: true,
          },
        }),
      );
    },
    async list() {
      const ids: string[] = [];
      let token: string | undefined;
      do {
        const page = await client.send(
          new ListObjectsV2Command({ Bucket: options.bucket, ContinuationToken: token }),
        );
        for (const object of page.Contents ?? [])
          if (object.Key?.endsWith('.info')) ids.push(object.Key.slice(0, -'.info'.length));
        token = page.NextContinuationToken;
      } while (token);
      return ids;
    },
  };
}
