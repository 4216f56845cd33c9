import { DataTypes, Sequelize, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

const CHANGE_SEQ = 'sync_change_seq';
const SYNCABLE = ['clients', 'consents', 'recording_sessions', 'site_recordings'] as const;

const id = () => ({ type: DataTypes.UUID, primaryKey: true, allowNull: false });
const now = () => Sequelize.fn('now');
const timestamps = () => ({
  created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now() },
  updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now() },
});
const clinicRef = () => ({
  type: DataTypes.UUID,
  allowNull: false,
  references: { model: 'clinics', key: 'id' },
  onDelete: 'CASCADE',
});
// Rows a device can create: the id is made on the device; change_seq orders them for pull.
const syncable = () => ({
  clinic_id: clinicRef(),
  version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
  ...timestamps(),
  deleted_at: { type: DataTypes.DATE, allowNull: true },
  change_seq: {
    type: DataTypes.BIGINT,
    allowNull: false,
    defaultValue: Sequelize.literal(`nextval('${CHANGE_SEQ}')`),
  },
});

export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.transaction(async (transaction) => {
    const q = (text: string) => qi.sequelize.query(text, { transaction });
    const opts = { transaction };
    await q(`CREATE SEQUENCE ${CHANGE_SEQ} AS bigint`);

    await qi.createTable(
      'clinics',
      { id: id(), name: { type: DataTypes.TEXT, allowNull: false }, ...timestamps() },
      opts,
    );

    await qi.createTable(
      'users',
      {
        id: id(),
        clinic_id: clinicRef(),
        email: { type: DataTypes.TEXT, allowNull: false, unique: true },
        name: { type: DataTypes.TEXT, allowNull: false },
        role: { type: DataTypes.TEXT, allowNull: false },
        password_hash: { type: DataTypes.TEXT, allowNull: false },
        disabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        ...timestamps(),
      },
      opts,
    );
    await q(
      `ALTER TABLE users ADD CONSTRAINT users_role_check CHECK (role IN ('operator','practitioner','admin'))`,
    );
    await q(`ALTER TABLE users ADD CONSTRAINT users_email_lower_check CHECK (email = lower(email))`);
    await qi.addIndex('users', ['clinic_id'], opts);

    await qi.createTable(
      'refresh_tokens',
      {
        id: id(),
        user_id: {
          type: DataTypes.UUID,
          allowNull: false,
          references: { model: 'users', key: 'id' },
          onDelete: 'CASCADE',
        },
        family_id: { type: DataTypes.UUID, allowNull: false },
        token_hash: { type: DataTypes.TEXT, allowNull: false, unique: true },
        expires_at: { type: DataTypes.DATE, allowNull: false },
        revoked_at: { type: DataTypes.DATE, allowNull: true },
        replaced_by: { type: DataTypes.UUID, allowNull: true },
        created_ip: { type: DataTypes.TEXT, allowNull: true },
        ...timestamps(),
      },
      opts,
    );
    await qi.addIndex('refresh_tokens', ['user_id'], opts);
    await qi.addIndex('refresh_tokens', ['family_id'], opts);

    await qi.createTable(
      'consent_texts',
      {
        id: id(),
        clinic_id: clinicRef(),
        version: { type: DataTypes.INTEGER, allowNull: false },
        title: { type: DataTypes.TEXT, allowNull: false },
        body: { type: DataTypes.TEXT, allowNull: false },
        is_current: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        published_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now() },
        ...timestamps(),
      },
      opts,
    );
    await qi.addIndex('consent_texts', ['clinic_id', 'version'], { ...opts, unique: true });
    await q(`CREATE UNIQUE INDEX consent_texts_one_current ON consent_texts (clinic_id) WHERE is_current`);

    await qi.createTable(
      'clients',
      {
        id: id(),
        first_name: { type: DataTypes.TEXT, allowNull: false },
        last_name: { type: DataTypes.TEXT, allowNull: false },
        date_of_birth: { type: DataTypes.DATEONLY, allowNull: true },
        email: { type: DataTypes.TEXT, allowNull: true },
        phone: { type: DataTypes.TEXT, allowNull: true },
        notes: { type: DataTypes.TEXT, allowNull: true },
        ...syncable(),
      },
      opts,
    );

    await qi.createTable(
      'consents',
      {
        id: id(),
        client_id: {
          type: DataTypes.UUID,
          allowNull: false,
          references: { model: 'clients', key: 'id' },
          onDelete: 'CASCADE',
        },
        consent_text_id: {
          type: DataTypes.UUID,
          allowNull: false,
          references: { model: 'consent_texts', key: 'id' },
        },
        consent_text_version: { type: DataTypes.INTEGER, allowNull: false },
        typed_name: { type: DataTypes.TEXT, allowNull: false },
        consent_date: { type: DataTypes.DATEONLY, allowNull: false },
        recorded_by: {
          type: DataTypes.UUID,
          allowNull: true,
          references: { model: 'users', key: 'id' },
          onDelete: 'SET NULL',
        },
        ...syncable(),
      },
      opts,
    );

    await qi.createTable(
      'recording_sessions',
      {
        id: id(),
        client_id: {
          type: DataTypes.UUID,
          allowNull: false,
          references: { model: 'clients', key: 'id' },
          onDelete: 'CASCADE',
        },
        operator_id: {
          type: DataTypes.UUID,
          allowNull: true,
          references: { model: 'users', key: 'id' },
          onDelete: 'SET NULL',
        },
        status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'in_progress' },
        started_at: { type: DataTypes.DATE, allowNull: false },
        finished_at: { type: DataTypes.DATE, allowNull: true },
        findings: { type: DataTypes.TEXT, allowNull: true },
        plan: { type: DataTypes.TEXT, allowNull: true },
        follow_up_date: { type: DataTypes.DATEONLY, allowNull: true },
        reviewed_by: {
          type: DataTypes.UUID,
          allowNull: true,
          references: { model: 'users', key: 'id' },
          onDelete: 'SET NULL',
        },
        reviewed_at: { type: DataTypes.DATE, allowNull: true },
        ...syncable(),
      },
      opts,
    );
    await q(
      `ALTER TABLE recording_sessions ADD CONSTRAINT recording_sessions_status_check CHECK (status IN ('in_progress','completed','reviewed','cancelled'))`,
    );

    await qi.createTable(
      'clip_blobs',
      {
        sha256: { type: DataTypes.TEXT, primaryKey: true, allowNull: false },
        clinic_id: clinicRef(),
        size_bytes: { type: DataTypes.BIGINT, allowNull: false },
        content_type: { type: DataTypes.TEXT, allowNull: false },
        storage_key: { type: DataTypes.TEXT, allowNull: false },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'receiving' },
        ...timestamps(),
      },
      opts,
    );
    await q(
      `ALTER TABLE clip_blobs ADD CONSTRAINT clip_blobs_sha256_check CHECK (sha256 ~ '^[0-9a-f]{64}$')`,
    );
    await q(
      `ALTER TABLE clip_blobs ADD CONSTRAINT clip_blobs_state_check CHECK (state IN ('receiving','stored','failed'))`,
    );
    await qi.addIndex('clip_blobs', ['clinic_id'], opts);

    await qi.createTable(
      'site_recordings',
      {
        id: id(),
        session_id: {
          type: DataTypes.UUID,
          allowNull: false,
          references: { model: 'recording_sessions', key: 'id' },
          onDelete: 'CASCADE',
        },
        site: { type: DataTypes.TEXT, allowNull: false },
        quality_verdict: { type: DataTypes.TEXT, allowNull: true },
        clip_sha256: { type: DataTypes.TEXT, allowNull: true },
        clip_state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'none' },
        duration_s: { type: DataTypes.REAL, allowNull: true },
        recorded_at: { type: DataTypes.DATE, allowNull: true },
        analysis: { type: DataTypes.JSONB, allowNull: true },
        skipped_reason: { type: DataTypes.TEXT, allowNull: true },
        keep_anyway_note: { type: DataTypes.TEXT, allowNull: true },
        ...syncable(),
      },
      opts,
    );
    await q(
      `ALTER TABLE site_recordings ADD CONSTRAINT site_recordings_site_check CHECK (site IN ('mitral','tricuspid','aortic','pulmonic'))`,
    );
    await q(
      `ALTER TABLE site_recordings ADD CONSTRAINT site_recordings_verdict_check CHECK (quality_verdict IS NULL OR quality_verdict IN ('good','usable','retake'))`,
    );
    await q(
      `ALTER TABLE site_recordings ADD CONSTRAINT site_recordings_clip_state_check CHECK (clip_state IN ('none','pending','uploading','stored','failed'))`,
    );
    await q(
      `CREATE UNIQUE INDEX site_recordings_one_per_site ON site_recordings (session_id, site) WHERE deleted_at IS NULL`,
    );

    await qi.createTable(
      'applied_mutations',
      {
        mutation_id: { type: DataTypes.UUID, primaryKey: true, allowNull: false },
        clinic_id: clinicRef(),
        user_id: {
          type: DataTypes.UUID,
          allowNull: true,
          references: { model: 'users', key: 'id' },
          onDelete: 'SET NULL',
        },
        entity: { type: DataTypes.TEXT, allowNull: false },
        row_id: { type: DataTypes.UUID, allowNull: false },
        result: { type: DataTypes.JSONB, allowNull: false },
        applied_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now() },
      },
      opts,
    );

    await qi.createTable(
      'sync_conflicts',
      {
        id: id(),
        clinic_id: clinicRef(),
        entity: { type: DataTypes.TEXT, allowNull: false },
        row_id: { type: DataTypes.UUID, allowNull: false },
        mutation_id: { type: DataTypes.UUID, allowNull: true },
        server_version: { type: DataTypes.JSONB, allowNull: false },
        client_version: { type: DataTypes.JSONB, allowNull: false },
        status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'open' },
        resolution: { type: DataTypes.JSONB, allowNull: true },
        resolved_by: {
          type: DataTypes.UUID,
          allowNull: true,
          references: { model: 'users', key: 'id' },
          onDelete: 'SET NULL',
        },
        resolved_at: { type: DataTypes.DATE, allowNull: true },
        ...timestamps(),
      },
      opts,
    );
    await q(
      `ALTER TABLE sync_conflicts ADD CONSTRAINT sync_conflicts_status_check CHECK (status IN ('open','resolved'))`,
    );
    await qi.addIndex('sync_conflicts', ['clinic_id', 'status'], opts);

    await qi.createTable(
      'audit_events',
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        clinic_id: {
          type: DataTypes.UUID,
          allowNull: true,
          references: { model: 'clinics', key: 'id' },
          onDelete: 'CASCADE',
        },
        user_id: { type: DataTypes.UUID, allowNull: true },
        action: { type: DataTypes.TEXT, allowNull: false },
        entity: { type: DataTypes.TEXT, allowNull: true },
        entity_id: { type: DataTypes.TEXT, allowNull: true },
        occurred_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now() },
        ip: { type: DataTypes.TEXT, allowNull: true },
        details: { type: DataTypes.JSONB, allowNull: true },
      },
      opts,
    );
    await qi.addIndex('audit_events', ['clinic_id', 'occurred_at'], opts);

    // The log is append-only: the database itself refuses edits (a clinic's erase removes the whole clinic by cascade).
    await q(`CREATE FUNCTION audit_events_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN RAISE EXCEPTION 'audit_events is append-only'; END $$`);
    await q(
      `CREATE TRIGGER audit_events_no_update BEFORE UPDATE ON audit_events FOR EACH ROW EXECUTE FUNCTION audit_events_append_only()`,
    );
    await q(`CREATE TRIGGER audit_events_no_delete BEFORE DELETE ON audit_events FOR EACH ROW WHEN (pg_trigger_depth() = 0)
      EXECUTE FUNCTION audit_events_append_only()`);

    // Every change takes a fresh number from one sequence, so a pull can ask "what changed after N".
    await q(`CREATE FUNCTION bump_change_seq() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN NEW.change_seq := nextval('${CHANGE_SEQ}'); RETURN NEW; END $$`);
    for (const table of SYNCABLE) {
      await q(`CREATE INDEX ${table}_clinic_change_seq ON ${table} (clinic_id, change_seq)`);
      await q(
        `CREATE TRIGGER ${table}_change_seq BEFORE UPDATE ON ${table} FOR EACH ROW EXECUTE FUNCTION bump_change_seq()`,
      );
    }
  });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.transaction(async (transaction) => {
    for (const table of [
      'audit_events',
      'sync_conflicts',
      'applied_mutations',
      'site_recordings',
      'clip_blobs',
      'recording_sessions',
      'consents',
      'clients',
      'consent_texts',
      'refresh_tokens',
      'users',
      'clinics',
    ]) {
      await qi.dropTable(table, { transaction });
    }
    await qi.sequelize.query(
      'DROP FUNCTION IF EXISTS bump_change_seq(); DROP FUNCTION IF EXISTS audit_events_append_only();',
      {
        transaction,
      },
    );
    await qi.sequelize.query(`DROP SEQUENCE IF EXISTS ${CHANGE_SEQ}`, { transaction });
  });
};
