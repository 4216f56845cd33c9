import { x25519 } from '@noble/curves/ed25519';
import { xchacha20poly1305 } from '@noble/ciphers/chacha';
import { extract, hkdf } from '@noble/hashes/hkdf';
import { sha256 } from '@noble/hashes/sha2';
import { bytesToHex, hexToBytes, utf8ToBytes } from '@noble/hashes/utils';
import { SEAL_HEADER_BYTES, SealError, generateClinicKeyPair, openClip, sealClip, sha256Hex } from './index';

// Known answers for each primitive the envelope is built from, so a wrong import or a package swap fails here.
describe('primitives against published vectors', () => {
  test('when X25519 multiplies the RFC 7748 §5.2 scalars, then it gives the published u-coordinates', () => {
    // RFC 7748 §5.2, first and second test vectors.
    expect(
      bytesToHex(
        x25519.scalarMult(
          hexToBytes('a546e36bf0527c9d3b16154b82465edd62144c0ac1fc5a18506a2244ba449ac4'),
          hexToBytes('e6db6867583030db3594c1a424b15f7c726624ec26b3353b10a903a6d0ab1c4c'),
        ),
      ),
    ).toBe('c3da55379de9c6908e94ea4df28d084f32eccf03491c71f754b4075577a28552');
    expect(
      bytesToHex(
        x25519.scalarMult(
          hexToBytes('4b66e9d4d1b4673c5ad22691957d6af5c11b6421e0ea01d42ca4169e7918ba0d'),
          hexToBytes('e5210f12786811d3f4b7959d0538ae2c31dbe7106fc03c3efc4cd549c715a493'),
        ),
      ),
    ).toBe('95cbde9476e8907d7aade45cb4b873f88b595a68799fa152e6f8f7647aac7957');
  });

  test('when Alice and Bob of RFC 7748 §6.1 agree a key, then both get the published shared secret', () => {
    const alice = hexToBytes('77076d0a7318a57d3c16c17251b26645df4c2f87ebc0992ab177fba51db92c2a');
    const bob = hexToBytes('5dab087e624a8a4b79e17f8b83800ee66f3bb1292618b6fd1c2f8b27ff88e0eb');
    expect(bytesToHex(x25519.getPublicKey(alice))).toBe(
      '8520f0098930a754748b7ddcb43ef75a0dbf3a0d26381af4eba4a98eaa9b4e6a',
    );
    expect(bytesToHex(x25519.getPublicKey(bob))).toBe(
      'de9edb7d7b7dc1b4d35b61c2ece435373f8343c85b78674dadfc7e146f882b4f',
    );
    const shared = '4a5d9d5ba4ce2de1728e3bf480350f25e07e21c947d19e3376f09b3c1e161742';
    expect(bytesToHex(x25519.getSharedSecret(alice, x25519.getPublicKey(bob)))).toBe(shared);
    expect(bytesToHex(x25519.getSharedSecret(bob, x25519.getPublicKey(alice)))).toBe(shared);
  });

  test('when XChaCha20-Poly1305 seals the draft-irtf-cfrg-xchacha-03 A.3.1 input, then ciphertext and tag match', () => {
    // draft-irtf-cfrg-xchacha-03, appendix A.3.1.
    const key = hexToBytes('808182838485868788898a8b8c8d8e8f909192939495969798999a9b9c9d9e9f');
    const nonce = hexToBytes('404142434445464748494a4b4c4d4e4f5051525354555657');
    const aad = hexToBytes('50515253c0c1c2c3c4c5c6c7');
    const plain = utf8ToBytes(
      "Ladies and Gentlemen of the class of '99: If I could offer you only one tip for the future, sunscreen would be it.",
    );
    const expected =
      'bd6d179d3e83d43b9576579493c0e939572a1700252bfaccbed2902c21396cbb' +
      '731c7f1b0b4aa6440bf3a82f4eda7e39ae64c6708c54c216cb96b72e1213b452' +
      '2f8c9ba40db5d945b11b69b982c1bb9e3f3fac2bc369488f76b2383565d3fff9' +
      '21f9664c97637da9768812f615c68b13b52e' +
      'c0875924c1c7987947deafd8780acf49';
    const sealed = xchacha20poly1305(key, nonce, aad).encrypt(plain);
    expect(bytesToHex(sealed)).toBe(expected);
    expect(xchacha20poly1305(key, nonce, aad).decrypt(sealed)).toEqual(plain);
  });

  test('when HKDF-SHA256 runs RFC 5869 test case 1, then PRK and OKM match', () => {
    // RFC 5869 appendix A.1 (test case 1).
    const ikm = hexToBytes('0b'.repeat(22));
    const salt = hexToBytes('000102030405060708090a0b0c');
    const info = hexToBytes('f0f1f2f3f4f5f6f7f8f9');
    expect(bytesToHex(extract(sha256, ikm, salt))).toBe(
      '077709362c2e32df0ddc3f0dc47bba6390b6c73bb50f9c3122ec844ad7c2b3e5',
    );
    expect(bytesToHex(hkdf(sha256, ikm, salt, info, 42))).toBe(
      '3cb25f25faacd57a90434f64d0362f2a2d2d0a90cf1a5a4c5db02d56ecc4c5bf34007208d5b887185865',
    );
  });

  test('when SHA-256 hashes "abc", then it gives the FIPS 180-2 appendix B.1 digest', () => {
    expect(sha256Hex(utf8ToBytes('abc'))).toBe(
      'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad',
    );
  });
});

