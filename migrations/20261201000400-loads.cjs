'use strict';
// A load: many bins going out together on one truck against one hire order,
// with the carrier's details for the dispatch note and the receiving end's
// confirmation (name, time, photo). Trips point at the load they left on.
// The delivery link on the note is an HMAC of the load, so nothing secret is stored.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      CREATE TABLE loads (
        id                    SERIAL PRIMARY KEY,
        reference             VARCHAR(32) NOT NULL UNIQUE,
        hire_order_id         INTEGER REFERENCES hire_orders(id) ON DELETE RESTRICT,
        depot_site_id         INTEGER NOT NULL REFERENCES sites(id) ON DELETE RESTRICT,
        destination_site_id   INTEGER REFERENCES sites(id) ON DELETE RESTRICT,
        purpose               VARCHAR(10) NOT NULL DEFAULT 'hire' CHECK (purpose IN ('hire', 'transfer')),
        target_count          INTEGER NOT NULL CHECK (target_count BETWEEN 1 AND 200),
        status                VARCHAR(12) NOT NULL DEFAULT 'loading' CHECK (status IN ('loading', 'dispatched', 'delivered', 'cancelled')),
        carrier               VARCHAR(120),
        vehicle_registration  VARCHAR(20),
        driver_name           VARCHAR(120),
        trailer_seals         TEXT[] NOT NULL DEFAULT '{}',
        dispatched_at         TIMESTAMPTZ,
        delivered_at          TIMESTAMPTZ,
        received_by_name      VARCHAR(120),
        delivery_photo_id     INTEGER REFERENCES attachments(id) ON DELETE SET NULL,
        created_by            INTEGER REFERENCES users(id) ON DELETE SET NULL,
        version               INTEGER NOT NULL DEFAULT 0,
        created_at            TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at            TIMESTAMPTZ NOT NULL DEFAULT now(),
        CHECK (purpose = 'transfer' OR hire_order_id IS NOT NULL),
        CHECK (status NOT IN ('dispatched', 'delivered') OR (carrier IS NOT NULL AND vehicle_registration IS NOT NULL AND dispatched_at IS NOT NULL)),
        CHECK (status <> 'delivered' OR (delivered_at IS NOT NULL AND received_by_name IS NOT NULL))
      );
      CREATE INDEX loads_depot_status ON loads (depot_site_id, status);
      ALTER TABLE trips ADD COLUMN load_id INTEGER REFERENCES loads(id) ON DELETE SET NULL;
      CREATE INDEX trips_load ON trips (load_id) WHERE load_id IS NOT NULL;
      -- Which dispatch scans went out on a load (transfers open no trip, so the log is the record).
      CREATE INDEX scan_events_load ON scan_events (((payload->>'loadId')::int)) WHERE action = 'dispatch' AND payload ? 'loadId';
    `);
  },
  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE trips DROP COLUMN IF EXISTS load_id;
      DROP TABLE IF EXISTS loads;
    `);
  },
};
