import type { QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// A session that is cancelled (or deleted) after it used a package visit gives the visit back; one that is
// brought back from cancelled uses a visit again, by the same rule as a new session (oldest active package
// with visits left). A refunded package is not credited: its visits are no longer the client's to use.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.transaction(async (transaction) => {
    const q = (sql: string) => qi.sequelize.query(sql, { transaction });
    await q(`CREATE FUNCTION settle_package_visit_on_change() RETURNS trigger LANGUAGE plpgsql AS $$
      DECLARE
        was_counted boolean := OLD.status <> 'cancelled' AND OLD.deleted_at IS NULL;
        is_counted boolean := NEW.status <> 'cancelled' AND NEW.deleted_at IS NULL;
        pkg uuid;
      BEGIN
        IF was_counted AND NOT is_counted THEN
          DELETE FROM package_visits WHERE session_id = NEW.id RETURNING package_id INTO pkg;
          IF pkg IS NOT NULL THEN
            UPDATE visit_packages SET visits_used = visits_used - 1, updated_at = now()
              WHERE id = pkg AND status = 'active' AND visits_used > 0;
          END IF;
        ELSIF is_counted AND NOT was_counted THEN
          SELECT id INTO pkg FROM visit_packages
            WHERE client_id = NEW.client_id AND clinic_id = NEW.clinic_id AND status = 'active' AND visits_used < visits_total
            ORDER BY created_at, id LIMIT 1 FOR UPDATE;
          IF pkg IS NOT NULL THEN
            INSERT INTO package_visits (session_id, package_id) VALUES (NEW.id, pkg) ON CONFLICT DO NOTHING;
            IF FOUND THEN UPDATE visit_packages SET visits_used = visits_used + 1, updated_at = now() WHERE id = pkg; END IF;
          END IF;
        END IF;
        RETURN NEW;
      END $$`);
    await q(`CREATE TRIGGER recording_sessions_settle_package_visit
      AFTER UPDATE OF status, deleted_at ON recording_sessions
      FOR EACH ROW EXECUTE FUNCTION settle_package_visit_on_change()`);
  });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(
    `DROP TRIGGER IF EXISTS recording_sessions_settle_package_visit ON recording_sessions;
     DROP FUNCTION IF EXISTS settle_package_visit_on_change();`,
  );
};