describe('the clip envelope', () => {
  const clip = Uint8Array.from({ length: 5000 }, (_, i) => (i * 31 + 7) & 255);

  test('when a clip is sealed and opened with the matching key, then the bytes come back unchanged', () => {
    const { publicKey, privateKey } = generateClinicKeyPair();
    const sealed = sealClip(clip, publicKey);
    expect(sealed.length).toBe(clip.length + SEAL_HEADER_BYTES + 16);
    expect(openClip(sealed, privateKey)).toEqual(clip);
  });

  test('when the same clip is sealed twice, then the sealed bytes and their hashes differ (fresh ephemeral key and nonce)', () => {
    const { publicKey } = generateClinicKeyPair();
    const a = sealClip(clip, publicKey);
    const b = sealClip(clip, publicKey);
    expect(sha256Hex(a)).not.toBe(sha256Hex(b));
  });

  test('when the sealed bytes contain no run of the plaintext, then nothing of the clip leaks in the clear', () => {
    const { publicKey } = generateClinicKeyPair();
    const sealed = bytesToHex(sealClip(clip, publicKey));
    expect(sealed.includes(bytesToHex(clip.subarray(100, 116)))).toBe(false);
  });

  test.each([
    ['a ciphertext byte', SEAL_HEADER_BYTES + 10],
    ['the tag', -1],
    ['the nonce in the header', 50],
    ['the ephemeral key in the header', 12],
    ['the reserved header bytes', 6],
  ])('when %s is flipped, then opening fails with cannot_open', (_what, at) => {
    const { publicKey, privateKey } = generateClinicKeyPair();
    const sealed = sealClip(clip, publicKey);
    const index = at < 0 ? sealed.length + at : at;
    sealed[index] ^= 0x01;
    expect(() => openClip(sealed, privateKey)).toThrow(expect.objectContaining({ code: 'cannot_open' }));
  });

  test('when opened with another clinic key, then it fails with a clear cannot_open message', () => {
    const { publicKey } = generateClinicKeyPair();
    const other = generateClinicKeyPair();
    const sealed = sealClip(clip, publicKey);
    expect(() => openClip(sealed, other.privateKey)).toThrow(/sealed for another clinic key/);
  });

  test('when the bytes are not a sealed clip, too short, or of a later version, then each fails with its own code', () => {
    const { publicKey, privateKey } = generateClinicKeyPair();
    expect(() => openClip(utf8ToBytes('RIFF....WAVEfmt '), privateKey)).toThrow(
      expect.objectContaining({ code: 'not_sealed' }),
    );
    const sealed = sealClip(clip, publicKey);
    expect(() => openClip(sealed.subarray(0, 70), privateKey)).toThrow(
      expect.objectContaining({ code: 'truncated' }),
    );
    const later = sealed.slice();
    later[4] = 2;
    expect(() => openClip(later, privateKey)).toThrow(
      expect.objectContaining({ code: 'unsupported_version' }),
    );
  });

  test('when a key has the wrong length or is a low-order point, then sealing refuses with bad_key', () => {
    expect(() => sealClip(clip, new Uint8Array(31))).toThrow(SealError);
    // The all-zero u-coordinate is of small order (RFC 7748 §6.1 says to check for the all-zero output).
    expect(() => sealClip(clip, new Uint8Array(32))).toThrow(expect.objectContaining({ code: 'bad_key' }));
  });

  test('when an empty clip is sealed, then it opens to an empty clip', () => {
    const { publicKey, privateKey } = generateClinicKeyPair();
    expect(openClip(sealClip(new Uint8Array(0), publicKey), privateKey)).toEqual(new Uint8Array(0));
  });
});
