import type { Sequelize, Transaction } from 'sequelize';
import type { z } from 'zod';
import {
  analysisFailureSchema,
  analysisSummarySchema,
  storedAnalysisSchema,
  type AnalysisSummary,
  type StoredAnalysis,
} from '@/shared/protocol/analysis';
import { MURMUR_PAIR_THRESHOLD } from '@/shared/analysis/murmur';
import type { QualityVerdict, SessionStatus, Site } from '@/shared/protocol';
import type { ReviewSessionRow, ReviewSort } from '@/shared/protocol/review';
import { escapeLike, execute, selectRows } from './sql';

const SITES: readonly Site[] = ['mitral', 'tricuspid', 'aortic', 'pulmonic'];
const QUALITY_RANK: Record<QualityVerdict, number> = { good: 1, usable: 2, retake: 3 };
const RANK_QUALITY: Record<number, QualityVerdict> = { 1: 'good', 2: 'usable', 3: 'retake' };

/** Per-site limits beyond which a site reads "refer to a licensed clinician" (null: no limit). */
export type ReferralLimits = Record<
  Site,
  {
    hrLow: number | null;
    hrHigh: number | null;
    systolicLow: number | null;
    systolicHigh: number | null;
    diastolicLow: number | null;
    diastolicHigh: number | null;
  }
>;

export type ReviewListFilter = {
  clientId?: string;
  operatorId?: string;
  from?: string;
  to?: string;
  status?: SessionStatus;
  flagged?: boolean;
  quality?: QualityVerdict;
  q?: string;
};

export type ReviewListOptions = {
  filter: ReviewListFilter;
  sort: ReviewSort;
  dir: 'asc' | 'desc';
  limit: number;
  after?: { value: string; id: string };
};

const SORT_EXPR: Record<ReviewSort, { expr: string; cast: string }> = {
  startedAt: { expr: 's.started_at', cast: 'timestamptz' },
  clientName: { expr: `lower(c.last_name || ' ' || c.first_name)`, cast: 'text' },
  operatorName: { expr: `lower(coalesce(u.name, ''))`, cast: 'text' },
  status: { expr: 's.status', cast: 'text' },
};

/** The clinic's limits as a join; one row for every site when they agree, which spares a join on the site name. */
function limitsJoin(limits: ReferralLimits, replacements: Record<string, unknown>): string {
  const same = SITES.every((site) => JSON.stringify(limits[site]) === JSON.stringify(limits.mitral));
  const sites = same ? SITES.slice(0, 1) : SITES;
  const rows = sites
    .map((site, i) => {
      const l = limits[site];
      replacements[`site${i}`] = site;
      replacements[`hrLow${i}`] = l.hrLow;
      replacements[`hrHigh${i}`] = l.hrHigh;
      replacements[`sysLow${i}`] = l.systolicLow;
      replacements[`sysHigh${i}`] = l.systolicHigh;
      replacements[`diaLow${i}`] = l.diastolicLow;
      replacements[`diaHigh${i}`] = l.diastolicHigh;
      return `(:site${i}, CAST(:hrLow${i} AS real), CAST(:hrHigh${i} AS real), CAST(:sysLow${i} AS real), CAST(:sysHigh${i} AS real), CAST(:diaLow${i} AS real), CAST(:diaHigh${i} AS real))`;
    })
    .join(', ');
  return `JOIN (VALUES ${rows}) AS r(site, hr_low, hr_high, sys_low, sys_high, dia_low, dia_high) ON ${same ? 'true' : 'r.site = sr.site'}`;
}

// Whether a site reads "refer to a licensed clinician" under the clinic's limits: the rules of
// siteReferralReasons (use-cases/review/measurements.ts) over the generated columns of the analysis of record.
const siteFlag = `sr.review_irregular OR sr.review_possible_murmur
    OR sr.review_heart_rate < r.hr_low OR sr.review_heart_rate > r.hr_high
    OR sr.review_systolic_activity < r.sys_low OR sr.review_systolic_activity > r.sys_high
    OR sr.review_diastolic_activity < r.dia_low OR sr.review_diastolic_activity > r.dia_high`;

