import fs from 'node:fs';
import path from 'node:path';
import { bytesToHex, clinicPublicKeyOf, generateClinicKeyPair, hexToBytes } from '@/shared/seal';

/**
 * Each clinic's X25519 private key lives in a file outside the database (`<dir>/<clinicId>.key`, hex, mode 600),
 * so a database dump alone never opens a clip. The demo generates a key the first time a clinic needs one.
 */
export class ClinicKeyStore {
  private readonly cache = new Map<string, Uint8Array>();

  constructor(private readonly directory: string) {}

  private fileFor(clinicId: string): string {
    if (!/^[0-9a-f-]{36}$/.test(clinicId)) throw new Error(`Not a clinic id: ${clinicId}`);
    return path.join(this.directory, `${clinicId}.key`);
  }

  privateKey(clinicId: string): Uint8Array {
    const cached = this.cache.get(clinicId);
    if (cached) return cached;
    const file = this.fileFor(clinicId);
    let key: Uint8Array;
    if (fs.existsSync(file)) {
      key = hexToBytes(fs.readFileSync(file, 'utf8').trim());
    } else {
      fs.mkdirSync(this.directory, { recursive: true, mode: 0o700 });
      key = generateClinicKeyPair().privateKey;
      try {
        // wx: two servers starting at once keep whichever key was written first.
        fs.writeFileSync(file, bytesToHex(key), { mode: 0o600, flag: 'wx' });
      } catch (error) {
        if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
        key = hexToBytes(fs.readFileSync(file, 'utf8').trim());
      }
    }
    this.cache.set(clinicId, key);
    return key;
  }

  publicKey(clinicId: string): Uint8Array {
    return clinicPublicKeyOf(this.privateKey(clinicId));
  }
}
