import { randomUUID } from 'node:crypto';
import type { Sequelize, Transaction } from 'sequelize';
import { consentText, consentTextTitle, consentTextVersion } from '@/shared/consent/consent-text';
import { execute } from './sql';

/**
 * A new clinic, with the consent wording phones show before they have fetched the clinic's own as its first
 * published version: a consent signed against that wording names a row the server has.
 */
export async function createClinic(
  sequelize: Sequelize,
  clinic: { id: string; name: string },
  transaction?: Transaction,
): Promise<void> {
  await execute(sequelize, `INSERT INTO clinics (id, name) VALUES (:id, :name)`, clinic, transaction);
  await execute(
    sequelize,
    `INSERT INTO consent_texts (id, clinic_id, version, title, body, is_current)
     VALUES (:id, :clinicId, :version, :title, :body, true)`,
    {
      id: randomUUID(),
      clinicId: clinic.id,
      version: consentTextVersion,
      title: consentTextTitle,
      body: consentText.join('\n\n'),
    },
    transaction,
  );
}
