import { randomUUID } from 'node:crypto';
import type { ClinicRange, ClinicSettings, Offer, SetRangeRequest } from '@/shared/protocol/practice';
import { FALLBACK_TIME_ZONE } from '@/shared/format/dates';
import { AppError } from '../../errors';
import { recordAuditEvent } from '../../repositories/audit-repository';
import * as repo from '../../repositories/settings-repository';
import { DEFAULT_RETENTION_MONTHS } from '../../repositories/settings-repository';
import type { Caller, UseCaseDeps } from '../context';
import { defaultRanges } from './default-ranges';

// Prices are the clinic's to set; these are placeholders for a new clinic (common practice, no source).
export const DEFAULT_OFFERS: Offer[] = [
  { id: 'test-visit', label: 'Test visit', visits: 1, amountCents: 6000 },
  { id: 'package-5', label: 'Package of 5 visits', visits: 5, amountCents: 25000 },
];
export const DEFAULT_REMINDER_DAYS = 3;

export async function getSettings(deps: UseCaseDeps, clinicId: string): Promise<ClinicSettings> {
  const row = await repo.findSettings(deps.sequelize, clinicId);
  if (!row) throw new AppError('not_found', 'There is no such clinic.', 404);
  return {
    name: row.name,
    address: row.address,
    logoDataUrl: row.logo_data_url,
    retentionMonths: row.retention_months ?? DEFAULT_RETENTION_MONTHS,
    reminderDaysBefore: row.reminder_days_before ?? DEFAULT_REMINDER_DAYS,
    currency: row.currency ?? 'usd',
    offers: row.offers ?? DEFAULT_OFFERS,
    timeZone: row.time_zone ?? FALLBACK_TIME_ZONE,
  };
}

export async function saveSettings(
  deps: UseCaseDeps,
  caller: Caller,
  input: ClinicSettings,
): Promise<ClinicSettings> {
  const ids = new Set(input.offers.map((o) => o.id));
  if (ids.size !== input.offers.length)
    throw new AppError('duplicate_offer', 'Two offers have the same id; give each its own.', 400);
  await deps.sequelize.transaction(async (transaction) => {
    await repo.saveSettings(
      deps.sequelize,
      caller.clinicId,
      {
        ...input,
        address: input.address ?? null,
        logoDataUrl: input.logoDataUrl ?? null,
        timeZone: input.timeZone ?? null,
      },
      transaction,
    );
    await recordAuditEvent(
      {
        clinicId: caller.clinicId,
        userId: caller.userId,
        action: 'settings.update',
        entity: 'clinic',
        entityId: caller.clinicId,
        ip: caller.ip,
      },
      transaction,
    );
  });
  return getSettings(deps, caller.clinicId);
}

export async function getRanges(deps: UseCaseDeps, clinicId: string): Promise<ClinicRange[]> {
  const overrides = await repo.listRangeOverrides(deps.sequelize, clinicId);
  return defaultRanges().map((d) => {
    const o = overrides.find((x) => x.metric === d.metric && x.site === d.site);
    return {
      ...d,
      defaultLow: d.low,
      defaultHigh: d.high,
      low: o ? o.low : d.low,
      high: o ? o.high : d.high,
      overridden: Boolean(o),
    };
  });
}

export async function setRange(
  deps: UseCaseDeps,
  caller: Caller,
  metric: string,
  site: string,
  input: SetRangeRequest,
): Promise<ClinicRange[]> {
  if (!defaultRanges().some((d) => d.metric === metric && d.site === site)) {
    throw new AppError('not_found', `There is no range for ${metric} at ${site}.`, 404);
  }
  await deps.sequelize.transaction(async (transaction) => {
    await repo.upsertRangeOverride(
      deps.sequelize,
      { id: randomUUID(), clinicId: caller.clinicId, metric, site, ...input, userId: caller.userId },
      transaction,
    );
    await recordAuditEvent(
      {
        clinicId: caller.clinicId,
        userId: caller.userId,
        action: 'settings.range_set',
        entity: 'range',
        entityId: `${metric}:${site}`,
        ip: caller.ip,
        details: { ...input },
      },
      transaction,
    );
  });
  return getRanges(deps, caller.clinicId);
}

export async function resetRanges(
  deps: UseCaseDeps,
  caller: Caller,
  which: { metric: string; site: string } | null,
): Promise<ClinicRange[]> {
  await deps.sequelize.transaction(async (transaction) => {
    await repo.deleteRangeOverrides(deps.sequelize, caller.clinicId, which, transaction);
    await recordAuditEvent(
      {
        clinicId: caller.clinicId,
        userId: caller.userId,
        action: 'settings.range_reset',
        entity: 'range',
        entityId: which ? `${which.metric}:${which.site}` : 'all',
        ip: caller.ip,
      },
      transaction,
    );
  });
  return getRanges(deps, caller.clinicId);
}

/** The clinic's time zone, in which its days and clock times are written. */
export async function clinicTimeZone(
  deps: Pick<UseCaseDeps, 'sequelize'>,
  clinicId: string,
): Promise<string> {
  const row = await repo.findSettings(deps.sequelize, clinicId);
  return row?.time_zone ?? FALLBACK_TIME_ZONE;
}
