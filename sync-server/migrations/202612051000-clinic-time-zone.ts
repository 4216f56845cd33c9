import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// The clinic's time zone (an IANA name): the day a visit falls on, "today" for follow-up dates and reminders,
// and the clock times on screens, reports and e-mails are all written in it. Existing clinics keep UTC, the
// zone the server used before, until their admin chooses one in Settings.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`ALTER TABLE clinic_settings ADD COLUMN time_zone text NULL`);
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`ALTER TABLE clinic_settings DROP COLUMN IF EXISTS time_zone`);
};
