import fs from 'node:fs/promises';
import path from 'node:path';
import { mailServiceFromEnv, type MailService } from './mail';
import { paymentsServiceFromEnv, type PaymentsService } from './payments';

/** The hosted services the practice's side talks to; built from the environment once, replaceable in tests. */
export interface PracticeServices {
  mail: MailService;
  payments: PaymentsService;
  /** Removes a clip's bytes for good (erasure); BlobStore itself only adds and reads. */
  deleteBlob(storageKey: string): Promise<void>;
  /** Where links in e-mails point (invitations, payment pages); otherwise taken from the request. */
  publicBaseUrl?: string;
  /** Register our webhook URL with the provider on first use (the local fake needs it). */
  registerWebhook: boolean;
}

const REPO_ROOT = path.resolve(__dirname, '../../..');
let current: PracticeServices | undefined;

export function practiceServices(): PracticeServices {
  if (!current) {
    const payments = paymentsServiceFromEnv();
    // The same folder the sync side keeps clips in (see sync-services.ts).
    const blobDir = process.env.BLOB_DIR ?? path.join(REPO_ROOT, '.data', 'blobs');
    current = {
      mail: mailServiceFromEnv(),
      payments,
      deleteBlob: (storageKey) => deleteLocalBlob(blobDir, storageKey),
      publicBaseUrl: process.env.PUBLIC_BASE_URL,
      registerWebhook: payments.usesFake,
    };
  }
  return current;
}

export function setPracticeServices(services: PracticeServices): void {
  current = services;
}

export async function deleteLocalBlob(blobDir: string, storageKey: string): Promise<void> {
  if (!/^[0-9a-f]{2}\/[0-9a-f]{64}$/.test(storageKey)) throw new Error(`Not a blob key: ${storageKey}`);
  await fs.rm(path.join(blobDir, storageKey), { force: true });
}
