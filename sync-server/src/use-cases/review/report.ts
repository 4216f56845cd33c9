import { randomUUID } from 'node:crypto';
import type { Sequelize } from 'sequelize';
import { clientCautionText, pleaseSeeClinician } from '@/shared/cautions';
import { calendarDateIn, DOCUMENT_LOCALE, formatDay, formatMoment } from '@/shared/format/dates';
import type { Site } from '@/shared/protocol';
import type { Measurement, ReportMail, SendReportRequest } from '@/shared/protocol/review';
import { AppError } from '../../errors';
import { recordAuditEvent } from '../../repositories/audit-repository';
import {
  claimReportMail,
  type ClaimedReportMail,
  finishReportMail,
  findReportMail,
  insertReportMail,
  listReportMails,
} from '../../repositories/review-mails-repository';
import { findSessionRecord } from '../../repositories/review-repository';
import { findSettings } from '../../repositories/settings-repository';
import { MailSendError, type MailService } from '../../services/mail';
import { renderReportPdf, type ReportInput, type ReportSite } from '../../services/report-pdf';
import { traceLine } from '../clip-trace';
import type { Caller, UseCaseDeps } from '../context';
import { clinicTimeZone } from '../settings/settings';
import { referralKeys } from './measurements';
import { clipTrace, compareSessions, loadSession, reviewSitesOf } from './session-view';

const SITE_LABEL: Record<Site, string> = {
  mitral: 'Mitral',
  tricuspid: 'Tricuspid',
  aortic: 'Aortic',
  pulmonic: 'Pulmonic',
};
const REPORT_POINTS_PER_SECOND = 60;

// The client's report speaks to the client (product brief, Cautions): plain names for the measures, no
// beat-to-beat variability figures (a clip of seconds gives only a rough guide, which the practitioner weighs on
// screen), and a source only where a published one was checked: never a "(from memory)" note or "no source".
const CLIENT_LABELS: Record<string, string> = {
  heartRateBpm: 'Heart rate',
  s1DurationMs: 'Length of the first heart sound',
  s2DurationMs: 'Length of the second heart sound',
  systoleMs: 'Time from the first to the second sound',
  diastoleMs: 'Time from the second sound to the next beat',
  systoleDiastoleRatio: 'Balance of the two pauses',
  s1s2PeakRatio: 'Loudness of the first sound against the second',
  s1s2EnergyRatio: 'Strength of the first sound against the second',
  systolicActivity: 'Sound between the first and second sound',
  diastolicActivity: 'Sound between the second sound and the next beat',
  usableCycles: 'Clear heartbeats recorded',
};
const isPublishedSource = (source: string) => !/from memory|no source|no published source/i.test(source);

/** Everything a session's report shows: the four traces with S1/S2, measurements against ranges, findings. */
export async function buildReportInput(
  deps: UseCaseDeps,
  caller: Caller,
  sessionId: string,
  compareWith: string | null,
): Promise<ReportInput> {
  const session = await loadSession(deps, caller, sessionId);
  // Every date on the report is written one way: the document locale, in the clinic's time zone.
  const style = { locale: DOCUMENT_LOCALE, timeZone: await clinicTimeZone(deps, caller.clinicId) };
  const written = (value: string | Date | null) => (value === null ? null : formatDay(value, style));
  const { sites: views, records, referral } = await reviewSitesOf(deps, caller, sessionId);
  const sources: string[] = [];
  const sites: ReportSite[] = [];
  for (const view of views) {
    const site = view.site;
    const record = records.find((r) => r.site === site);
    let trace: ReportSite['trace'] = null;
    if (view.hasAudio) {
      try {
        trace = traceLine(await clipTrace(deps, caller, record), REPORT_POINTS_PER_SECOND);
      } catch {
        trace = null;
      }
    }
    sites.push({
      site,
      label: SITE_LABEL[site],
      quality: view.qualityVerdict,
      trace,
      sounds: view.sounds,
      measurements: view.measurements
        .filter((m) => CLIENT_LABELS[m.key] !== undefined)
        .map((m) => {
          let sourceIndex = -1;
          if (m.range && isPublishedSource(m.range.source)) {
            sourceIndex = sources.indexOf(m.range.source);
            if (sourceIndex < 0) sourceIndex = sources.push(m.range.source) - 1;
          }
          return {
            key: m.key,
            label: CLIENT_LABELS[m.key]!,
            reading: clientReading(m),
            unit: m.unit,
            value: m.value,
            status: m.status,
            range: m.range ? { low: m.range.low, high: m.range.high, sourceIndex } : null,
          };
        }),
    });
  }
  let comparison: ReportInput['comparison'] = null;
  if (compareWith) {
    const c = await compareSessions(deps, caller, sessionId, compareWith);
    comparison = {
      date: formatDay(c.then.startedAt, style),
      rows: c.rows
        .filter((r) => (r.then !== null || r.now !== null) && CLIENT_LABELS[r.key] !== undefined)
        .map((r) => ({
          site: SITE_LABEL[r.site],
          key: r.key,
          label: CLIENT_LABELS[r.key]!,
          unit: r.unit,
          then: r.then,
          now: r.now,
        })),
    };
  }
  const settings = await findSettings(deps.sequelize, caller.clinicId);
  return {
    clinicAddress: settings?.address ?? null,
    clinicLogo: logoBytes(settings?.logo_data_url ?? null),
    referral: {
      flagged: referral.flagged,
      // The client reads the same reasons, the practitioner's own in their words.
      reasons: [
        ...views.flatMap((v) => v.referralReasons.map((r) => `${SITE_LABEL[v.site]} site: ${r}`)),
        ...(referral.manual ? [`Your practitioner's note: ${referral.manual.note}`] : []),
      ],
    },
    clinicName: session.clinicName,
    clientName: `${session.clientFirstName} ${session.clientLastName}`,
    clientDateOfBirth: written(session.clientDateOfBirth),
    sessionDay: calendarDateIn(session.startedAt, style.timeZone),
    sessionDate: formatDay(session.startedAt, style),
    operatorName: session.operatorName,
    practitionerName: session.reviewedByName,
    sites,
    comparison,
    findings: session.findings,
    plan: session.plan,
    followUpDate: written(session.followUpDate),
    sources,
    generatedAt: `${formatMoment(new Date(), style)} (${style.timeZone})`,
  };
}

