import { DataTypes, Sequelize, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

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
const userRef = () => ({
  type: DataTypes.UUID,
  allowNull: true,
  references: { model: 'users', key: 'id' },
  onDelete: 'SET NULL',
});

export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.transaction(async (transaction) => {
    const q = (text: string) => qi.sequelize.query(text, { transaction });
    const opts = { transaction };

    await qi.createTable(
      'invitations',
      {
        id: id(),
        clinic_id: clinicRef(),
        email: { type: DataTypes.TEXT, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        role: { type: DataTypes.TEXT, allowNull: false },
        invited_by: userRef(),
        expires_at: { type: DataTypes.DATE, allowNull: false },
        accepted_at: { type: DataTypes.DATE, allowNull: true },
        accepted_user_id: userRef(),
        revoked_at: { type: DataTypes.DATE, allowNull: true },
        ...timestamps(),
      },
      opts,
    );
    await q(
      `ALTER TABLE invitations ADD CONSTRAINT invitations_role_check CHECK (role IN ('operator','practitioner','admin'))`,
    );
    await qi.addIndex('invitations', ['clinic_id', 'created_at'], opts);

    await qi.createTable(
      'clinic_settings',
      {
        clinic_id: { ...clinicRef(), primaryKey: true },
        address: { type: DataTypes.TEXT, allowNull: true },
        logo_data_url: { type: DataTypes.TEXT, allowNull: true },
        retention_months: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 84 },
        reminder_days_before: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 3 },
        currency: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'usd' },
        offers: { type: DataTypes.JSONB, allowNull: true },
        ...timestamps(),
      },
      opts,
    );
    await q(
      `ALTER TABLE clinic_settings ADD CONSTRAINT clinic_settings_retention_check CHECK (retention_months BETWEEN 1 AND 600)`,
    );
    await q(
      `ALTER TABLE clinic_settings ADD CONSTRAINT clinic_settings_reminder_check CHECK (reminder_days_before BETWEEN 0 AND 60)`,
    );

    await qi.createTable(
      'range_overrides',
      {
        id: id(),
        clinic_id: clinicRef(),
        metric: { type: DataTypes.TEXT, allowNull: false },
        site: { type: DataTypes.TEXT, allowNull: false },
        low: { type: DataTypes.DOUBLE, allowNull: true },
        high: { type: DataTypes.DOUBLE, allowNull: true },
        note: { type: DataTypes.TEXT, allowNull: true },
        updated_by: userRef(),
        ...timestamps(),
      },
      opts,
    );
    await qi.addIndex('range_overrides', ['clinic_id', 'metric', 'site'], { ...opts, unique: true });
    await q(
      `ALTER TABLE range_overrides ADD CONSTRAINT range_overrides_order_check CHECK (low IS NULL OR high IS NULL OR low <= high)`,
    );

    await qi.createTable(
      'payments',
      {
        id: id(),
        clinic_id: clinicRef(),
        // Kept (without the client) when a client is erased: the practice's books still need the amount.
        client_id: {
          type: DataTypes.UUID,
          allowNull: true,
          references: { model: 'clients', key: 'id' },
          onDelete: 'SET NULL',
        },
        offer_id: { type: DataTypes.TEXT, allowNull: false },
        description: { type: DataTypes.TEXT, allowNull: false },
        visits: { type: DataTypes.INTEGER, allowNull: false },
        amount_cents: { type: DataTypes.INTEGER, allowNull: false },
        currency: { type: DataTypes.TEXT, allowNull: false },
        status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'pending' },
        checkout_id: { type: DataTypes.TEXT, allowNull: true, unique: true },
        checkout_url: { type: DataTypes.TEXT, allowNull: true },
        payment_intent_id: { type: DataTypes.TEXT, allowNull: true },
        failure_reason: { type: DataTypes.TEXT, allowNull: true },
        created_by: userRef(),
        paid_at: { type: DataTypes.DATE, allowNull: true },
        refunded_at: { type: DataTypes.DATE, allowNull: true },
        ...timestamps(),
      },
      opts,
    );
    await q(
      `ALTER TABLE payments ADD CONSTRAINT payments_status_check CHECK (status IN ('pending','paid','failed','refunded','expired'))`,
    );
    await q(
      `ALTER TABLE payments ADD CONSTRAINT payments_amount_check CHECK (amount_cents > 0 AND visits > 0)`,
    );
    await qi.addIndex('payments', ['clinic_id', 'created_at'], opts);
    await qi.addIndex('payments', ['payment_intent_id'], opts);

    // Each provider event is applied once: its id is stored in the same transaction as its effect.
    await qi.createTable(
      'payment_events',
      {
        event_id: { type: DataTypes.TEXT, primaryKey: true, allowNull: false },
        type: { type: DataTypes.TEXT, allowNull: false },
        payment_id: {
          type: DataTypes.UUID,
          allowNull: true,
          references: { model: 'payments', key: 'id' },
          onDelete: 'SET NULL',
        },
        received_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now() },
      },
      opts,
    );

    await qi.createTable(
      'visit_packages',
      {
        id: id(),
        clinic_id: clinicRef(),
        client_id: {
          type: DataTypes.UUID,
          allowNull: false,
          references: { model: 'clients', key: 'id' },
          onDelete: 'CASCADE',
        },
        payment_id: {
          type: DataTypes.UUID,
          allowNull: true,
          unique: true,
          references: { model: 'payments', key: 'id' },
          onDelete: 'SET NULL',
        },
        description: { type: DataTypes.TEXT, allowNull: false },
        visits_total: { type: DataTypes.INTEGER, allowNull: false },
        visits_used: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'active' },
        ...timestamps(),
      },
      opts,
    );
    await q(
      `ALTER TABLE visit_packages ADD CONSTRAINT visit_packages_status_check CHECK (status IN ('active','refunded'))`,
    );
    await q(
      `ALTER TABLE visit_packages ADD CONSTRAINT visit_packages_used_check CHECK (visits_used >= 0 AND visits_used <= visits_total)`,
    );
    await qi.addIndex('visit_packages', ['client_id'], opts);

    await qi.createTable(
      'package_visits',
      {
        session_id: {
          type: DataTypes.UUID,
          primaryKey: true,
          allowNull: false,
          references: { model: 'recording_sessions', key: 'id' },
          onDelete: 'CASCADE',
        },
        package_id: {
          type: DataTypes.UUID,
          allowNull: false,
          references: { model: 'visit_packages', key: 'id' },
          onDelete: 'CASCADE',
        },
        created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now() },
      },
      opts,
    );

    // A recorded session uses one visit of the client's oldest active package with visits left. A trigger, so
    // every way a session arrives (sync push, seed, admin tools) counts it exactly once.
    await q(`CREATE FUNCTION use_package_visit() RETURNS trigger LANGUAGE plpgsql AS $$
      DECLARE pkg uuid;
      BEGIN
        IF NEW.status = 'cancelled' OR NEW.deleted_at IS NOT NULL THEN RETURN NEW; END IF;
        SELECT id INTO pkg FROM visit_packages
          WHERE client_id = NEW.client_id AND clinic_id = NEW.clinic_id AND status = 'active' AND visits_used < visits_total
          ORDER BY created_at, id LIMIT 1 FOR UPDATE;
        IF pkg IS NOT NULL THEN
          INSERT INTO package_visits (session_id, package_id) VALUES (NEW.id, pkg) ON CONFLICT DO NOTHING;
          IF FOUND THEN UPDATE visit_packages SET visits_used = visits_used + 1, updated_at = now() WHERE id = pkg; END IF;
        END IF;
        RETURN NEW;
      END $$`);
    await q(`CREATE TRIGGER recording_sessions_use_package_visit AFTER INSERT ON recording_sessions
      FOR EACH ROW EXECUTE FUNCTION use_package_visit()`);

    await qi.createTable(
      'follow_up_reminders',
      {
        id: id(),
        clinic_id: clinicRef(),
        client_id: {
          type: DataTypes.UUID,
          allowNull: false,
          references: { model: 'clients', key: 'id' },
          onDelete: 'CASCADE',
        },
        session_id: {
          type: DataTypes.UUID,
          allowNull: true,
          references: { model: 'recording_sessions', key: 'id' },
          onDelete: 'CASCADE',
        },
        follow_up_date: { type: DataTypes.DATEONLY, allowNull: false },
        status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'pending' },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        claimed_at: { type: DataTypes.DATE, allowNull: true },
        sent_at: { type: DataTypes.DATE, allowNull: true },
        message_id: { type: DataTypes.TEXT, allowNull: true },
        last_error: { type: DataTypes.TEXT, allowNull: true },
        ...timestamps(),
      },
      opts,
    );
    // The row that makes "never twice": one reminder per client and follow-up date, whatever the job does.
    await qi.addIndex('follow_up_reminders', ['client_id', 'follow_up_date'], { ...opts, unique: true });
    await q(
      `ALTER TABLE follow_up_reminders ADD CONSTRAINT follow_up_reminders_status_check CHECK (status IN ('pending','sending','sent','failed'))`,
    );

    await qi.createTable(
      'client_erasures',
      {
        id: id(),
        clinic_id: clinicRef(),
        client_id: { type: DataTypes.UUID, allowNull: false, unique: true },
        requested_by: userRef(),
        tombstoned_at: { type: DataTypes.DATE, allowNull: false },
        blobs_deleted: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        purged_at: { type: DataTypes.DATE, allowNull: true },
        ...timestamps(),
      },
      opts,
    );
  });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.transaction(async (transaction) => {
    await qi.sequelize.query(
      'DROP TRIGGER IF EXISTS recording_sessions_use_package_visit ON recording_sessions',
      { transaction },
    );
    await qi.sequelize.query('DROP FUNCTION IF EXISTS use_package_visit()', { transaction });
    for (const table of [
      'client_erasures',
      'follow_up_reminders',
      'package_visits',
      'visit_packages',
      'payment_events',
      'payments',
      'range_overrides',
      'clinic_settings',
      'invitations',
    ]) {
      await qi.dropTable(table, { transaction });
    }
  });
};
