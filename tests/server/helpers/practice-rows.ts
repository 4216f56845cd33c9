import { randomUUID } from 'node:crypto';
import type { Sequelize } from 'sequelize';

export async function insertClient(
  sequelize: Sequelize,
  clinicId: string,
  fields: { first?: string; last?: string; email?: string | null } = {},
) {
  const id = randomUUID();
  const tag = id.slice(0, 6);
  await sequelize.query(
    `INSERT INTO clients (id, clinic_id, first_name, last_name, email, date_of_birth) VALUES (:id, :clinicId, :first, :last, :email, '1980-04-02')`,
    {
      replacements: {
        id,
        clinicId,
        first: fields.first ?? `Wren${tag}`,
        last: fields.last ?? 'Castellan',
        email: fields.email === undefined ? `wren.${tag}@client.fourpoint.test` : fields.email,
      },
    },
  );
  return id;
}

export async function insertSession(
  sequelize: Sequelize,
  clinicId: string,
  clientId: string,
  fields: { startedAt?: Date; followUpDate?: string | null; findings?: string | null; status?: string } = {},
) {
  const id = randomUUID();
  await sequelize.query(
    `INSERT INTO recording_sessions (id, clinic_id, client_id, status, started_at, follow_up_date, findings)
     VALUES (:id, :clinicId, :clientId, :status, :startedAt, :followUpDate, :findings)`,
    {
      replacements: {
        id,
        clinicId,
        clientId,
        status: fields.status ?? 'completed',
        startedAt: fields.startedAt ?? new Date(),
        followUpDate: fields.followUpDate ?? null,
        findings: fields.findings ?? null,
      },
    },
  );
  return id;
}

export const isoDay = (offsetDays: number) =>
  new Date(Date.now() + offsetDays * 86_400_000).toISOString().slice(0, 10);
