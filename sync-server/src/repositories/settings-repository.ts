import type { Sequelize, Transaction } from 'sequelize';
import type { Offer } from '@/shared/protocol/practice';
import { execute, selectRows } from './sql';

/** Seven years, the column's default in the schema (common practice, no source; follow local rules). */
export const DEFAULT_RETENTION_MONTHS = 84;

export type SettingsRow = {
  name: string;
  address: string | null;
  logo_data_url: string | null;
  retention_months: number | null;
  reminder_days_before: number | null;
  currency: string | null;
  offers: Offer[] | null;
  time_zone: string | null;
};

export async function findSettings(
  sequelize: Sequelize,
  clinicId: string,
  transaction?: Transaction,
): Promise<SettingsRow | null> {
  const rows = await selectRows<SettingsRow>(
    sequelize,
    `SELECT c.name, s.address, s.logo_data_url, s.retention_months, s.reminder_days_before, s.currency, s.offers, s.time_zone
     FROM clinics c LEFT JOIN clinic_settings s ON s.clinic_id = c.id WHERE c.id = :clinicId`,
    { clinicId },
    transaction,
  );
  return rows[0] ?? null;
}

export async function saveSettings(
  sequelize: Sequelize,
  clinicId: string,
  s: {
    name: string;
    address: string | null;
    logoDataUrl: string | null;
    retentionMonths: number;
    reminderDaysBefore: number;
    currency: string;
    offers: Offer[];
    timeZone: string | null;
  },
  transaction: Transaction,
) {
  await execute(
    sequelize,
    `UPDATE clinics SET name = :name, updated_at = now() WHERE id = :clinicId`,
    { clinicId, name: s.name },
    transaction,
  );
  await execute(
    sequelize,
    `INSERT INTO clinic_settings (clinic_id, address, logo_data_url, retention_months, reminder_days_before, currency, offers, time_zone)
     VALUES (:clinicId, :address, :logo, :retention, :reminder, :currency, CAST(:offers AS jsonb), :timeZone)
     ON CONFLICT (clinic_id) DO UPDATE SET address = EXCLUDED.address, logo_data_url = EXCLUDED.logo_data_url,
       retention_months = EXCLUDED.retention_months, reminder_days_before = EXCLUDED.reminder_days_before,
       currency = EXCLUDED.currency, offers = EXCLUDED.offers,
       time_zone = COALESCE(EXCLUDED.time_zone, clinic_settings.time_zone), updated_at = now()`,
    {
      clinicId,
      address: s.address,
      logo: s.logoDataUrl,
      retention: s.retentionMonths,
      reminder: s.reminderDaysBefore,
      currency: s.currency,
      offers: JSON.stringify(s.offers),
      timeZone: s.timeZone,
    },
    transaction,
  );
}

export type RangeOverrideRow = { metric: string; site: string; low: number | null; high: number | null };

export const listRangeOverrides = (sequelize: Sequelize, clinicId: string) =>
  selectRows<RangeOverrideRow>(
    sequelize,
    `SELECT metric, site, low, high FROM range_overrides WHERE clinic_id = :clinicId`,
    { clinicId },
  );

export const upsertRangeOverride = (
  sequelize: Sequelize,
  row: {
    id: string;
    clinicId: string;
    metric: string;
    site: string;
    low: number | null;
    high: number | null;
    userId: string;
  },
  transaction: Transaction,
) =>
  execute(
    sequelize,
    `INSERT INTO range_overrides (id, clinic_id, metric, site, low, high, updated_by) VALUES (:id, :clinicId, :metric, :site, :low, :high, :userId)
     ON CONFLICT (clinic_id, metric, site) DO UPDATE SET low = EXCLUDED.low, high = EXCLUDED.high, updated_by = EXCLUDED.updated_by, updated_at = now()`,
    row,
    transaction,
  );

export const deleteRangeOverrides = (
  sequelize: Sequelize,
  clinicId: string,
  which: { metric: string; site: string } | null,
  transaction: Transaction,
) =>
  execute(
    sequelize,
    `DELETE FROM range_overrides WHERE clinic_id = :clinicId AND (:metric::text IS NULL OR (metric = :metric AND site = :site))`,
    { clinicId, metric: which?.metric ?? null, site: which?.site ?? null },
    transaction,
  );
