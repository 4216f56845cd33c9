import { mailServiceFromEnv, type MailService } from './mail';
import { paymentsServiceFromEnv, type PaymentsService } from './payments';

/** The hosted services the practice's side talks to; built from the environment once, replaceable in tests. */
export interface PracticeServices {
  mail: MailService;
  payments: PaymentsService;
  /** Where links in e-mails point (invitations, payment pages); otherwise taken from the request. */
  publicBaseUrl?: string;
  /** Register our webhook URL with the provider on first use (the local fake needs it). */
  registerWebhook: boolean;
}

let current: PracticeServices | undefined;

export function practiceServices(): PracticeServices {
  if (!current) {
    const payments = paymentsServiceFromEnv();
    current = {
      mail: mailServiceFromEnv(),
      payments,
      publicBaseUrl: process.env.PUBLIC_BASE_URL,
      registerWebhook: payments.usesFake,
    };
  }
  return current;
}

export function setPracticeServices(services: PracticeServices): void {
  current = services;
}