// A site whose murmur score is borderline: two in one visit flag it (screensInVisit in shared/analysis). The
// threshold comes from the committed model as the replacement :pairThreshold.
const murmurBorderline = `(sr.analysis->'screen'->>'murmur' = 'unlikely'
    AND CAST(sr.analysis->'screen'->>'score' AS real) >= CAST(:pairThreshold AS real))`;

// Per site: its quality rank, whether it reads "refer to a licensed clinician" under the clinic's limits, and
// whether its murmur score is borderline.
const siteFacts = `
  CASE sr.quality_verdict WHEN 'good' THEN 1 WHEN 'usable' THEN 2 WHEN 'retake' THEN 3 END AS rank,
  (${siteFlag}) AS flag,
  ${murmurBorderline} AS murmur_borderline`;

function filterSql(
  clinicId: string,
  filter: ReviewListFilter,
  limits: ReferralLimits,
  replacements: Record<string, unknown>,
) {
  replacements.clinicId = clinicId;
  const where = ['s.clinic_id = :clinicId', 's.deleted_at IS NULL'];
  if (filter.clientId) {
    where.push('s.client_id = :clientId');
    replacements.clientId = filter.clientId;
  }
  if (filter.operatorId) {
    where.push('s.operator_id = :operatorId');
    replacements.operatorId = filter.operatorId;
  }
  if (filter.from) {
    where.push(`s.started_at >= CAST(:from AS date)`);
    replacements.from = filter.from;
  }
  if (filter.to) {
    // The end date is inclusive: everything before the next midnight.
    where.push(`s.started_at < CAST(:to AS date) + 1`);
    replacements.to = filter.to;
  }
  if (filter.status) {
    where.push('s.status = :status');
    replacements.status = filter.status;
  }
  if (filter.q) {
    where.push(`(c.first_name || ' ' || c.last_name) ILIKE :q`);
    replacements.q = `%${escapeLike(filter.q)}%`;
  }
  // Filters on what the analysis found are semi-joins on the covering index of site facts: the planner can
  // probe it per session or hash it whole, whichever the other filters leave cheaper.
  const sitesOf = (condition: string) =>
    `EXISTS (SELECT 1 FROM site_recordings sr ${limitsJoin(limits, replacements)}
              WHERE sr.clinic_id = :clinicId AND sr.session_id = s.id AND sr.deleted_at IS NULL AND (${condition}))`;
  // Flagged: a site's facts say refer (the same rules as siteReferralReasons), two sites are borderline for a
  // murmur, or a practitioner flagged it.
  const flaggedByHand = `EXISTS (SELECT 1 FROM session_referral_flags f WHERE f.clinic_id = :clinicId AND f.session_id = s.id)`;
  replacements.pairThreshold = MURMUR_PAIR_THRESHOLD;
  const murmurPair = `(SELECT count(*) FROM site_recordings sr
      WHERE sr.clinic_id = :clinicId AND sr.session_id = s.id AND sr.deleted_at IS NULL AND ${murmurBorderline}) >= 2`;
  if (filter.flagged === true) where.push(`(${sitesOf(siteFlag)} OR ${murmurPair} OR ${flaggedByHand})`);
  if (filter.flagged === false)
    where.push(`NOT ${sitesOf(siteFlag)} AND NOT ${murmurPair} AND NOT ${flaggedByHand}`);
  if (filter.quality) {
    // The worst site decides: one site at this verdict and none worse.
    const worse = (['good', 'usable', 'retake'] as const).filter(
      (v) => QUALITY_RANK[v] > QUALITY_RANK[filter.quality!],
    );
    where.push(sitesOf(`sr.quality_verdict = :quality`));
    replacements.quality = filter.quality;
    if (worse.length) {
      where.push(`NOT ${sitesOf(`sr.quality_verdict IN (:worse)`)}`);
      replacements.worse = worse;
    }
  }
  const from = `
    FROM recording_sessions s
    JOIN clients c ON c.id = s.client_id AND c.clinic_id = s.clinic_id AND c.deleted_at IS NULL
    LEFT JOIN users u ON u.id = s.operator_id AND u.clinic_id = s.clinic_id`;
  return { from, where };
}

