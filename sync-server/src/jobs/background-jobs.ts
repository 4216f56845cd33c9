// The server's background work, as jobs on the queue shared by every instance (job-queue.ts): each run happens
// once across all instances, is retried with backoff, and shows on the admin's overview when it keeps failing.
import type { UseCaseDeps } from '../use-cases/context';
import { purgeErased } from '../use-cases/clients/erase-client';
import { runFollowUpReminders, STALE_MS as REMINDER_STALE_MS } from './follow-up-reminders';
import type { JobDefinition } from './job-queue';
import { runReportMailRetries, SENDING_STALE_MS } from './report-mail-retries';

const seconds = (ms: number) => Math.ceil(ms / 1000);

export function backgroundJobs(deps: UseCaseDeps): JobDefinition[] {
  const { sequelize, services } = deps;
  return [
    {
      name: 'follow-up-reminders',
      cron: '*/10 * * * *',
      // A reminder claimed by a run that died is claimed again after REMINDER_STALE_MS; the expiry matches it.
      expireInSeconds: seconds(REMINDER_STALE_MS),
      run: () => runFollowUpReminders(sequelize, services.mail),
    },
    {
      name: 'report-mail-retries',
      cron: '* * * * *',
      expireInSeconds: seconds(SENDING_STALE_MS),
      run: () => runReportMailRetries(sequelize, services.mail),
    },
    {
      name: 'erasure-purge',
      cron: '17 */6 * * *',
      expireInSeconds: 60 * 60,
      run: () => purgeErased(deps),
    },
    {
      // Received clips are processed as their last byte arrives; this picks up any whose processing never ran
      // (an instance died between the last byte and the end of processing). Each upload is processed under its
      // own lock, so this and a device's HEAD never process one twice.
      name: 'staged-uploads',
      cron: '*/5 * * * *',
      expireInSeconds: 30 * 60,
      run: async () => {
        const counts = await services.uploads.processStaged();
        if (counts.failed > 0)
          throw new Error(
            `${counts.failed} received clip(s) could not be processed; they are kept for a retry.`,
          );
        return counts;
      },
    },
  ];
}
