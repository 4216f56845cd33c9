// The server's recurring work, as jobs on the shared queue (job-queue.ts): each runs once across all instances.
import type { Sequelize } from 'sequelize';
import { services } from '../composition-root';
import { purgeErased } from '../use-cases/clients/erase-client';
import { runFollowUpReminders, STALE_MS as REMINDER_STALE_MS } from './follow-up-reminders';
import type { JobDefinition } from './job-queue';
import { runReportMailRetries, SENDING_STALE_MS } from './report-mail-retries';

const MINUTE = 60 * 1000;

export function backgroundJobs(sequelize: Sequelize, jwtSecret: string): JobDefinition[] {
  return [
    {
      name: 'follow-up-reminders',
      intervalMs: 10 * MINUTE,
      // A reminder claimed by a run that died is claimed again after REMINDER_STALE_MS; the lease matches it.
      leaseMs: REMINDER_STALE_MS,
      run: () => runFollowUpReminders(sequelize, services().mail),
    },
    {
      name: 'report-mail-retries',
      intervalMs: MINUTE,
      leaseMs: SENDING_STALE_MS,
      run: () => runReportMailRetries(sequelize, services().mail),
    },
    {
      name: 'erasure-purge',
      intervalMs: 6 * 60 * MINUTE,
      leaseMs: 60 * MINUTE,
      run: () => purgeErased({ sequelize, jwtSecret }),
    },
  ];
}
