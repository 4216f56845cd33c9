import fs from 'node:fs';
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  PutObjectCommand,
  S3Client,
  S3ServiceException,
} from '@aws-sdk/client-s3';
import { assertBlobKey, blobKeyFor, sha256Hex, type BlobStore } from './blob-store';

export type S3BlobStoreOptions = {
  bucket: string;
  /** An S3-compatible endpoint (the local fake, or a non-AWS provider); unset means AWS itself. */
  endpoint?: string;
  region?: string;
  /** Prepended to every key, so one bucket can hold more than clips. */
  prefix?: string;
  credentials?: { accessKeyId: string; secretAccessKey: string };
  forcePathStyle?: boolean;
};

const missing = (error: unknown) =>
  error instanceof S3ServiceException &&
  (error.name === 'NoSuchKey' || error.name === 'NotFound' || error.$metadata.httpStatusCode === 404);

/** Clip bytes in S3-compatible object storage, under the same content-addressed keys as on local disk. */
export class S3BlobStore implements BlobStore {
  readonly client: S3Client;
  private readonly bucket: string;
  private readonly prefix: string;

  constructor(options: S3BlobStoreOptions) {
    this.bucket = options.bucket;
    this.prefix = options.prefix ?? '';
    this.client = new S3Client({
      endpoint: options.endpoint,
      region: options.region ?? 'us-east-1',
      forcePathStyle: options.forcePathStyle ?? Boolean(options.endpoint),
      credentials: options.credentials,
      // Checksums only where S3 demands them: S3-compatible stores (and the fake) do not all know the newer ones.
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
    });
  }

  private objectKey(storageKey: string): string {
    assertBlobKey(storageKey);
    return `${this.prefix}${storageKey}`;
  }

  async put(bytes: Uint8Array) {
    const sha256 = sha256Hex(bytes);
    const storageKey = blobKeyFor(sha256);
    // Content-addressed: an object already under the key holds these very bytes, so it is left alone.
    if (!(await this.has(storageKey))) {
      await this.client.send(
        new PutObjectCommand({
          Bucket: this.bucket,
          Key: this.objectKey(storageKey),
          Body: bytes,
          ContentType: 'application/octet-stream',
          ContentLength: bytes.byteLength,
          Metadata: { sha256 },
        }),
      );
    }
    return { sha256, storageKey, sizeBytes: bytes.byteLength };
  }

  async putFile(file: string, sha256: string, sizeBytes: number) {
    const storageKey = blobKeyFor(sha256);
    if (!(await this.has(storageKey))) {
      await this.client.send(
        new PutObjectCommand({
          Bucket: this.bucket,
          Key: this.objectKey(storageKey),
          Body: fs.createReadStream(file),
          ContentType: 'application/octet-stream',
          ContentLength: sizeBytes,
          Metadata: { sha256 },
        }),
      );
    }
    return { sha256, storageKey, sizeBytes };
  }

  async get(storageKey: string) {
    try {
      const answer = await this.client.send(
        new GetObjectCommand({ Bucket: this.bucket, Key: this.objectKey(storageKey) }),
      );
      if (!answer.Body) return null;
      return Buffer.from(await answer.Body.transformToByteArray());
    } catch (error) {
      if (missing(error)) return null;
      throw error;
    }
  }

  async has(storageKey: string) {
    try {
      await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: this.objectKey(storageKey) }));
      return true;
    } catch (error) {
      if (missing(error)) return false;
      throw error;
    }
  }

  async delete(storageKey: string) {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: this.objectKey(storageKey) }));
  }
}
