import { createHash, randomUUID } from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';

/** Content-addressed storage for clip bytes; local disk now, object storage behind the same interface later. */
export interface BlobStore {
  /** Stores the bytes under their sha256 and returns the key; storing the same bytes again is a no-op. */
  put(bytes: Uint8Array): Promise<{ sha256: string; storageKey: string; sizeBytes: number }>;
  get(storageKey: string): Promise<Buffer | null>;
  has(storageKey: string): Promise<boolean>;
}

export const sha256Hex = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

export class LocalDiskBlobStore implements BlobStore {
  constructor(private readonly root: string) {}

  private fileFor(storageKey: string): string {
    if (!/^[0-9a-f]{2}\/[0-9a-f]{64}$/.test(storageKey)) throw new Error(`Not a blob key: ${storageKey}`);
    return path.join(this.root, storageKey);
  }

  async put(bytes: Uint8Array) {
    const sha256 = sha256Hex(bytes);
    const storageKey = `${sha256.slice(0, 2)}/${sha256}`;
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
}
