import path from 'node:path';
import { openClip } from '@/shared/seal';
import { readSecrets } from '../../config/secrets';
import type { BlobStore } from '../../services/blob-store';
import { blobStoreFromEnv } from '../../services/blob-store-config';
import { ClinicKeyStore } from '../../services/clinic-keys';
import { mailServiceFromEnv, type MailService } from '../../services/mail';

/** Opens a sealed clip with the clinic's key. */
export type ClipOpener = (clinicId: string, sealed: Uint8Array) => Promise<Uint8Array>;

export type ReviewServices = {
  mail: MailService;
  blobStore: BlobStore;
  /** The local mail fake's HTTP listing, for the admin mailbox page; null where a real relay is used. */
  mailboxUrl: string | null;
  openClip: ClipOpener | null;
};

let configured: Partial<ReviewServices> = {};
let fromEnv: ReviewServices | undefined;

/** Tests and the composition root set these; anything not set comes from the environment. */
export function configureReviewServices(services: Partial<ReviewServices>): void {
  configured = { ...configured, ...services };
}

// The same configuration the sync side reads (BLOB_STORE, BLOB_DIR, CLINIC_KEYS_DIR), so review reads the clips sync kept.
export function reviewServices(): ReviewServices {
  if (!fromEnv) {
    const data = path.resolve(__dirname, '../../../../.data');
    const keys = new ClinicKeyStore(readSecrets().clinicKeysDir);
    fromEnv = {
      mail: mailServiceFromEnv(),
      blobStore: blobStoreFromEnv(process.env, process.env.BLOB_DIR ?? path.join(data, 'blobs')),
      mailboxUrl: process.env.MAIL_FAKE_HTTP_PORT
        ? `http://127.0.0.1:${process.env.MAIL_FAKE_HTTP_PORT}`
        : null,
      openClip: async (clinicId, sealed) => openClip(sealed, keys.privateKey(clinicId)),
    };
  }
  return { ...fromEnv, ...configured };
}
