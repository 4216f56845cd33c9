// The admin's Mailbox: a view of the local SMTP fake, which holds every clinic's mail in one list. Each clinic
// sees only the mail the server sent for it; anything it cannot tie to the caller's clinic is never shown
// (OWASP ASVS 4.0.3 V4.2.1: access to data is limited to the caller's own records, IDOR included).
import nodemailer from 'nodemailer';
import request from 'supertest';
import type { Role } from '@/shared/protocol';
import { mailboxListSchema, mailboxMessageDetailSchema } from '@/shared/protocol/review';
import { CLINIC_HEADER, createSmtpMailService } from '@/sync-server/src/services/mail';
import { startPracticeFakes, type PracticeFakes } from './helpers/practice-fakes';
import { addClient, addSession } from './helpers/review-fixtures';
import { makeClinic, makeTestContext, tokensFor, type TestClinic } from './helpers/test-app';

const ctx = makeTestContext();
let fakes: PracticeFakes;
let clinicA: TestClinic;
let clinicB: TestClinic;
let tokensA: Record<Role, string>;
let tokensB: Record<Role, string>;
const sent = { reportId: '', invitationId: '', unmarkedId: '' };

const auth = (token: string) => ({ authorization: `Bearer ${token}` });
const mailbox = (path: string, token: string) =>
  request(ctx.app).get(`/api/admin/mailbox/messages${path}`).set(auth(token));

/** The fake's own id of the newest message to `address`, read from the fake directly, not through the view. */
const fakeIdTo = (address: string) =>
  fakes.mail.messages.filter((m) => m.envelopeTo.includes(address)).at(-1)!.id;

beforeAll(async () => {
  fakes = await startPracticeFakes(ctx);
  clinicA = await makeClinic('Mail A');
  clinicB = await makeClinic('Mail B');
  tokensA = await tokensFor(ctx.app, clinicA);
  tokensB = await tokensFor(ctx.app, clinicB);

  const clientId = await addClient(clinicA.id, 'Isolde', 'Farrow', 'isolde.farrow@client.fourpoint.test');
  const sessionId = await addSession({
    clinicId: clinicA.id,
    clientId,
    startedAt: new Date('2026-11-03T10:00:00Z'),
  });
  const report = await request(ctx.app)
    .post(`/api/review/sessions/${sessionId}/report-mails`)
    .set(auth(tokensA.practitioner))
    .send({});
  expect(report.status).toBe(201);
  sent.reportId = fakeIdTo('isolde.farrow@client.fourpoint.test');

  const invitation = await request(ctx.app)
    .post('/api/team/invitations')
    .set(auth(tokensA.admin))
    .send({ email: 'new.admin@mail-a.fourpoint.test', name: 'Nia Holloway', role: 'admin' });
  expect(invitation.status).toBe(201);
  sent.invitationId = fakeIdTo('new.admin@mail-a.fourpoint.test');

  // Mail the server did not send (someone else on the host speaking SMTP to the fake): it carries no clinic.
  const outsider = nodemailer.createTransport({
    host: '127.0.0.1',
    port: fakes.mail.smtpPort,
    ignoreTLS: true,
  });
  await outsider.sendMail({
    from: 'someone@elsewhere.test',
    to: 'anyone@elsewhere.test',
    subject: 'Not from the server',
    text: 'No clinic header.',
    attachments: [{ filename: 'x.txt', content: 'x' }],
  });
  outsider.close();
  sent.unmarkedId = fakeIdTo('anyone@elsewhere.test');
});
afterAll(async () => {
  await fakes.close();
  await ctx.close();
});

