'use strict';
// Hire orders get a draft stage (entered, not yet demand) and the liner grade
// they need; today's `open` orders are confirmed ones. Customer hire terms move
// to tariffs with effective dates: an order reads the tariff in force at its
// wanted date and copies no numbers. A customer's tariffs never overlap.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE hire_orders DROP CONSTRAINT IF EXISTS hire_orders_status_check;
      UPDATE hire_orders SET status = 'confirmed' WHERE status = 'open';
      ALTER TABLE hire_orders
        ALTER COLUMN status SET DEFAULT 'draft',
        ADD CONSTRAINT hire_orders_status_check CHECK (status IN ('draft', 'confirmed', 'loading', 'dispatched', 'closed', 'cancelled')),
        ADD COLUMN liner_food_contact    BOOLEAN NOT NULL DEFAULT FALSE,
        ADD COLUMN liner_max_fill_temp_c SMALLINT CHECK (liner_max_fill_temp_c BETWEEN -40 AND 100),
        ADD COLUMN created_by            INTEGER REFERENCES users(id) ON DELETE SET NULL,
        ADD COLUMN confirmed_at          TIMESTAMPTZ,
        ADD COLUMN finished_at           TIMESTAMPTZ,
        ADD CONSTRAINT hire_orders_sites_differ CHECK (delivery_site_id <> depot_site_id);
      UPDATE hire_orders SET confirmed_at = created_at WHERE status <> 'draft';

      CREATE EXTENSION IF NOT EXISTS btree_gist;
      CREATE TABLE tariffs (
        id            SERIAL PRIMARY KEY,
        customer_id   INTEGER NOT NULL REFERENCES organisations(id) ON DELETE RESTRICT,
        free_days     INTEGER NOT NULL CHECK (free_days >= 0 AND free_days <= 365),
        daily_rate    NUMERIC(10,2) NOT NULL CHECK (daily_rate >= 0),
        per_trip_fee  NUMERIC(10,2) NOT NULL CHECK (per_trip_fee >= 0),
        lost_bin_fee  NUMERIC(10,2) NOT NULL CHECK (lost_bin_fee >= 0),
        currency      CHAR(3) NOT NULL CHECK (currency ~ '^[A-Z]{3}$'),
        valid_from    DATE NOT NULL,
        valid_to      DATE CHECK (valid_to >= valid_from),
        version       INTEGER NOT NULL DEFAULT 0,
        created_at    TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at    TIMESTAMPTZ NOT NULL DEFAULT now(),
        -- valid_to is included: the range is [valid_from, valid_to]
        CONSTRAINT tariffs_no_overlap EXCLUDE USING gist (
          customer_id WITH =, daterange(valid_from, valid_to, '[]') WITH &&
        )
      );
      CREATE INDEX tariffs_customer_from ON tariffs (customer_id, valid_from);

      -- The terms each customer has now, in force since before any order.
      INSERT INTO tariffs (customer_id, free_days, daily_rate, per_trip_fee, lost_bin_fee, currency, valid_from)
      SELECT id, free_days, daily_rate, trip_fee, lost_bin_fee, currency, DATE '2000-01-01'
        FROM organisations WHERE kind = 'customer';
    `);
  },
  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP TABLE IF EXISTS tariffs;
      ALTER TABLE hire_orders DROP CONSTRAINT IF EXISTS hire_orders_status_check;
      ALTER TABLE hire_orders DROP CONSTRAINT IF EXISTS hire_orders_sites_differ;
      UPDATE hire_orders SET status = 'open' WHERE status IN ('draft', 'confirmed');
      ALTER TABLE hire_orders
        ALTER COLUMN status SET DEFAULT 'open',
        ADD CONSTRAINT hire_orders_status_check CHECK (status IN ('open', 'loading', 'dispatched', 'closed', 'cancelled')),
        DROP COLUMN IF EXISTS liner_food_contact,
        DROP COLUMN IF EXISTS liner_max_fill_temp_c,
        DROP COLUMN IF EXISTS created_by,
        DROP COLUMN IF EXISTS confirmed_at,
        DROP COLUMN IF EXISTS finished_at;
    `);
  },
};
