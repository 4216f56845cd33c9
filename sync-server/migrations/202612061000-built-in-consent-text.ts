import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// Phones show a built-in consent wording (version 1) until they have fetched the clinic's own, and a consent
// must name a consent_texts row of its clinic. A clinic that never published a wording gets the built-in one as
// its version 1, as every clinic created from now on does (clinics-repository). The wording is copied here as it
// stood when this migration landed: applied history does not follow later edits of the app's text.
const TITLE = 'Heart-sound recording consent';
const BODY = [
  'I agree that the practice records the sounds of my heart at four places on my chest, stores the recordings and the measurements made from them, and uses them for wellness follow-up over my visits.',
  'I understand that Fourpoint is not a diagnostic device, and that anything unusual is passed on as a suggestion to see a licensed clinician.',
  'I can ask the practice for a copy of my recordings, or to erase them, at any time.',
].join('\n\n');

export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(
    `INSERT INTO consent_texts (id, clinic_id, version, title, body, is_current)
     SELECT gen_random_uuid(), c.id, 1, :title, :body, true FROM clinics c
     WHERE NOT EXISTS (SELECT 1 FROM consent_texts t WHERE t.clinic_id = c.id)`,
    { replacements: { title: TITLE, body: BODY } },
  );
};

// Nothing to undo safely: by then consents may name these rows.
export const down: MigrationFn<QueryInterface> = async () => {};