type ListRow = {
  id: string;
  client_id: string;
  client_name: string;
  operator_id: string | null;
  operator_name: string | null;
  status: SessionStatus;
  started_at: Date;
  follow_up_date: string | null;
  worst_rank: number | null;
  flagged: boolean | null;
  flagged_by_hand: boolean;
  sites: { site: Site; verdict: QualityVerdict | null; skipped: boolean }[] | null;
};

/**
 * One page in three steps: the count, the page's ids in order (only what filtering and sorting need), then
 * the display columns for those few rows, so the per-site work runs for 25 sessions and not for 10 000.
 */
export async function listReviewSessions(
  sequelize: Sequelize,
  clinicId: string,
  options: ReviewListOptions,
  limits: ReferralLimits,
): Promise<{ rows: (ReviewSessionRow & { sortValue: string })[]; total: number; hasMore: boolean }> {
  const replacements: Record<string, unknown> = {};
  const { from, where } = filterSql(clinicId, options.filter, limits, replacements);
  const sort = SORT_EXPR[options.sort];
  const op = options.dir === 'asc' ? '>' : '<';
  const pageWhere = [...where];
  if (options.after) {
    pageWhere.push(`(${sort.expr}, s.id) ${op} (CAST(:afterValue AS ${sort.cast}), CAST(:afterId AS uuid))`);
    replacements.afterValue = options.after.value;
    replacements.afterId = options.after.id;
  }
  replacements.limit = options.limit + 1;
  // The total rides along as a window count, so the filter runs once for both.
  const page = await selectRows<{ id: string; sort_value: string; total: string }>(
    sequelize,
    `SELECT s.id, (${sort.expr})::text AS sort_value, count(*) OVER () AS total
     ${from}
     WHERE ${pageWhere.join(' AND ')}
     ORDER BY ${sort.expr} ${options.dir}, s.id ${options.dir}
     LIMIT :limit`,
    replacements,
  );
  const hasMore = page.length > options.limit;
  // Past the last page no row carries the window count, and the keyset condition would skew it: count apart.
  let total = Number(page[0]?.total ?? 0);
  if (options.after || page.length === 0) {
    const countReplacements = { ...replacements };
    delete countReplacements.afterValue;
    delete countReplacements.afterId;
    const counted = await selectRows<{ n: string }>(
      sequelize,
      `SELECT count(*) AS n ${from} WHERE ${where.join(' AND ')}`,
      countReplacements,
    );
    total = Number(counted[0]?.n ?? 0);
  }
  const ids = page.slice(0, options.limit).map((r) => r.id);
  const detailReplacements: Record<string, unknown> = { clinicId, ids, pairThreshold: MURMUR_PAIR_THRESHOLD };
  const details = ids.length
    ? await selectRows<ListRow>(
        sequelize,
        `SELECT s.id, s.client_id, c.first_name || ' ' || c.last_name AS client_name, s.operator_id, u.name AS operator_name,
                s.status, s.started_at, s.follow_up_date, f.worst_rank, f.flagged, f.sites,
                EXISTS (SELECT 1 FROM session_referral_flags m WHERE m.clinic_id = s.clinic_id AND m.session_id = s.id) AS flagged_by_hand
           FROM recording_sessions s
           JOIN clients c ON c.id = s.client_id AND c.clinic_id = s.clinic_id
           LEFT JOIN users u ON u.id = s.operator_id AND u.clinic_id = s.clinic_id
           LEFT JOIN LATERAL (
             SELECT max(rank) AS worst_rank,
                    bool_or(flag) OR count(*) FILTER (WHERE murmur_borderline) >= 2 AS flagged,
                    json_agg(json_build_object('site', site, 'verdict', quality_verdict, 'skipped', skipped)) AS sites
               FROM (SELECT sr.site, sr.quality_verdict, sr.skipped_reason IS NOT NULL AS skipped, ${siteFacts}
                       FROM site_recordings sr
                       ${limitsJoin(limits, detailReplacements)}
                      WHERE sr.session_id = s.id AND sr.deleted_at IS NULL) x
           ) f ON true
          WHERE s.clinic_id = :clinicId AND s.id IN (:ids)`,
        detailReplacements,
      )
    : [];
  const byId = new Map(details.map((d) => [d.id, d]));
  const sortValue = new Map(page.map((r) => [r.id, r.sort_value]));
  return {
    total,
    hasMore,
    rows: ids
      .map((id) => byId.get(id))
      .filter((r): r is ListRow => Boolean(r))
      .map((r) => ({
        id: r.id,
        clientId: r.client_id,
        clientName: r.client_name,
        operatorId: r.operator_id,
        operatorName: r.operator_name,
        status: r.status,
        startedAt: new Date(r.started_at).toISOString(),
        followUpDate: r.follow_up_date,
        worstQuality: r.worst_rank ? RANK_QUALITY[r.worst_rank] : null,
        flagged: r.flagged === true || r.flagged_by_hand === true,
        sites: (r.sites ?? []).sort((a, b) => SITES.indexOf(a.site) - SITES.indexOf(b.site)),
        sortValue: sortValue.get(r.id) ?? '',
      })),
  };
}

