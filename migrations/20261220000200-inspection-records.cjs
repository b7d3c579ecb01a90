'use strict';
// Inspection records as evidence: who inspected (a qualified user or an outside inspection body named on the
// record), who entered it, the mark applied, and corrections as amendments with a reason — never edits.
// A record's facts cannot change once written (a trigger refuses it); only the references that other tables'
// deletions clear (inspector, site, scan event) may become NULL. A leakproofness test below the minimum of
// ADR/RID 6.5.6.7.3 (20 kPa gauge, 10 minutes) is not a leakproofness test and is refused by the schema too.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE scan_events DROP CONSTRAINT scan_events_action_check;
      ALTER TABLE scan_events ADD CONSTRAINT scan_events_action_check CHECK (action IN ('register', 'receive', 'prep_check', 'fit_liner', 'dispatch',
        'deliver', 'fill_seal', 'discharge', 'fold', 'collect', 'quarantine', 'send_to_repair', 'release', 'retire', 'mark_missing', 'mark_found', 'inspect'));
      ALTER TABLE inspections
        ADD COLUMN inspection_body  VARCHAR(160),
        ADD COLUMN recorded_by      INTEGER REFERENCES users(id) ON DELETE SET NULL,
        ADD COLUMN test_mark        VARCHAR(60),
        ADD COLUMN amends_id        INTEGER REFERENCES inspections(id) ON DELETE RESTRICT,
        ADD COLUMN amendment_reason TEXT,
        ADD CONSTRAINT inspections_leak_test_minimum
          CHECK (leak_test_pressure_kpa IS NULL OR (leak_test_pressure_kpa >= 20 AND leak_test_minutes >= 10)),
        ADD CONSTRAINT inspections_leak_test_result
          CHECK ((leak_test_pressure_kpa IS NULL) = (leak_test_passed IS NULL)),
        ADD CONSTRAINT inspections_amendment_has_reason
          CHECK ((amends_id IS NULL) = (amendment_reason IS NULL) AND (amendment_reason IS NULL OR length(trim(amendment_reason)) >= 5)),
        ADD CONSTRAINT inspections_body_named
          CHECK (inspection_body IS NULL OR length(trim(inspection_body)) >= 2);
      CREATE INDEX inspections_amends ON inspections (amends_id) WHERE amends_id IS NOT NULL;

      CREATE FUNCTION inspections_never_edited() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF TG_OP = 'DELETE' THEN
          RAISE EXCEPTION 'inspection records are never deleted; record an amendment with a reason';
        END IF;
        IF (NEW.asset_id, NEW.kind, NEW.performed_on, NEW.checklist, NEW.leak_test_pressure_kpa, NEW.leak_test_minutes,
            NEW.leak_test_passed, NEW.outcome, NEW.next_intermediate_due, NEW.next_full_due, NEW.photo_ids, NEW.notes,
            NEW.inspection_body, NEW.test_mark, NEW.amends_id, NEW.amendment_reason, NEW.created_at)
           IS DISTINCT FROM
           (OLD.asset_id, OLD.kind, OLD.performed_on, OLD.checklist, OLD.leak_test_pressure_kpa, OLD.leak_test_minutes,
            OLD.leak_test_passed, OLD.outcome, OLD.next_intermediate_due, OLD.next_full_due, OLD.photo_ids, OLD.notes,
            OLD.inspection_body, OLD.test_mark, OLD.amends_id, OLD.amendment_reason, OLD.created_at)
           OR (NEW.inspector_id IS DISTINCT FROM OLD.inspector_id AND NEW.inspector_id IS NOT NULL)
           OR (NEW.recorded_by IS DISTINCT FROM OLD.recorded_by AND NEW.recorded_by IS NOT NULL)
           OR (NEW.site_id IS DISTINCT FROM OLD.site_id AND NEW.site_id IS NOT NULL)
           OR (NEW.scan_event_id IS DISTINCT FROM OLD.scan_event_id AND NEW.scan_event_id IS NOT NULL) THEN
          RAISE EXCEPTION 'inspection records are never edited; record an amendment with a reason';
        END IF;
        RETURN NEW;
      END $$;
      CREATE TRIGGER inspections_never_edited BEFORE UPDATE OR DELETE ON inspections
        FOR EACH ROW EXECUTE FUNCTION inspections_never_edited();
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DELETE FROM scan_events WHERE action = 'inspect';
      ALTER TABLE scan_events DROP CONSTRAINT scan_events_action_check;
      ALTER TABLE scan_events ADD CONSTRAINT scan_events_action_check CHECK (action IN ('register', 'receive', 'prep_check', 'fit_liner', 'dispatch',
        'deliver', 'fill_seal', 'discharge', 'fold', 'collect', 'quarantine', 'send_to_repair', 'release', 'retire', 'mark_missing', 'mark_found'));
      DROP TRIGGER IF EXISTS inspections_never_edited ON inspections;
      DROP FUNCTION IF EXISTS inspections_never_edited();
      DROP INDEX IF EXISTS inspections_amends;
      ALTER TABLE inspections
        DROP CONSTRAINT IF EXISTS inspections_body_named,
        DROP CONSTRAINT IF EXISTS inspections_amendment_has_reason,
        DROP CONSTRAINT IF EXISTS inspections_leak_test_result,
        DROP CONSTRAINT IF EXISTS inspections_leak_test_minimum,
        DROP COLUMN IF EXISTS amendment_reason,
        DROP COLUMN IF EXISTS amends_id,
        DROP COLUMN IF EXISTS test_mark,
        DROP COLUMN IF EXISTS recorded_by,
        DROP COLUMN IF EXISTS inspection_body;
    `);
  },
};
