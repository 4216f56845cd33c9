import type { Sequelize } from 'sequelize';
import { KEEP_UNTIL } from './clients-repository';
import { selectRows } from './sql';

export async function attentionCounts(sequelize: Sequelize, clinicId: string) {
  const [row] = await selectRows<{ conflicts: string; reports: string; retention: string }>(
    sequelize,
    `SELECT
       (SELECT count(*) FROM sync_conflicts WHERE clinic_id = :clinicId AND status = 'open') AS conflicts,
       (SELECT count(*) FROM report_mails
          WHERE clinic_id = :clinicId AND state = 'failed' AND next_attempt_at IS NULL) AS reports,
       (SELECT count(*) FROM clients c
          WHERE c.clinic_id = :clinicId AND c.deleted_at IS NULL AND ${KEEP_UNTIL} < current_date) AS retention`,
    { clinicId },
  );
  return {
    openConflicts: Number(row?.conflicts ?? 0),
    undeliveredReports: Number(row?.reports ?? 0),
    clientsPastRetention: Number(row?.retention ?? 0),
  };
}
