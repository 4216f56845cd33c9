// What this proves: a phone that took consent on the built-in wording (shown before it fetched the clinic's
// own) can send that consent: every clinic has the built-in wording as its version 1, made with the clinic, and
// clinics made before that get it from a migration. The consent names the row id the clinic's list gives.
import { randomUUID } from 'node:crypto';
import axios from 'axios';
import { QueryTypes } from 'sequelize';
import { consentText, consentTextVersion } from '@/shared/consent/consent-text';
import { consentTextListResponseSchema } from '@/shared/protocol/practice';
import { up as addBuiltInConsentText } from '@/sync-server/migrations/202612061000-built-in-consent-text';
import { clientFields, clinicWithTokens, mutation, syncServerPerFile } from './sync-helpers/devices';

const sync = syncServerPerFile();
const push = sync.push;

async function consentTexts(token: string) {
  const res = await axios.get(`${sync.server.url}/api/consent-texts`, {
    headers: { authorization: `Bearer ${token}` },
  });
  return consentTextListResponseSchema.parse(res.data).texts;
}

test('when a clinic is new, then its wording in force is the built-in one, and a consent signed on it is accepted', async () => {
  const { operator } = await clinicWithTokens(sync.server, 'BuiltInConsent');
  const texts = await consentTexts(operator);
  expect(texts).toHaveLength(1);
  const [inForce] = texts;
  expect(inForce).toMatchObject({
    version: consentTextVersion,
    isCurrent: true,
    body: consentText.join('\n\n'),
  });

  // As the phone sends it: the consent names the row of the version signed, from the list it fetched.
  const clientId = randomUUID();
  const result = await push(operator, [
    mutation('clients', clientId, clientFields(randomUUID().slice(0, 6))),
    mutation('consents', randomUUID(), {
      clientId,
      consentTextId: inForce.id,
      consentTextVersion: consentTextVersion,
      typedName: 'Ada Testwood',
      consentDate: '2026-11-30',
    }),
  ]);
  expect(result.results.map((r) => r.status)).toEqual(['applied', 'applied']);
});

test('when a consent names a wording id the clinic does not have, then it is refused as missing its parent', async () => {
  const { operator } = await clinicWithTokens(sync.server, 'UnknownWording');
  const clientId = randomUUID();
  const result = await push(operator, [
    mutation('clients', clientId, clientFields(randomUUID().slice(0, 6))),
    mutation('consents', randomUUID(), {
      clientId,
      consentTextId: randomUUID(),
      consentTextVersion: 1,
      typedName: 'Ada Testwood',
      consentDate: '2026-11-30',
    }),
  ]);
  expect(result.results[1]).toMatchObject({ status: 'rejected', code: 'missing_parent' });
});

test('when the migration runs on a clinic made without any wording, then it gets the built-in one, and clinics with wording are left alone', async () => {
  const { sequelize } = sync.server.ctx;
  const bare = randomUUID();
  await sequelize.query(`INSERT INTO clinics (id, name) VALUES (:id, 'Made before the fix')`, {
    replacements: { id: bare },
  });
  const { clinic: withWording } = await clinicWithTokens(sync.server, 'HasWording');
  const countOf = async (clinicId: string) =>
    (
      await sequelize.query<{ n: string }>(
        `SELECT count(*) AS n FROM consent_texts WHERE clinic_id = :clinicId`,
        {
          replacements: { clinicId },
          type: QueryTypes.SELECT,
        },
      )
    )[0].n;
  expect(await countOf(bare)).toBe('0');

  await addBuiltInConsentText({ context: sequelize.getQueryInterface(), name: 'test', path: '' });

  const [row] = await sequelize.query<{ version: number; is_current: boolean; body: string }>(
    `SELECT version, is_current, body FROM consent_texts WHERE clinic_id = :bare`,
    { replacements: { bare }, type: QueryTypes.SELECT },
  );
  expect(row).toEqual({ version: 1, is_current: true, body: consentText.join('\n\n') });
  expect(await countOf(withWording.id)).toBe('1');
});
