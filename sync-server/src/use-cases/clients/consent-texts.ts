import { randomUUID } from 'node:crypto';
import type { ConsentText, PublishConsentTextRequest } from '@/shared/protocol/practice';
import { recordAuditEvent } from '../../repositories/audit-repository';
import * as repo from '../../repositories/consent-texts-repository';
import { iso } from '../../repositories/sql';
import type { Caller, UseCaseDeps } from '../context';

export async function listConsentTexts(deps: UseCaseDeps, caller: Caller): Promise<ConsentText[]> {
  const rows = await repo.listConsentTexts(deps.sequelize, caller.clinicId);
  return rows.map((r) => ({
    id: r.id,
    version: r.version,
    title: r.title,
    body: r.body,
    isCurrent: r.is_current,
    publishedAt: iso(r.published_at)!,
  }));
}

export async function publishConsentText(
  deps: UseCaseDeps,
  caller: Caller,
  input: PublishConsentTextRequest,
): Promise<ConsentText> {
  const id = randomUUID();
  await deps.sequelize.transaction(async (transaction) => {
    const version = await repo.publishConsentText(
      deps.sequelize,
      { id, clinicId: caller.clinicId, ...input },
      transaction,
    );
    await recordAuditEvent(
      {
        clinicId: caller.clinicId,
        userId: caller.userId,
        action: 'consent_text.publish',
        entity: 'consent_text',
        entityId: id,
        ip: caller.ip,
        details: { version },
      },
      transaction,
    );
  });
  return (await listConsentTexts(deps, caller)).find((t) => t.id === id)!;
}
