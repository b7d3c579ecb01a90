'use strict';
// Repair orders: what a failed inspection, a failed prep check or a damage report opens, the work recorded on
// it (append-only entries: parts, labour hours, cost, photos), and how it ended: closed only by a passed test
// after repair, retired, or withdrawn when a planner releases a bin nothing was done to. One open order per
// bin. The customer whose hire caused the damage is copied from the damage report, for billing.
// The operator's threshold above which a repair is proposed for retirement is a setting (NULL: never).

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      CREATE TABLE repair_orders (
        id                    SERIAL PRIMARY KEY,
        asset_id              INTEGER NOT NULL REFERENCES assets(id) ON DELETE RESTRICT,
        opened_from           VARCHAR(14) NOT NULL CHECK (opened_from IN ('inspection', 'prep_check', 'damage_report', 'planner')),
        inspection_id         INTEGER REFERENCES inspections(id) ON DELETE RESTRICT,
        scan_event_id         BIGINT REFERENCES scan_events(id) ON DELETE RESTRICT,
        damage_report_id      INTEGER REFERENCES damage_reports(id) ON DELETE RESTRICT,
        customer_id           INTEGER REFERENCES organisations(id) ON DELETE RESTRICT,
        fault                 TEXT NOT NULL CHECK (length(btrim(fault)) BETWEEN 1 AND 2000),
        estimated_cost        NUMERIC(12, 2) CHECK (estimated_cost >= 0),
        place                 VARCHAR(8) NOT NULL DEFAULT 'in_house' CHECK (place IN ('in_house', 'shop')),
        repair_site_id        INTEGER REFERENCES sites(id) ON DELETE RESTRICT,
        status                VARCHAR(10) NOT NULL DEFAULT 'open' CHECK (status IN ('open', 'closed', 'retired', 'withdrawn')),
        closing_inspection_id INTEGER REFERENCES inspections(id) ON DELETE RESTRICT,
        closed_at             TIMESTAMPTZ,
        closed_by             INTEGER REFERENCES users(id) ON DELETE SET NULL,
        close_note            TEXT CHECK (length(close_note) <= 500),
        opened_by             INTEGER REFERENCES users(id) ON DELETE SET NULL,
        version               INTEGER NOT NULL DEFAULT 0,
        created_at            TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at            TIMESTAMPTZ NOT NULL DEFAULT now(),
        CHECK ((place = 'shop') = (repair_site_id IS NOT NULL)),
        CHECK ((status = 'closed') = (closing_inspection_id IS NOT NULL)),
        CHECK ((status = 'open') = (closed_at IS NULL)),
        CHECK (opened_from <> 'inspection' OR inspection_id IS NOT NULL),
        CHECK (opened_from <> 'prep_check' OR scan_event_id IS NOT NULL),
        CHECK (opened_from <> 'damage_report' OR damage_report_id IS NOT NULL),
        CHECK (customer_id IS NULL OR damage_report_id IS NOT NULL)
      );
      CREATE UNIQUE INDEX repair_orders_one_open ON repair_orders (asset_id) WHERE status = 'open';
      CREATE UNIQUE INDEX repair_orders_damage_report ON repair_orders (damage_report_id) WHERE damage_report_id IS NOT NULL;
      CREATE INDEX repair_orders_status ON repair_orders (status, created_at DESC);
      CREATE INDEX repair_orders_customer ON repair_orders (customer_id, closed_at) WHERE customer_id IS NOT NULL;

      CREATE TABLE repair_work (
        id               SERIAL PRIMARY KEY,
        repair_order_id  INTEGER NOT NULL REFERENCES repair_orders(id) ON DELETE RESTRICT,
        performed_on     DATE NOT NULL,
        description      TEXT NOT NULL CHECK (length(btrim(description)) BETWEEN 1 AND 2000),
        parts            TEXT CHECK (length(parts) <= 2000),
        labour_hours     NUMERIC(6, 2) NOT NULL CHECK (labour_hours >= 0 AND labour_hours <= 999),
        cost             NUMERIC(12, 2) NOT NULL CHECK (cost >= 0),
        photo_ids        INTEGER[] NOT NULL DEFAULT '{}',
        recorded_by      INTEGER REFERENCES users(id) ON DELETE SET NULL,
        created_at       TIMESTAMPTZ NOT NULL DEFAULT now()
      );
      CREATE INDEX repair_work_order ON repair_work (repair_order_id, id);

      ALTER TABLE settings ADD COLUMN repair_retire_threshold NUMERIC(12, 2) DEFAULT 400 CHECK (repair_retire_threshold >= 0);
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE settings DROP COLUMN IF EXISTS repair_retire_threshold;
      DROP TABLE IF EXISTS repair_work;
      DROP TABLE IF EXISTS repair_orders;
    `);
  },
};