/** The reading in the client's words: "please see" where the practitioner reads "refer". */
function clientReading(m: Measurement): string {
  if (m.status !== 'above' && m.status !== 'below')
    return m.status === 'in_range' ? 'Within the usual range' : '';
  const side = m.status === 'above' ? 'Above' : 'Below';
  if ((referralKeys as readonly string[]).includes(m.key))
    return `${side} the usual range: ${pleaseSeeClinician}`;
  if (m.key === 'usableCycles') return 'Too few clear heartbeats for steady figures';
  return `${side} the usual range: your practitioner follows this across visits`;
}

/** The logo stored in Settings (a PNG or JPEG data URL) as bytes pdfkit draws; null when there is none. */
function logoBytes(dataUrl: string | null): Buffer | null {
  const match = dataUrl ? /^data:image\/(png|jpeg);base64,(.+)$/.exec(dataUrl) : null;
  return match ? Buffer.from(match[2]!, 'base64') : null;
}

export function reportFileName(clientName: string, date: string): string {
  return `fourpoint-report-${clientName
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-|-$/g, '')}-${date}.pdf`;
}

export async function renderReport(
  deps: UseCaseDeps,
  caller: Caller,
  sessionId: string,
  compareWith: string | null,
) {
  const input = await buildReportInput(deps, caller, sessionId, compareWith);
  const pdf = await renderReportPdf(input);
  await recordAuditEvent({
    clinicId: caller.clinicId,
    userId: caller.userId,
    action: 'review.report.download',
    entity: 'recording_sessions',
    entityId: sessionId,
    ip: caller.ip,
    details: { compareWith },
  });
  return { pdf, fileName: reportFileName(input.clientName, input.sessionDay), input };
}

function mailBody(input: ReportInput): string {
  return [
    `Hello ${input.clientName},`,
    '',
    `Attached is the report of your heart-sound recording at ${input.clinicName} on ${input.sessionDate}.`,
    ...(input.referral.flagged
      ? [
          '',
          `Please see a licensed clinician. The reason, in short:`,
          ...input.referral.reasons.map((r) => `- ${r}`),
          '',
        ]
      : []),
    input.followUpDate ? `Your follow-up is planned for ${input.followUpDate}.` : '',
    '',
    clientCautionText,
    '',
    input.clinicName,
  ]
    .filter((line, i, all) => line !== '' || all[i - 1] !== '')
    .join('\n');
}

/** Waits before the server's own next attempts after a temporary failure: 1, 5, 30 and 120 minutes. */
export const REPORT_MAIL_RETRY_DELAYS_MS = [1, 5, 30, 120].map((minutes) => minutes * 60 * 1000);

/**
 * Sends a claimed mail and records the outcome and its audit event. A temporary failure is tried again by the
 * server (jobs/report-mail-retries.ts) after the next wait; a permanent one, or the last attempt, waits for a person.
 */
