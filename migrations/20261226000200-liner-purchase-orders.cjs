'use strict';
// Purchase orders for liners and the reorder alerts. A purchase order asks a supplier for a quantity of one
// spec for one depot, wanted by the lead time from the day it is made; lots received against it name it, and
// what it still has to deliver is its quantity less their receipts (partial deliveries allowed). It closes when
// the deliveries reach the quantity, or a planner closes it short. A reorder alert is open for a depot and spec
// while on hand + in transit + on order is below the reorder point: one row per episode, so planners are mailed
// once when it opens and again only after it has cleared.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      CREATE TABLE liner_purchase_orders (
        id              SERIAL PRIMARY KEY,
        supplier_id     INTEGER NOT NULL REFERENCES liner_suppliers(id) ON DELETE RESTRICT,
        liner_spec_id   INTEGER NOT NULL REFERENCES liner_specs(id) ON DELETE RESTRICT,
        depot_site_id   INTEGER NOT NULL REFERENCES sites(id) ON DELETE RESTRICT,
        quantity        INTEGER NOT NULL CHECK (quantity BETWEEN 1 AND 1000000),
        price_per_liner NUMERIC(10, 2) NOT NULL CHECK (price_per_liner >= 0),
        ordered_on      DATE NOT NULL,
        wanted_by       DATE NOT NULL,
        status          VARCHAR(10) NOT NULL DEFAULT 'open' CHECK (status IN ('open', 'closed', 'cancelled')),
        closed_at       TIMESTAMPTZ,
        mailed_at       TIMESTAMPTZ,
        mail_id         INTEGER REFERENCES mail_outbox(id) ON DELETE SET NULL,
        created_by      INTEGER REFERENCES users(id) ON DELETE SET NULL,
        note            TEXT CHECK (length(note) <= 1000),
        version         INTEGER NOT NULL DEFAULT 0,
        created_at      TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at      TIMESTAMPTZ NOT NULL DEFAULT now(),
        CHECK (wanted_by >= ordered_on),
        CHECK ((status = 'open') = (closed_at IS NULL))
      );
      CREATE INDEX liner_purchase_orders_open ON liner_purchase_orders (depot_site_id, liner_spec_id) WHERE status = 'open';

      -- A lot names the order it was received against, and (from the carton) the day it was made.
      ALTER TABLE liner_lots ADD COLUMN purchase_order_id INTEGER REFERENCES liner_purchase_orders(id) ON DELETE RESTRICT,
        ADD COLUMN manufactured_on DATE,
        ADD CONSTRAINT liner_lots_made_before CHECK (manufactured_on IS NULL OR (manufactured_on <= received_on AND manufactured_on < expiry_date));
      CREATE INDEX liner_lots_purchase_order ON liner_lots (purchase_order_id) WHERE purchase_order_id IS NOT NULL;

      CREATE TABLE liner_reorder_alerts (
        id              SERIAL PRIMARY KEY,
        depot_site_id   INTEGER NOT NULL REFERENCES sites(id) ON DELETE CASCADE,
        liner_spec_id   INTEGER NOT NULL REFERENCES liner_specs(id) ON DELETE CASCADE,
        raised_at       TIMESTAMPTZ NOT NULL,
        position        INTEGER NOT NULL,
        reorder_point   INTEGER NOT NULL CHECK (reorder_point >= 0),
        mailed_to       INTEGER NOT NULL DEFAULT 0 CHECK (mailed_to >= 0),
        cleared_at      TIMESTAMPTZ,
        CHECK (cleared_at IS NULL OR cleared_at >= raised_at)
      );
      CREATE UNIQUE INDEX liner_reorder_alerts_one_open ON liner_reorder_alerts (depot_site_id, liner_spec_id) WHERE cleared_at IS NULL;
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP TABLE IF EXISTS liner_reorder_alerts;
      ALTER TABLE liner_lots DROP CONSTRAINT IF EXISTS liner_lots_made_before, DROP COLUMN IF EXISTS manufactured_on, DROP COLUMN IF EXISTS purchase_order_id;
      DROP TABLE IF EXISTS liner_purchase_orders;
    `);
  },
};
