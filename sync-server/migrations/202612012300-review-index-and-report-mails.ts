import { DataTypes, Sequelize, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// The review list filters 10 000 sessions by what the analysis of record found. The analysis JSONB is large
// (it holds every beat), so the few numbers the filters need are generated columns the database keeps in step
// on every write, whoever writes (sync, seed, re-analysis).
const num = (key: string) =>
  `(CASE WHEN jsonb_typeof(analysis->'metrics'->'${key}') = 'number' THEN (analysis->'metrics'->>'${key}')::real END)`;
const GENERATED = [
  ['review_heart_rate', 'real', num('heartRateBpm')],
  [
    'review_irregular',
    'boolean',
    `(coalesce(analysis->'metrics'->'irregularRhythm' = 'true'::jsonb, false))`,
  ],
  ['review_systolic_activity', 'real', num('systolicActivity')],
  ['review_diastolic_activity', 'real', num('diastolicActivity')],
] as const;

export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.transaction(async (transaction) => {
    const q = (text: string) => qi.sequelize.query(text, { transaction });
    for (const [name, sqlType, expr] of GENERATED) {
      await q(`ALTER TABLE site_recordings ADD COLUMN ${name} ${sqlType} GENERATED ALWAYS AS ${expr} STORED`);
    }
    await q(
      `CREATE INDEX recording_sessions_review_started ON recording_sessions (clinic_id, started_at DESC, id) WHERE deleted_at IS NULL`,
    );
    await q(
      `CREATE INDEX recording_sessions_review_client ON recording_sessions (clinic_id, client_id, started_at) WHERE deleted_at IS NULL`,
    );
    await q(
      `CREATE INDEX recording_sessions_review_operator ON recording_sessions (clinic_id, operator_id) WHERE deleted_at IS NULL`,
    );
    await q(
      `CREATE INDEX recording_sessions_review_status ON recording_sessions (clinic_id, status, started_at DESC) WHERE deleted_at IS NULL`,
    );
    await q(`CREATE INDEX clients_review_name ON clients (clinic_id, lower(last_name), lower(first_name))`);

    // Every report e-mail is a row first and a send second, so a failed send keeps its message and can be retried.
    await qi.createTable(
      'report_mails',
      {
        id: { type: DataTypes.UUID, primaryKey: true, allowNull: false },
        clinic_id: {
          type: DataTypes.UUID,
          allowNull: false,
          references: { model: 'clinics', key: 'id' },
          onDelete: 'CASCADE',
        },
        session_id: {
          type: DataTypes.UUID,
          allowNull: false,
          references: { model: 'recording_sessions', key: 'id' },
          onDelete: 'CASCADE',
        },
        compare_session_id: { type: DataTypes.UUID, allowNull: true },
        to_address: { type: DataTypes.TEXT, allowNull: false },
        subject: { type: DataTypes.TEXT, allowNull: false },
        body_text: { type: DataTypes.TEXT, allowNull: false },
        attachment_name: { type: DataTypes.TEXT, allowNull: false },
        attachment: { type: DataTypes.BLOB, allowNull: false },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'queued' },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        last_error: { type: DataTypes.TEXT, allowNull: true },
        message_id: { type: DataTypes.TEXT, allowNull: true },
        created_by: {
          type: DataTypes.UUID,
          allowNull: true,
          references: { model: 'users', key: 'id' },
          onDelete: 'SET NULL',
        },
        sent_at: { type: DataTypes.DATE, allowNull: true },
        created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: Sequelize.fn('now') },
        updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: Sequelize.fn('now') },
      },
      { transaction },
    );
    await q(
      `ALTER TABLE report_mails ADD CONSTRAINT report_mails_state_check CHECK (state IN ('queued','sending','sent','failed'))`,
    );
    await q(`CREATE INDEX report_mails_session ON report_mails (clinic_id, session_id, created_at DESC)`);
  });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.transaction(async (transaction) => {
    const q = (text: string) => qi.sequelize.query(text, { transaction });
    await qi.dropTable('report_mails', { transaction });
    for (const index of [
      'recording_sessions_review_started',
      'recording_sessions_review_client',
      'recording_sessions_review_operator',
      'recording_sessions_review_status',
      'clients_review_name',
    ]) {
      await q(`DROP INDEX IF EXISTS ${index}`);
    }
    for (const [name] of GENERATED) await q(`ALTER TABLE site_recordings DROP COLUMN IF EXISTS ${name}`);
  });
};
