import { createHash, randomUUID } from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';

export type StoredBlob = { sha256: string; storageKey: string; sizeBytes: number };

/** Content-addressed storage for clip bytes: local disk by default, S3-compatible storage by configuration. */
export interface BlobStore {
  /** Stores the bytes under their sha256 and returns the key; storing the same bytes again is a no-op. */
  put(bytes: Uint8Array): Promise<StoredBlob>;
  /**
   * Stores a file's bytes, streamed from disk, under the sha256 the caller already computed while checking them
   * (a received clip is hashed in the clip worker, so it is not read twice on the request thread).
   */
  putFile(file: string, sha256: string, sizeBytes: number): Promise<StoredBlob>;
  /** null when nothing is stored under the key. */
  get(storageKey: string): Promise<Buffer | null>;
  has(storageKey: string): Promise<boolean>;
  /** Removes the bytes for good (erasure); removing a missing key is not an error. */
  delete(storageKey: string): Promise<void>;
}

export const sha256Hex = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

/** Keys are `<first two hex digits>/<sha256>` in every store, so a database row's key works with either. */
export const blobKeyFor = (sha256: string) => `${sha256.slice(0, 2)}/${sha256}`;

export function assertBlobKey(storageKey: string): void {
  if (!/^[0-9a-f]{2}\/[0-9a-f]{64}$/.test(storageKey)) throw new Error(`Not a blob key: ${storageKey}`);
}

export class LocalDiskBlobStore implements BlobStore {
  constructor(private readonly root: string) {}

  private fileFor(storageKey: string): string {
    assertBlobKey(storageKey);
    return path.join(this.root, storageKey);
  }

  async put(bytes: Uint8Array) {
    const sha256 = sha256Hex(bytes);
    const storageKey = blobKeyFor(sha256);
    const file = this.fileFor(storageKey);
    if (!(await this.has(storageKey))) {
      await fs.mkdir(path.dirname(file), { recursive: true });
      // Write aside and rename, so a crash never leaves a half-written blob under its final name.
      const temp = `${file}.${randomUUID()}.part`;
      await fs.writeFile(temp, bytes);
      await fs.rename(temp, file);
    }
    return { sha256, storageKey, sizeBytes: bytes.byteLength };
  }

  async putFile(source: string, sha256: string, sizeBytes: number) {
    const storageKey = blobKeyFor(sha256);
    const file = this.fileFor(storageKey);
    if (!(await this.has(storageKey))) {
      await fs.mkdir(path.dirname(file), { recursive: true });
      const temp = `${file}.${randomUUID()}.part`;
      try {
        await fs.copyFile(source, temp);
        await fs.rename(temp, file);
      } finally {
        await fs.rm(temp, { force: true });
      }
    }
    return { sha256, storageKey, sizeBytes };
  }

  async get(storageKey: string) {
    try {
      return await fs.readFile(this.fileFor(storageKey));
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === 'ENOENT') return null;
      throw error;
    }
  }

  async has(storageKey: string) {
    try {
      await fs.access(this.fileFor(storageKey));
      return true;
    } catch {
      return false;
    }
  }

  async delete(storageKey: string) {
    await fs.rm(this.fileFor(storageKey), { force: true });
  }
}
