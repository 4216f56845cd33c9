import type { Sequelize, Transaction } from 'sequelize';
import { execute, selectRows } from './sql';

export type ConsentTextRow = {
  id: string;
  version: number;
  title: string;
  body: string;
  is_current: boolean;
  published_at: Date;
};

export const listConsentTexts = (sequelize: Sequelize, clinicId: string) =>
  selectRows<ConsentTextRow>(
    sequelize,
    `SELECT id, version, title, body, is_current, published_at FROM consent_texts WHERE clinic_id = :clinicId ORDER BY version DESC`,
    { clinicId },
  );

/** Publishes the next version and makes it the current one; earlier versions stay as they were signed. */
export async function publishConsentText(
  sequelize: Sequelize,
  row: { id: string; clinicId: string; title: string; body: string },
  transaction: Transaction,
): Promise<number> {
  await selectRows(
    sequelize,
    `SELECT id FROM clinics WHERE id = :clinicId FOR UPDATE`,
    { clinicId: row.clinicId },
    transaction,
  );
  const [{ next }] = await selectRows<{ next: number }>(
    sequelize,
    `SELECT coalesce(max(version), 0) + 1 AS next FROM consent_texts WHERE clinic_id = :clinicId`,
    { clinicId: row.clinicId },
    transaction,
  );
  await execute(
    sequelize,
    `UPDATE consent_texts SET is_current = false, updated_at = now() WHERE clinic_id = :clinicId AND is_current`,
    row,
    transaction,
  );
  await execute(
    sequelize,
    `INSERT INTO consent_texts (id, clinic_id, version, title, body, is_current) VALUES (:id, :clinicId, :version, :title, :body, true)`,
    { ...row, version: next },
    transaction,
  );
  return next;
}
