import { siteSchema } from '@/shared/protocol';
import {
  reportQuerySchema,
  reviewSessionQuerySchema,
  saveNotesRequestSchema,
  sendReportRequestSchema,
  setReferralFlagRequestSchema,
  type Comparison,
  type ReviewSessionDetail,
  type ReviewSessionPage,
  type Trace,
  type Trends,
} from '@/shared/protocol/review';
import { AppError } from '../errors';
import { callerOf } from '../middleware/authenticate';
import { listSessionsForReview } from '../use-cases/review/list-sessions';
import { listMailbox, readMailboxAttachment, readMailboxMessage } from '../use-cases/review/mailbox';
import { saveNotes } from '../use-cases/review/notes';
import { setReferralFlag } from '../use-cases/review/referral';
import {
  previewReportMail,
  renderReport,
  reportMails,
  retryReportMail,
  sendReport,
} from '../use-cases/review/report';
import {
  clientTrends,
  compareSessions,
  earlierVisits,
  sessionDetail,
  siteAudio,
  siteTrace,
} from '../use-cases/review/session-view';
import type { HandlerFactory } from './handlers';
import { rowId } from './row-ids';

const site = (value: unknown) => {
  const parsed = siteSchema.safeParse(value);
  if (!parsed.success)
    throw new AppError('not_found', 'Sites are mitral, tricuspid, aortic and pulmonic.', 404);
  return parsed.data;
};

export const reviewSessions: HandlerFactory = (deps) => async (req, res) => {
  const body: ReviewSessionPage = await listSessionsForReview(
    deps,
    callerOf(req),
    reviewSessionQuerySchema.parse(req.query),
  );
  res.json(body);
};

export const reviewSession: HandlerFactory = (deps) => async (req, res) => {
  const body: ReviewSessionDetail = await sessionDetail(deps, callerOf(req), rowId(req, 'sessionId'));
  res.json(body);
};

export const reviewTrace: HandlerFactory = (deps) => async (req, res) => {
  const body: Trace = await siteTrace(deps, callerOf(req), rowId(req, 'sessionId'), site(req.params.site));
  res.json(body);
};

export const reviewAudio: HandlerFactory = (deps) => async (req, res) => {
  const bytes = await siteAudio(deps, callerOf(req), rowId(req, 'sessionId'), site(req.params.site));
  res.setHeader('Cache-Control', 'private, no-store');
  res.type('audio/wav').send(Buffer.from(bytes));
};

export const reviewEarlier: HandlerFactory = (deps) => async (req, res) => {
  res.json({ visits: await earlierVisits(deps, callerOf(req), rowId(req, 'sessionId')) });
};

export const reviewCompare: HandlerFactory = (deps) => async (req, res) => {
  const body: Comparison = await compareSessions(
    deps,
    callerOf(req),
    rowId(req, 'sessionId'),
    rowId(req, 'otherId'),
  );
  res.json(body);
};

export const reviewTrends: HandlerFactory = (deps) => async (req, res) => {
  const body: Trends = await clientTrends(deps, callerOf(req), rowId(req, 'clientId'));
  res.json(body);
};

export const reviewSaveNotes: HandlerFactory = (deps) => async (req, res) => {
  const notes = await saveNotes(
    deps,
    callerOf(req),
    rowId(req, 'sessionId'),
    saveNotesRequestSchema.parse(req.body),
  );
  res.json({ notes });
};

export const reviewSetReferralFlag: HandlerFactory = (deps) => async (req, res) => {
  const referral = await setReferralFlag(
    deps,
    callerOf(req),
    rowId(req, 'sessionId'),
    setReferralFlagRequestSchema.parse(req.body),
  );
  res.json({ referral });
};

export const reviewReportMailPreview: HandlerFactory = (deps) => async (req, res) => {
  const { compareWith } = reportQuerySchema.parse(req.query);
  res.json({
    preview: await previewReportMail(deps, callerOf(req), rowId(req, 'sessionId'), compareWith ?? null),
  });
};

export const reviewReportPdf: HandlerFactory = (deps) => async (req, res) => {
  const { compareWith } = reportQuerySchema.parse(req.query);
  const { pdf, fileName } = await renderReport(
    deps,
    callerOf(req),
    rowId(req, 'sessionId'),
    compareWith ?? null,
  );
  res.setHeader('Content-Disposition', `attachment; filename="${fileName}"`);
  res.setHeader('Cache-Control', 'private, no-store');
  res.type('application/pdf').send(pdf);
};

export const reviewSendReport: HandlerFactory = (deps) => async (req, res) => {
  const mail = await sendReport(
    deps,
    callerOf(req),
    rowId(req, 'sessionId'),
    sendReportRequestSchema.parse(req.body ?? {}),
  );
  res.status(mail.state === 'sent' ? 201 : 202).json({ mail });
};

export const reviewReportMails: HandlerFactory = (deps) => async (req, res) => {
  res.json({ mails: await reportMails(deps, callerOf(req), rowId(req, 'sessionId')) });
};

export const reviewRetryMail: HandlerFactory = (deps) => async (req, res) => {
  res.json({ mail: await retryReportMail(deps, callerOf(req), rowId(req, 'mailId')) });
};

export const mailboxList: HandlerFactory = (deps) => async (req, res) => {
  res.json({ messages: await listMailbox(deps, callerOf(req)) });
};

export const mailboxMessage: HandlerFactory = (deps) => async (req, res) => {
  res.json(await readMailboxMessage(deps, callerOf(req), String(req.params.messageId)));
};

export const mailboxAttachment: HandlerFactory = (deps) => async (req, res) => {
  const { contentType, filename, body } = await readMailboxAttachment(
    deps,
    callerOf(req),
    String(req.params.messageId),
    String(req.params.index),
  );
  if (filename)
    res.setHeader('Content-Disposition', `inline; filename="${filename.replace(/["\\\r\n]/g, '')}"`);
  res.setHeader('Cache-Control', 'private, no-store');
  res.type(contentType).send(body);
};
