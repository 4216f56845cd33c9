import type { Attention } from '@/shared/protocol/practice';
import { attentionCounts } from '../../repositories/attention-repository';
import type { Caller, UseCaseDeps } from '../context';

/** The admin's to-do counts: conflicts to settle, report e-mails waiting for a person, records past retention. */
export function attention(deps: UseCaseDeps, caller: Caller): Promise<Attention> {
  return attentionCounts(deps.sequelize, caller.clinicId);
}
