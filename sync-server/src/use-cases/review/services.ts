import path from 'node:path';
import { LocalDiskBlobStore, type BlobStore } from '../../services/blob-store';
import { mailServiceFromEnv, type MailService } from '../../services/mail';

/** Opens a sealed clip with the clinic's key; absent until the clinic keeps one on the server. */
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

export function reviewServices(): ReviewServices {
  fromEnv ??= {
    mail: mailServiceFromEnv(),
    blobStore: new LocalDiskBlobStore(
      process.env.BLOB_DIR ??
        path.join(process.env.FOURPOINT_DATA ?? path.resolve(__dirname, '../../../../.data'), 'blobs'),
    ),
    mailboxUrl: process.env.MAIL_FAKE_HTTP_PORT
      ? `http://127.0.0.1:${process.env.MAIL_FAKE_HTTP_PORT}`
      : null,
    openClip: null,
  };
  return { ...fromEnv, ...configured };
}
