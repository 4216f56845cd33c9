import { createHash } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { LocalDiskBlobStore } from './blob-store';

const freshStore = () => {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-blob-store-'));
  return { dir, store: new LocalDiskBlobStore(dir) };
};

describe('LocalDiskBlobStore', () => {
  test('when bytes are stored, then the key is their sha256 and they read back unchanged', async () => {
    const { store } = freshStore();
    const bytes = new TextEncoder().encode('abc');
    const stored = await store.put(bytes);
    // sha256("abc"): the worked example of FIPS 180-2, appendix B.1 (digest quoted from memory).
    expect(stored.sha256).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(stored.storageKey).toBe(`ba/${stored.sha256}`);
    expect(stored.sizeBytes).toBe(3);
    expect((await store.get(stored.storageKey))?.toString()).toBe('abc');
    expect(await store.has(stored.storageKey)).toBe(true);
  });

  test('when the same bytes are stored twice, then one file holds them and no temporary file is left', async () => {
    const { dir, store } = freshStore();
    const bytes = Buffer.from('same clip twice');
    const a = await store.put(bytes);
    const b = await store.put(bytes);
    expect(b).toEqual(a);
    const files = fs.readdirSync(path.join(dir, a.storageKey.slice(0, 2)));
    expect(files).toEqual([a.sha256]);
  });

  test('when a key is unknown, then get answers null and has answers false', async () => {
    const { store } = freshStore();
    const key = `00/${createHash('sha256').update('never stored').digest('hex').replace(/^../, '00')}`;
    expect(await store.get(key)).toBeNull();
    expect(await store.has(key)).toBe(false);
  });

  test('when a key is not a blob key (a path escape, say), then the store refuses it', async () => {
    const { store } = freshStore();
    await expect(store.get('../../etc/passwd')).rejects.toThrow(/Not a blob key/);
  });
});