export async function deliverClaimedReportMail(
  sequelize: Sequelize,
  mailService: MailService,
  claimed: ClaimedReportMail,
  actor: { userId: string | null; ip: string | null; now?: Date },
): Promise<ReportMail> {
  let result: ReportMail;
  try {
    const sent = await mailService.send({
      clinicId: claimed.clinicId,
      to: claimed.mail.to,
      subject: claimed.mail.subject,
      text: claimed.bodyText,
      attachments: [
        { filename: claimed.attachmentName, content: claimed.attachment, contentType: 'application/pdf' },
      ],
    });
    result = await finishReportMail(sequelize, claimed.clinicId, claimed.mail.id, {
      state: 'sent',
      messageId: sent.messageId,
    });
  } catch (error) {
    const temporary = !(error instanceof MailSendError) || error.temporary;
    const wait = REPORT_MAIL_RETRY_DELAYS_MS[claimed.mail.attempts - 1];
    const message =
      error instanceof MailSendError
        ? error.message
        : `Sending failed: ${error instanceof Error ? error.message : String(error)}`;
    result = await finishReportMail(sequelize, claimed.clinicId, claimed.mail.id, {
      state: 'failed',
      error: message,
      nextAttemptAt:
        temporary && wait !== undefined ? new Date((actor.now ?? new Date()).getTime() + wait) : null,
    });
  }
  await recordAuditEvent({
    clinicId: claimed.clinicId,
    userId: actor.userId,
    action: result.state === 'sent' ? 'review.report.mail.sent' : 'review.report.mail.failed',
    entity: 'recording_sessions',
    entityId: result.sessionId,
    ip: actor.ip,
    details: {
      mailId: result.id,
      attempt: result.attempts,
      to: result.to,
      error: result.lastError,
      automatic: actor.userId === null,
    },
  });
  return result;
}

async function attemptSend(deps: UseCaseDeps, caller: Caller, mailId: string): Promise<ReportMail> {
  const claimed = await claimReportMail(deps.sequelize, caller.clinicId, mailId);
  if (!claimed) {
    const mail = await findReportMail(deps.sequelize, caller.clinicId, mailId);
    if (!mail) throw new AppError('not_found', 'There is no such report e-mail.', 404);
    if (mail.state === 'sent')
      throw new AppError('already_sent', 'This report e-mail was already delivered.', 409);
    throw new AppError('send_in_progress', 'This report e-mail is being sent right now.', 409);
  }
  return deliverClaimedReportMail(deps.sequelize, deps.services.mail, claimed, {
    userId: caller.userId,
    ip: caller.ip ?? null,
  });
}

const mailSubject = (input: ReportInput) =>
  `Your heart-sound report from ${input.clinicName}, ${input.sessionDate}`;

/** The e-mail as it would go out, for the practitioner to read before sending; nothing is stored or sent. */
export async function previewReportMail(
  deps: UseCaseDeps,
  caller: Caller,
  sessionId: string,
  compareWith: string | null,
): Promise<{ to: string | null; subject: string; bodyText: string; attachmentName: string }> {
  const session = await loadSession(deps, caller, sessionId);
  const input = await buildReportInput(deps, caller, sessionId, compareWith);
  return {
    to: session.clientEmail,
    subject: mailSubject(input),
    bodyText: mailBody(input),
    attachmentName: reportFileName(input.clientName, input.sessionDate),
  };
}

/** Keeps the message (with its PDF) first, then sends; a failure leaves it stored and retryable. */
export async function sendReport(
  deps: UseCaseDeps,
  caller: Caller,
  sessionId: string,
  request: SendReportRequest,
): Promise<ReportMail> {
  const session = await findSessionRecord(deps.sequelize, caller.clinicId, sessionId);
  if (!session) throw new AppError('not_found', 'There is no such session in this clinic.', 404);
  const to = request.to ?? session.clientEmail;
  if (!to)
    throw new AppError(
      'no_client_email',
      'This client has no e-mail address on file: add one, or type the address to send to.',
      400,
    );
  const { pdf, fileName, input } = await renderReport(deps, caller, sessionId, request.compareWith ?? null);
  const mail = await insertReportMail(deps.sequelize, {
    id: randomUUID(),
    clinicId: caller.clinicId,
    sessionId,
    compareSessionId: request.compareWith ?? null,
    to,
    subject: mailSubject(input),
    bodyText: mailBody(input),
    attachmentName: fileName,
    attachment: pdf,
    createdBy: caller.userId,
  });
  return attemptSend(deps, caller, mail.id);
}

export async function retryReportMail(
  deps: UseCaseDeps,
  caller: Caller,
  mailId: string,
): Promise<ReportMail> {
  return attemptSend(deps, caller, mailId);
}

export async function reportMails(
  deps: UseCaseDeps,
  caller: Caller,
  sessionId: string,
): Promise<ReportMail[]> {
  await loadSession(deps, caller, sessionId);
  return listReportMails(deps.sequelize, caller.clinicId, sessionId);
}
