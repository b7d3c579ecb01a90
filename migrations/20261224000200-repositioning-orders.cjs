'use strict';
// From plan to work: an approved repositioning plan, the depot-to-depot repositioning orders its lanes become
// (executed by transfer loads: each dispatch scan on a load between the two depots counts against the oldest open
// order of its lane and bin type, named in the scan's payload), and the truck runs its collection lanes
// become.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      CREATE TABLE repositioning_plans (
        id            SERIAL PRIMARY KEY,
        horizon_days  INTEGER NOT NULL CHECK (horizon_days BETWEEN 1 AND 90),
        cost_per_km   NUMERIC(8,2) NOT NULL CHECK (cost_per_km > 0),
        road_factor   NUMERIC(4,2) NOT NULL CHECK (road_factor >= 1),
        total_trucks  INTEGER NOT NULL CHECK (total_trucks >= 0),
        total_cost    NUMERIC(12,2) NOT NULL CHECK (total_cost >= 0),
        approved_by   INTEGER REFERENCES users(id) ON DELETE SET NULL,
        approved_at   TIMESTAMPTZ NOT NULL DEFAULT now()
      );

      CREATE TABLE repositioning_orders (
        id             SERIAL PRIMARY KEY,
        reference      VARCHAR(32) NOT NULL UNIQUE,
        plan_id        INTEGER NOT NULL REFERENCES repositioning_plans(id) ON DELETE RESTRICT,
        from_site_id   INTEGER NOT NULL REFERENCES sites(id) ON DELETE RESTRICT,
        to_site_id     INTEGER NOT NULL REFERENCES sites(id) ON DELETE RESTRICT,
        bin_type_id    INTEGER NOT NULL REFERENCES bin_types(id) ON DELETE RESTRICT,
        quantity       INTEGER NOT NULL CHECK (quantity BETWEEN 1 AND 10000),
        trucks         INTEGER NOT NULL CHECK (trucks >= 1),
        status         VARCHAR(10) NOT NULL DEFAULT 'open' CHECK (status IN ('open', 'done', 'cancelled')),
        done_at        TIMESTAMPTZ,
        version        INTEGER NOT NULL DEFAULT 0,
        created_at     TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at     TIMESTAMPTZ NOT NULL DEFAULT now(),
        CHECK (from_site_id <> to_site_id),
        CHECK (status <> 'done' OR done_at IS NOT NULL)
      );
      CREATE INDEX repositioning_orders_open ON repositioning_orders (from_site_id, to_site_id, bin_type_id) WHERE status = 'open';
      CREATE INDEX scan_events_repositioning ON scan_events (((payload->>'repositioningOrderId')::int)) WHERE action = 'dispatch' AND payload ? 'repositioningOrderId';

      ALTER TABLE truck_runs ADD COLUMN repositioning_plan_id INTEGER REFERENCES repositioning_plans(id) ON DELETE SET NULL;
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE truck_runs DROP COLUMN IF EXISTS repositioning_plan_id;
      DROP INDEX IF EXISTS scan_events_repositioning;
      DROP TABLE IF EXISTS repositioning_orders;
      DROP TABLE IF EXISTS repositioning_plans;
    `);
  },
};