export type SessionRecord = {
  id: string;
  clinicId: string;
  clinicName: string;
  clientId: string;
  clientFirstName: string;
  clientLastName: string;
  clientDateOfBirth: string | null;
  clientEmail: string | null;
  operatorName: string | null;
  status: SessionStatus;
  startedAt: Date;
  finishedAt: Date | null;
  findings: string | null;
  plan: string | null;
  followUpDate: string | null;
  version: number;
  reviewedByName: string | null;
  reviewedAt: Date | null;
};

export type SiteRecord<A = StoredAnalysis> = {
  id: string;
  site: Site;
  qualityVerdict: QualityVerdict | null;
  clipSha256: string | null;
  clipState: string;
  durationS: number | null;
  skippedReason: string | null;
  /** The analysis of record; null when there is none, or when it cannot be read (then `analysisProblem` says so). */
  analysis: A | null;
  /** Why there is no analysis to show although one was stored, in words; null otherwise. */
  analysisProblem: string | null;
};

const UNREADABLE_ANALYSIS =
  'The analysis kept for this site cannot be read, so its measurements are not shown. The recording itself is kept.';

/** Parses a stored analysis: the result, or why there is none in words (a refused clip, or a row that is not one). */
function readAnalysis<A>(
  schema: z.ZodType<A>,
  value: unknown,
): { analysis: A | null; analysisProblem: string | null } {
  if (value === null || value === undefined) return { analysis: null, analysisProblem: null };
  const failure = analysisFailureSchema.safeParse(value);
  if (failure.success)
    return {
      analysis: null,
      analysisProblem: `The clip could not be analysed: ${failure.data.error.message}`,
    };
  const parsed = schema.safeParse(value);
  return parsed.success
    ? { analysis: parsed.data, analysisProblem: null }
    : { analysis: null, analysisProblem: UNREADABLE_ANALYSIS };
}

