import { createHash } from 'node:crypto';
import fs from 'node:fs';
import { decodeWav, encodeWav16 } from '@/shared/analysis/wav';
import { generateClinicKeyPair, openClip, sealClip, sha256Hex } from '@/shared/seal';
import { circorFixture } from '@/tests/support/circor-fixtures';

// The clip is what the local store keeps for a take: a 16-bit WAV of the samples. CirCor DigiScope record
// 36327_MV (Oliveira et al., IEEE JBHI 2022, doi:10.1109/JBHI.2021.3137048), vendored in tests/fixtures/circor.
function storedClip(): Uint8Array {
  const wav = decodeWav(new Uint8Array(fs.readFileSync(circorFixture('36327_MV.wav'))));
  return encodeWav16(wav.samples, wav.sampleRate);
}

test('when a take is sealed for the clinic, then only the clinic key opens it and the bytes match exactly', () => {
  const clinic = generateClinicKeyPair();
  const plain = storedClip();
  const sealed = sealClip(plain, clinic.publicKey);
  expect(Buffer.from(sealed).includes(Buffer.from(plain.subarray(44, 140)))).toBe(false);
  expect(Buffer.from(sealed).includes(Buffer.from('WAVE'))).toBe(false);
  expect(Buffer.from(openClip(sealed, clinic.privateKey)).equals(Buffer.from(plain))).toBe(true);
  expect(() => openClip(sealed, generateClinicKeyPair().privateKey)).toThrow();
});

test('when a sealed clip is addressed, then its name is the SHA-256 of the sealed bytes (checked with Node’s crypto)', () => {
  const sealed = sealClip(storedClip(), generateClinicKeyPair().publicKey);
  expect(sha256Hex(sealed)).toBe(createHash('sha256').update(sealed).digest('hex'));
});

test('when one byte of a sealed clip changes on the way, then opening it fails instead of returning altered audio', () => {
  const clinic = generateClinicKeyPair();
  const sealed = sealClip(storedClip(), clinic.publicKey);
  sealed[sealed.length - 100] ^= 0x01;
  expect(() => openClip(sealed, clinic.privateKey)).toThrow();
});

test('when the same take is sealed twice, then the envelopes differ (fresh ephemeral key each time)', () => {
  const clinic = generateClinicKeyPair();
  const plain = storedClip();
  expect(sha256Hex(sealClip(plain, clinic.publicKey))).not.toBe(sha256Hex(sealClip(plain, clinic.publicKey)));
});
