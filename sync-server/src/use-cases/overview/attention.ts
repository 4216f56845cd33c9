import type { Attention } from '@/shared/protocol/practice';
import { failingJobCount } from '../../jobs/job-queue';
import { attentionCounts } from '../../repositories/attention-repository';
import type { Caller, UseCaseDeps } from '../context';

/**
 * The admin's to-do counts: conflicts to settle, report e-mails waiting for a person, records past retention, and
 * background tasks of the server that keep failing.
 */
export async function attention(deps: UseCaseDeps, caller: Caller): Promise<Attention> {
  return {
    ...(await attentionCounts(deps.sequelize, caller.clinicId)),
    failingBackgroundTasks: await failingJobCount(deps.sequelize),
  };
}