export async function findSessionRecord(
  sequelize: Sequelize,
  clinicId: string,
  sessionId: string,
  transaction?: Transaction,
): Promise<SessionRecord | null> {
  const rows = await selectRows<Record<string, unknown>>(
    sequelize,
    `SELECT s.id, s.clinic_id, k.name AS clinic_name, s.client_id, c.first_name, c.last_name, c.date_of_birth, c.email,
            o.name AS operator_name, s.status, s.started_at, s.finished_at, s.findings, s.plan, s.follow_up_date, s.version,
            r.name AS reviewed_by_name, s.reviewed_at
       FROM recording_sessions s
       JOIN clinics k ON k.id = s.clinic_id
       JOIN clients c ON c.id = s.client_id AND c.clinic_id = s.clinic_id
       LEFT JOIN users o ON o.id = s.operator_id
       LEFT JOIN users r ON r.id = s.reviewed_by
      WHERE s.clinic_id = :clinicId AND s.id = :sessionId AND s.deleted_at IS NULL`,
    { clinicId, sessionId },
    transaction,
  );
  const r = rows[0];
  if (!r) return null;
  return {
    id: r.id as string,
    clinicId: r.clinic_id as string,
    clinicName: r.clinic_name as string,
    clientId: r.client_id as string,
    clientFirstName: r.first_name as string,
    clientLastName: r.last_name as string,
    clientDateOfBirth: (r.date_of_birth as string | null) ?? null,
    clientEmail: (r.email as string | null) ?? null,
    operatorName: (r.operator_name as string | null) ?? null,
    status: r.status as SessionStatus,
    startedAt: new Date(r.started_at as string),
    finishedAt: r.finished_at ? new Date(r.finished_at as string) : null,
    findings: (r.findings as string | null) ?? null,
    plan: (r.plan as string | null) ?? null,
    followUpDate: (r.follow_up_date as string | null) ?? null,
    version: Number(r.version),
    reviewedByName: (r.reviewed_by_name as string | null) ?? null,
    reviewedAt: r.reviewed_at ? new Date(r.reviewed_at as string) : null,
  };
}

type SiteRow = {
  id: string;
  session_id: string;
  site: Site;
  quality_verdict: QualityVerdict | null;
  clip_sha256: string | null;
  clip_state: string;
  duration_s: string | number | null;
  skipped_reason: string | null;
  analysis: unknown;
};

async function siteRows<A>(
  sequelize: Sequelize,
  clinicId: string,
  sessionIds: string[],
  analysisColumn: string,
  schema: z.ZodType<A>,
): Promise<Map<string, SiteRecord<A>[]>> {
  const out = new Map<string, SiteRecord<A>[]>();
  if (!sessionIds.length) return out;
  const rows = await selectRows<SiteRow>(
    sequelize,
    `SELECT sr.id, sr.session_id, sr.site, sr.quality_verdict, sr.clip_sha256, sr.clip_state, sr.duration_s, sr.skipped_reason,
            ${analysisColumn} AS analysis
       FROM site_recordings sr
      WHERE sr.clinic_id = :clinicId AND sr.session_id IN (:sessionIds) AND sr.deleted_at IS NULL`,
    { clinicId, sessionIds },
  );
  for (const r of rows) {
    const list = out.get(r.session_id) ?? [];
    list.push({
      id: r.id,
      site: r.site,
      qualityVerdict: r.quality_verdict,
      clipSha256: r.clip_sha256,
      clipState: r.clip_state,
      durationS: r.duration_s === null ? null : Number(r.duration_s),
      skippedReason: r.skipped_reason,
      ...readAnalysis(schema, r.analysis),
    });
    out.set(r.session_id, list);
  }
  return out;
}

/** The sites of sessions, with their analysis of record in full. */
export function findSiteRecords(
  sequelize: Sequelize,
  clinicId: string,
  sessionIds: string[],
): Promise<Map<string, SiteRecord[]>> {
  return siteRows(sequelize, clinicId, sessionIds, 'sr.analysis', storedAnalysisSchema);
}

/** The sites of sessions for lists and trends: the analysis without its sound marks and per-beat detail. */
export function findSiteSummaries(
  sequelize: Sequelize,
  clinicId: string,
  sessionIds: string[],
): Promise<Map<string, SiteRecord<AnalysisSummary>[]>> {
  return siteRows(
    sequelize,
    clinicId,
    sessionIds,
    `CASE WHEN sr.analysis->'metrics' IS NOT NULL THEN jsonb_set(sr.analysis - 'sounds', '{metrics}', (sr.analysis->'metrics') - 'beats') ELSE sr.analysis END`,
    analysisSummarySchema,
  );
}

