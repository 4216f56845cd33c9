import { clientColumns, consentColumns } from './clients';
import { selectInto } from './columns';
import { sessionColumns } from './sessions';

// SQLite names a result column after its AS clause when it has one, letter case kept
// (https://www.sqlite.org/c3ref/column_name.html), so `first_name AS "firstName"` reads into `firstName`.
test('when a column is in snake_case, then it is read under the record field of the same name in camelCase', () => {
  expect(clientColumns).toBe(
    'id, first_name AS "firstName", last_name AS "lastName", date_of_birth AS "dateOfBirth", email, phone, origin, ' +
      'version, created_at AS "createdAt", updated_at AS "updatedAt"',
  );
  expect(consentColumns).toContain('signed_on AS "signedOn"');
  expect(sessionColumns).toContain('current_site AS "currentSite"');
});

test('when a field is computed, then its expression is read under the field’s name', () => {
  type Row = { id: string; hasPlainClip: number };
  expect(selectInto<Row>()('id', { hasPlainClip: 'clip_wav IS NOT NULL' })).toBe(
    'id, clip_wav IS NOT NULL AS "hasPlainClip"',
  );
});

test('when the list lacks a field of the record or names one it lacks, then it does not typecheck', () => {
  type Row = { id: string; firstName: string };
  // @ts-expect-error firstName has no column
  selectInto<Row>()('id');
  // @ts-expect-error last_name is not a field of Row
  selectInto<Row>()('id first_name last_name');
  expect(selectInto<Row>()('id first_name')).toBe('id, first_name AS "firstName"');
});
