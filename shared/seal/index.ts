export { SealError, type SealErrorCode } from './errors';
export {
  SEAL_HEADER_BYTES,
  SEAL_TAG_BYTES,
  SEAL_VERSION,
  clinicPublicKeyOf,
  generateClinicKeyPair,
  isSealed,
  openClip,
  sealClip,
  sha256Hex,
  type ClinicKeyPair,
} from './envelope';
export { bytesToHex, hexToBytes } from '@noble/hashes/utils';
