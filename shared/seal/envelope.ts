import { x25519 } from '@noble/curves/ed25519';
import { xchacha20poly1305 } from '@noble/ciphers/chacha';
import { hkdf } from '@noble/hashes/hkdf';
import { sha256 } from '@noble/hashes/sha2';
import { bytesToHex, randomBytes, utf8ToBytes } from '@noble/hashes/utils';
import { SealError } from './errors';

/*
 * Sealed clip, version 1 (all of it is ours; the primitives are standard):
 *   offset  size  field
 *   0       4     magic "FPSL"
 *   4       1     format version (1)
 *   5       1     suite (1 = X25519 + HKDF-SHA256 + XChaCha20-Poly1305)
 *   6       2     reserved, zero
 *   8       32    ephemeral X25519 public key
 *   40      24    XChaCha20 nonce
 *   64      n+16  ciphertext and Poly1305 tag
 * The 64-byte header is the AEAD's associated data, so no header byte can be changed unnoticed.
 * Key = HKDF-SHA256(ikm = X25519(eph, clinic), salt = ephPub || clinicPub, info = SEAL_INFO, 32 bytes):
 * binding both public keys stops a sealed clip being re-targeted to another recipient key.
 */
export const SEAL_MAGIC = utf8ToBytes('FPSL');
export const SEAL_VERSION = 1;
export const SEAL_SUITE_X25519_HKDF_XCHACHA = 1;
export const SEAL_HEADER_BYTES = 64;
export const SEAL_TAG_BYTES = 16;
const SEAL_INFO = utf8ToBytes('fourpoint clip seal v1');

export interface ClinicKeyPair {
  publicKey: Uint8Array;
  privateKey: Uint8Array;
}

export function generateClinicKeyPair(): ClinicKeyPair {
  const privateKey = x25519.utils.randomSecretKey();
  return { privateKey, publicKey: x25519.getPublicKey(privateKey) };
}

export function clinicPublicKeyOf(privateKey: Uint8Array): Uint8Array {
  checkKey(privateKey, 'private');
  return x25519.getPublicKey(privateKey);
}

function checkKey(key: Uint8Array, which: 'public' | 'private'): void {
  if (!(key instanceof Uint8Array) || key.length !== 32) {
    throw new SealError('bad_key', `The clinic ${which} key must be 32 bytes (X25519).`);
  }
}

function deriveKey(shared: Uint8Array, ephemeralPublic: Uint8Array, clinicPublic: Uint8Array): Uint8Array {
  if (shared.every((b) => b === 0)) {
    throw new SealError('bad_key', 'The key agreement produced an all-zero secret (a low-order public key).');
  }
  const salt = new Uint8Array(64);
  salt.set(ephemeralPublic, 0);
  salt.set(clinicPublic, 32);
  return hkdf(sha256, shared, salt, SEAL_INFO, 32);
}

function agree(privateKey: Uint8Array, publicKey: Uint8Array): Uint8Array {
  try {
    return x25519.getSharedSecret(privateKey, publicKey);
  } catch {
    throw new SealError('bad_key', 'The key agreement failed: the public key is not a usable X25519 key.');
  }
}

export function sealClip(plain: Uint8Array, clinicPublicKey: Uint8Array): Uint8Array {
  checkKey(clinicPublicKey, 'public');
  const ephemeralPrivate = x25519.utils.randomSecretKey();
  const ephemeralPublic = x25519.getPublicKey(ephemeralPrivate);
  const key = deriveKey(agree(ephemeralPrivate, clinicPublicKey), ephemeralPublic, clinicPublicKey);
  const nonce = randomBytes(24);

  const header = new Uint8Array(SEAL_HEADER_BYTES);
  header.set(SEAL_MAGIC, 0);
  header[4] = SEAL_VERSION;
  header[5] = SEAL_SUITE_X25519_HKDF_XCHACHA;
  header.set(ephemeralPublic, 8);
  header.set(nonce, 40);

  const body = xchacha20poly1305(key, nonce, header).encrypt(plain);
  const out = new Uint8Array(SEAL_HEADER_BYTES + body.length);
  out.set(header, 0);
  out.set(body, SEAL_HEADER_BYTES);
  return out;
}

export function isSealed(bytes: Uint8Array): boolean {
  return bytes.length >= SEAL_MAGIC.length && SEAL_MAGIC.every((b, i) => bytes[i] === b);
}

export function openClip(sealed: Uint8Array, clinicPrivateKey: Uint8Array): Uint8Array {
  checkKey(clinicPrivateKey, 'private');
  if (!isSealed(sealed)) throw new SealError('not_sealed', 'These bytes are not a sealed Fourpoint clip.');
  if (sealed.length < SEAL_HEADER_BYTES + SEAL_TAG_BYTES) {
    throw new SealError(
      'truncated',
      `A sealed clip is at least ${SEAL_HEADER_BYTES + SEAL_TAG_BYTES} bytes; got ${sealed.length}.`,
    );
  }
  if (sealed[4] !== SEAL_VERSION || sealed[5] !== SEAL_SUITE_X25519_HKDF_XCHACHA) {
    throw new SealError(
      'unsupported_version',
      `Sealed clip format ${sealed[4]}/suite ${sealed[5]} is not supported (this build opens ${SEAL_VERSION}/${SEAL_SUITE_X25519_HKDF_XCHACHA}).`,
    );
  }
  const header = sealed.subarray(0, SEAL_HEADER_BYTES);
  const ephemeralPublic = header.subarray(8, 40);
  const nonce = header.subarray(40, 64);
  const clinicPublic = x25519.getPublicKey(clinicPrivateKey);
  const key = deriveKey(agree(clinicPrivateKey, ephemeralPublic), ephemeralPublic, clinicPublic);
  try {
    return xchacha20poly1305(key, nonce, header).decrypt(sealed.subarray(SEAL_HEADER_BYTES));
  } catch {
    throw new SealError(
      'cannot_open',
      'The sealed clip cannot be opened: it was changed after sealing, or it was sealed for another clinic key.',
    );
  }
}

export function sha256Hex(bytes: Uint8Array): string {
  return bytesToHex(sha256(bytes));
}
