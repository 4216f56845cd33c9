import fs from 'node:fs';
import path from 'node:path';
import type { AuditEventRow } from '@/shared/protocol/practice';
import { auditKinds, auditSentence, auditSentences } from './audit-words';

const event = (over: Partial<AuditEventRow>): AuditEventRow => ({
  id: '1',
  occurredAt: '2026-10-07T09:30:00.000Z',
  userId: 'u1',
  userName: 'Mira Castellan',
  action: 'client.read',
  entity: null,
  entityId: null,
  ip: '127.0.0.1',
  details: null,
  clientId: null,
  clientName: null,
  clientErased: false,
  subjectName: null,
  ...over,
});
const plain = { currency: 'eur' };

/** Every kind of event the server records, read from the server's own source. */
function kindsTheServerRecords(): string[] {
  const root = path.join(__dirname, '../../sync-server/src');
  const found = new Set<string>();
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (entry.name.endsWith('.ts') && !entry.name.endsWith('.test.ts')) {
        const source = fs.readFileSync(full, 'utf8');
        if (!source.includes('recordAuditEvent')) continue;
        const prefixes = auditKinds.map((k) => k.value).join('|');
        // Kinds are written on the line that names the action (`action: '…'`, `action: x ? '…' : '…'`, `audit('…')`).
        for (const line of source.split('\n').filter((l) => /action|audit\(/.test(l)))
          for (const m of line.matchAll(new RegExp(`'((?:${prefixes})\\.[a-z_.]+)'`, 'g'))) found.add(m[1]);
      }
    }
  };
  walk(root);
  return [...found].sort();
}

describe('audit sentences', () => {
  test('when the server records a kind of event, then the log has a sentence for it', () => {
    const kinds = kindsTheServerRecords();
    expect(kinds).toContain('auth.sign_in_failed');
    expect(kinds).toContain('review.report.download');
    expect(kinds.filter((k) => !(k in auditSentences))).toEqual([]);
  });

  test('when a team member opens a report, then the sentence names them and the client', () => {
    expect(
      auditSentence(
        event({
          action: 'review.report.download',
          entity: 'recording_sessions',
          clientName: 'Wren Halloway',
        }),
        plain,
      ),
    ).toBe('Mira Castellan opened the report of Wren Halloway');
  });

  test('when a sign-in fails, then the sentence names the account and gives no code', () => {
    const s = auditSentence(
      event({
        action: 'auth.sign_in_failed',
        subjectName: 'Oren Vale',
        details: { reason: 'wrong password' },
      }),
      plain,
    );
    expect(s).toBe('Someone tried to sign in to Oren Vale’s account with a wrong password');
  });

  test('when a payment is asked for, then the amount is money in the clinic’s currency, not cents', () => {
    const s = auditSentence(
      event({ action: 'payment.create', clientName: 'Wren Halloway', details: { amountCents: 25000 } }),
      plain,
    );
    expect(s).toBe('Mira Castellan asked Wren Halloway to pay €250.00');
    expect(s).not.toMatch(/amountCents|25000/);
  });

  test('when the client was erased, then the sentence says so without a name or an id', () => {
    const s = auditSentence(
      event({ action: 'client.read', clientId: '7d1c0b7e-0000-4000-8000-000000000000', clientErased: true }),
      plain,
    );
    expect(s).toBe('Mira Castellan opened the record of an erased client');
  });

  test('when an erasure is listed, then its counts are words', () => {
    const s = auditSentence(
      event({
        action: 'client.erase',
        clientErased: true,
        details: { visits: 6, recordings: 24, consents: 1, reportEmails: 3, rowsTombstoned: 40 },
      }),
      plain,
    );
    expect(s).toBe(
      'Mira Castellan erased a client and their records: 6 visits, 24 recordings, 1 signed consent and 3 report e-mails',
    );
  });

  test('when a kind has no words yet, then the sentence still reads as words, never the stored kind', () => {
    const s = auditSentence(event({ action: 'client.something_new', clientName: 'Wren Halloway' }), plain);
    expect(s).toBe('Mira Castellan did something to the records of Wren Halloway');
  });

  test('when no person did it, then the product is named, and a deleted account reads as a former team member', () => {
    expect(
      auditSentence(
        event({ action: 'client.purge', userId: null, userName: null, clientErased: true }),
        plain,
      ),
    ).toBe('The last traces of an erased client were removed, after the waiting period');
    expect(auditSentence(event({ action: 'auth.sign_in', userName: null }), plain)).toBe(
      'A former team member signed in',
    );
  });
});