export async function listClientSessions(
  sequelize: Sequelize,
  clinicId: string,
  clientId: string,
): Promise<{ id: string; startedAt: Date; status: SessionStatus }[]> {
  const rows = await selectRows<{ id: string; started_at: string; status: SessionStatus }>(
    sequelize,
    `SELECT id, started_at, status FROM recording_sessions
      WHERE clinic_id = :clinicId AND client_id = :clientId AND deleted_at IS NULL AND status <> 'cancelled'
      ORDER BY started_at ASC, id ASC`,
    { clinicId, clientId },
  );
  return rows.map((r) => ({ id: r.id, startedAt: new Date(r.started_at), status: r.status }));
}

export async function findClient(sequelize: Sequelize, clinicId: string, clientId: string) {
  const rows = await selectRows<{ id: string; first_name: string; last_name: string }>(
    sequelize,
    `SELECT id, first_name, last_name FROM clients WHERE clinic_id = :clinicId AND id = :clientId AND deleted_at IS NULL`,
    { clinicId, clientId },
  );
  const r = rows[0];
  return r ? { id: r.id, firstName: r.first_name, lastName: r.last_name } : null;
}

/** Writes the notes only if the row is still at `baseVersion`; null means someone saved in between. */
export async function updateNotesIfVersion(
  sequelize: Sequelize,
  clinicId: string,
  sessionId: string,
  baseVersion: number,
  values: { findings: string | null; plan: string | null; followUpDate: string | null; reviewedBy: string },
  transaction: Transaction,
): Promise<{ version: number } | null> {
  const rows = await selectRows<{ version: number }>(
    sequelize,
    `UPDATE recording_sessions
        SET findings = :findings, plan = :plan, follow_up_date = :followUpDate, reviewed_by = :reviewedBy, reviewed_at = now(),
            status = CASE WHEN status = 'completed' THEN 'reviewed' ELSE status END,
            version = version + 1, updated_at = now()
      WHERE clinic_id = :clinicId AND id = :sessionId AND version = :baseVersion AND deleted_at IS NULL
      RETURNING version`,
    { clinicId, sessionId, baseVersion, ...values },
    transaction,
  );
  const row = rows[0];
  return row ? { version: Number(row.version) } : null;
}

export type ReferralFlagRecord = { note: string; flaggedByName: string | null; flaggedAt: Date };

export async function findReferralFlag(
  sequelize: Sequelize,
  clinicId: string,
  sessionId: string,
  transaction?: Transaction,
): Promise<ReferralFlagRecord | null> {
  const rows = await selectRows<{ note: string; name: string | null; flagged_at: string }>(
    sequelize,
    `SELECT f.note, u.name, f.flagged_at FROM session_referral_flags f
       LEFT JOIN users u ON u.id = f.flagged_by
      WHERE f.clinic_id = :clinicId AND f.session_id = :sessionId`,
    { clinicId, sessionId },
    transaction,
  );
  const r = rows[0];
  return r ? { note: r.note, flaggedByName: r.name, flaggedAt: new Date(r.flagged_at) } : null;
}

/** Sets (or replaces) the practitioner's flag on a session. */
export async function upsertReferralFlag(
  sequelize: Sequelize,
  values: { clinicId: string; sessionId: string; note: string; flaggedBy: string },
  transaction: Transaction,
): Promise<void> {
  await execute(
    sequelize,
    `INSERT INTO session_referral_flags (clinic_id, session_id, note, flagged_by, flagged_at)
     VALUES (:clinicId, :sessionId, :note, :flaggedBy, now())
     ON CONFLICT (clinic_id, session_id) DO UPDATE
       SET note = EXCLUDED.note, flagged_by = EXCLUDED.flagged_by, flagged_at = EXCLUDED.flagged_at`,
    values,
    transaction,
  );
}

export async function deleteReferralFlag(
  sequelize: Sequelize,
  clinicId: string,
  sessionId: string,
  transaction: Transaction,
): Promise<void> {
  await execute(
    sequelize,
    `DELETE FROM session_referral_flags WHERE clinic_id = :clinicId AND session_id = :sessionId`,
    { clinicId, sessionId },
    transaction,
  );
}