describe('what each clinic sees', () => {
  test('when clinic A’s admin lists the mailbox, then the report and the invitation A sent are there, the unmarked mail is not', async () => {
    const res = await mailbox('', tokensA.admin);
    expect(res.status).toBe(200);
    const ids = mailboxListSchema.parse(res.body).messages.map((m) => m.id);
    expect(ids).toEqual(expect.arrayContaining([sent.reportId, sent.invitationId]));
    expect(ids).not.toContain(sent.unmarkedId);
  });

  test('when clinic A’s admin opens the report mail and its PDF, then both come back', async () => {
    const detail = mailboxMessageDetailSchema.parse((await mailbox(`/${sent.reportId}`, tokensA.admin)).body);
    expect(detail.attachments[0].contentType).toBe('application/pdf');
    const pdf = await mailbox(`/${sent.reportId}/attachments/0`, tokensA.admin);
    expect(pdf.status).toBe(200);
    expect(
      Buffer.from(pdf.body as Buffer)
        .subarray(0, 5)
        .toString(),
    ).toBe('%PDF-');
  });

  test('when clinic B’s admin lists the mailbox, then none of A’s mail is there', async () => {
    const res = await mailbox('', tokensB.admin);
    expect(res.status).toBe(200);
    const { messages } = mailboxListSchema.parse(res.body);
    expect(messages.map((m) => m.id)).not.toContain(sent.reportId);
    expect(messages.map((m) => m.id)).not.toContain(sent.invitationId);
    expect(JSON.stringify(res.body)).not.toContain(clinicA.name);
  });

  test.each([
    ['the report mail', () => sent.reportId],
    ['the invitation', () => sent.invitationId],
  ])(
    'when clinic B’s admin asks for %s of clinic A by id, then it is the same 404 as an unknown id',
    async (_what, id) => {
      const unknown = await mailbox('/00000000-0000-4000-8000-000000000000', tokensB.admin);
      const message = await mailbox(`/${id()}`, tokensB.admin);
      const attachment = await mailbox(`/${id()}/attachments/0`, tokensB.admin);
      expect(message.status).toBe(404);
      expect(message.body).toEqual(unknown.body);
      expect(attachment.status).toBe(404);
      expect(attachment.body).toEqual(unknown.body);
    },
  );

  test('when mail carries no clinic, then no admin can open it or its attachment', async () => {
    for (const token of [tokensA.admin, tokensB.admin]) {
      expect((await mailbox(`/${sent.unmarkedId}`, token)).status).toBe(404);
      expect((await mailbox(`/${sent.unmarkedId}/attachments/0`, token)).status).toBe(404);
    }
  });

  test('when the server sends mail, then it carries the clinic it was sent for', () => {
    const header = CLINIC_HEADER.toLowerCase();
    expect(fakes.mail.messages.find((m) => m.id === sent.reportId)!.headers[header]).toBe(clinicA.id);
    expect(fakes.mail.messages.find((m) => m.id === sent.invitationId)!.headers[header]).toBe(clinicA.id);
  });
});

describe('the mailbox is off unless mail goes to the local fake', () => {
  const mailboxUrl = () => `http://127.0.0.1:${fakes.mail.httpPort}`;
  const relay = (host: string, port: number) =>
    createSmtpMailService({ host, port, from: 'r@fourpoint.test' });
  afterEach(() =>
    Object.assign(ctx.services, { mail: relay('127.0.0.1', fakes.mail.smtpPort), mailboxUrl: mailboxUrl() }),
  );

  const expectOff = async () => {
    for (const path of ['', `/${sent.reportId}`, `/${sent.reportId}/attachments/0`]) {
      const res = await mailbox(path, tokensA.admin);
      expect(res.status).toBe(404);
      expect(res.body.error).toMatchObject({
        code: 'no_mailbox',
        message: expect.stringMatching(/real mail relay/),
      });
    }
  };

  test('when no mailbox address is configured, then it says there is no local mailbox', async () => {
    Object.assign(ctx.services, { mailboxUrl: null });
    await expectOff();
  });

  test('when mail goes to a real relay while the fake’s port is still configured, then the view is off', async () => {
    Object.assign(ctx.services, { mail: relay('smtp.relay.example.com', 587), mailboxUrl: mailboxUrl() });
    await expectOff();
  });

  test('when mail goes to another SMTP server on this host, then the view is off', async () => {
    Object.assign(ctx.services, {
      mail: relay('127.0.0.1', fakes.mail.smtpPort + 1),
      mailboxUrl: mailboxUrl(),
    });
    await expectOff();
  });
});
