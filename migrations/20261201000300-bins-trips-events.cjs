'use strict';
// The pool itself: bin types, bins (assets) with their current state, trips,
// liner lots, inspections, the append-only scan-event log with its own
// idempotency-key table, hire orders, collection requests, damage reports and
// stored attachments.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      -- Uploaded files live in PostgreSQL so app servers stay stateless; they are
      -- served only through an authorised endpoint with the sniffed content type.
      CREATE TABLE attachments (
        id              SERIAL PRIMARY KEY,
        content         BYTEA NOT NULL,
        content_type    VARCHAR(100) NOT NULL,
        byte_size       INTEGER NOT NULL CHECK (byte_size > 0 AND byte_size <= 10485760),
        sha256          CHAR(64) NOT NULL,
        filename        VARCHAR(200),
        purpose         VARCHAR(32) NOT NULL CHECK (purpose IN ('photo', 'certificate', 'import', 'document')),
        organisation_id INTEGER REFERENCES organisations(id) ON DELETE SET NULL,
        uploaded_by     INTEGER REFERENCES users(id) ON DELETE SET NULL,
        created_at      TIMESTAMPTZ NOT NULL DEFAULT now()
      );

      CREATE TABLE bin_types (
        id                    SERIAL PRIMARY KEY,
        code                  VARCHAR(24) NOT NULL UNIQUE CHECK (code ~ '^[A-Z0-9][A-Z0-9-]*$'),
        name                  VARCHAR(120) NOT NULL,
        grai_asset_type       VARCHAR(6) NOT NULL CHECK (grai_asset_type ~ '^[0-9]{1,6}$'),
        nominal_capacity_l    INTEGER NOT NULL CHECK (nominal_capacity_l > 0),
        tare_kg               NUMERIC(7,1) NOT NULL CHECK (tare_kg > 0),
        max_gross_kg          NUMERIC(7,1) NOT NULL,
        footprint_length_mm   INTEGER NOT NULL CHECK (footprint_length_mm > 0),
        footprint_width_mm    INTEGER NOT NULL CHECK (footprint_width_mm > 0),
        height_erected_mm     INTEGER NOT NULL CHECK (height_erected_mm > 0),
        height_folded_mm      INTEGER NOT NULL CHECK (height_folded_mm > 0),
        un_code               VARCHAR(8),
        -- inspection policy: 'un' = 2.5/5-year regime of ADR 6.5.4.4; 'own' = operator's interval
        policy_kind           VARCHAR(8) NOT NULL DEFAULT 'un' CHECK (policy_kind IN ('un', 'own')),
        intermediate_months   INTEGER NOT NULL DEFAULT 30 CHECK (intermediate_months BETWEEN 1 AND 120),
        full_months           INTEGER NOT NULL DEFAULT 60 CHECK (full_months BETWEEN 1 AND 240),
        active                BOOLEAN NOT NULL DEFAULT TRUE,
        version               INTEGER NOT NULL DEFAULT 0,
        created_at            TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at            TIMESTAMPTZ NOT NULL DEFAULT now(),
        CHECK (max_gross_kg > tare_kg),
        CHECK (height_folded_mm < height_erected_mm),
        CHECK (intermediate_months <= full_months)
      );

      CREATE TABLE liner_lots (
        id                 SERIAL PRIMARY KEY,
        supplier           VARCHAR(120) NOT NULL,
        lot_number         VARCHAR(40) NOT NULL,
        spec               VARCHAR(160) NOT NULL,
        quantity_received  INTEGER NOT NULL CHECK (quantity_received > 0),
        received_on        DATE NOT NULL,
        expiry_date        DATE NOT NULL,
        status             VARCHAR(12) NOT NULL DEFAULT 'released' CHECK (status IN ('released', 'on_hold', 'recalled')),
        site_id            INTEGER NOT NULL REFERENCES sites(id) ON DELETE RESTRICT,
        certificate_id     INTEGER REFERENCES attachments(id) ON DELETE SET NULL,
        status_reason      TEXT,
        version            INTEGER NOT NULL DEFAULT 0,
        created_at         TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at         TIMESTAMPTZ NOT NULL DEFAULT now(),
        UNIQUE (supplier, lot_number),
        CHECK (expiry_date > received_on)
      );
      CREATE INDEX liner_lots_site_expiry ON liner_lots (site_id, expiry_date);

      CREATE TABLE hire_orders (
        id                SERIAL PRIMARY KEY,
        reference         VARCHAR(32) NOT NULL UNIQUE,
        customer_id       INTEGER NOT NULL REFERENCES organisations(id) ON DELETE RESTRICT,
        delivery_site_id  INTEGER NOT NULL REFERENCES sites(id) ON DELETE RESTRICT,
        depot_site_id     INTEGER NOT NULL REFERENCES sites(id) ON DELETE RESTRICT,
        bin_type_id       INTEGER NOT NULL REFERENCES bin_types(id) ON DELETE RESTRICT,
        quantity          INTEGER NOT NULL CHECK (quantity > 0 AND quantity <= 1000),
        needed_by         DATE NOT NULL,
        status            VARCHAR(12) NOT NULL DEFAULT 'open' CHECK (status IN ('open', 'loading', 'dispatched', 'closed', 'cancelled')),
        product           VARCHAR(120),
        notes             TEXT,
        version           INTEGER NOT NULL DEFAULT 0,
        created_at        TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at        TIMESTAMPTZ NOT NULL DEFAULT now()
      );
      CREATE INDEX hire_orders_status_needed ON hire_orders (status, needed_by);
      CREATE INDEX hire_orders_customer ON hire_orders (customer_id);

      CREATE TABLE assets (
        id                    SERIAL PRIMARY KEY,
        grai                  VARCHAR(30) NOT NULL UNIQUE CHECK (grai ~ '^0[0-9]{13}[!-~]{1,16}$'),
        serial                VARCHAR(16) NOT NULL,
        bin_type_id           INTEGER NOT NULL REFERENCES bin_types(id) ON DELETE RESTRICT,
        manufacture_month     DATE NOT NULL CHECK (extract(day FROM manufacture_month) = 1),
        un_marking            VARCHAR(120),
        status                VARCHAR(24) NOT NULL CHECK (status IN ('available', 'prepared', 'in_transit', 'on_hire', 'awaiting_collection', 'quarantine', 'in_repair', 'missing', 'retired')),
        -- current state, kept in step with the event log inside each scan's transaction
        site_id               INTEGER REFERENCES sites(id) ON DELETE RESTRICT,
        site_since            TIMESTAMPTZ,
        customer_id           INTEGER REFERENCES organisations(id) ON DELETE RESTRICT,
        current_trip_id       INTEGER,
        leg                   VARCHAR(10) CHECK (leg IN ('outbound', 'return', 'transfer')),
        prep_checked          BOOLEAN NOT NULL DEFAULT FALSE,
        liner_lot_id          INTEGER REFERENCES liner_lots(id) ON DELETE RESTRICT,
        filled                BOOLEAN NOT NULL DEFAULT FALSE,
        last_scan_at          TIMESTAMPTZ,
        trip_count            INTEGER NOT NULL DEFAULT 0 CHECK (trip_count >= 0),
        last_inspection_on    DATE,
        last_full_inspection_on DATE,
        next_intermediate_due DATE,
        next_full_due         DATE,
        next_due              DATE,
        label_printed_at      TIMESTAMPTZ,
        version               INTEGER NOT NULL DEFAULT 0,
        created_at            TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at            TIMESTAMPTZ NOT NULL DEFAULT now(),
        CHECK (status <> 'on_hire' OR customer_id IS NOT NULL),
        CHECK ((status = 'in_transit') = (leg IS NOT NULL)),
        CHECK (status NOT IN ('available', 'prepared', 'quarantine') OR site_id IS NOT NULL),
        CHECK (status <> 'prepared' OR liner_lot_id IS NOT NULL),
        CHECK (NOT filled OR status IN ('on_hire', 'in_transit', 'missing')),
        CHECK (next_due IS NULL OR next_due = LEAST(next_intermediate_due, next_full_due))
      );
      CREATE INDEX assets_status ON assets (status);
      CREATE INDEX assets_site ON assets (site_id, status);
      CREATE INDEX assets_customer ON assets (customer_id) WHERE customer_id IS NOT NULL;
      CREATE INDEX assets_last_scan ON assets (last_scan_at);
      CREATE INDEX assets_next_due ON assets (next_due);
      CREATE INDEX assets_trip_count ON assets (trip_count);
      CREATE INDEX assets_serial ON assets (serial);
      CREATE INDEX assets_site_since ON assets (site_since);

      CREATE TABLE trips (
        id                 SERIAL PRIMARY KEY,
        asset_id           INTEGER NOT NULL REFERENCES assets(id) ON DELETE RESTRICT,
        hire_order_id      INTEGER REFERENCES hire_orders(id) ON DELETE SET NULL,
        customer_id        INTEGER NOT NULL REFERENCES organisations(id) ON DELETE RESTRICT,
        depot_site_id      INTEGER NOT NULL REFERENCES sites(id) ON DELETE RESTRICT,
        customer_site_id   INTEGER REFERENCES sites(id) ON DELETE RESTRICT,
        discharge_site_id  INTEGER REFERENCES sites(id) ON DELETE RESTRICT,
        closing_site_id    INTEGER REFERENCES sites(id) ON DELETE RESTRICT,
        liner_lot_id       INTEGER REFERENCES liner_lots(id) ON DELETE RESTRICT,
        dispatched_at      TIMESTAMPTZ NOT NULL,
        delivered_at       TIMESTAMPTZ,
        filled_at          TIMESTAMPTZ,
        discharged_at      TIMESTAMPTZ,
        collected_at       TIMESTAMPTZ,
        returned_at        TIMESTAMPTZ,
        fill_product       VARCHAR(120),
        fill_volume_l      NUMERIC(8,1) CHECK (fill_volume_l > 0),
        fill_mass_kg       NUMERIC(8,1) CHECK (fill_mass_kg > 0),
        fill_temperature_c NUMERIC(5,1) CHECK (fill_temperature_c BETWEEN -40 AND 100),
        seals_applied      TEXT[] NOT NULL DEFAULT '{}',
        seals_verified     TEXT[] NOT NULL DEFAULT '{}',
        seal_mismatch      BOOLEAN NOT NULL DEFAULT FALSE,
        status             VARCHAR(8) NOT NULL DEFAULT 'open' CHECK (status IN ('open', 'closed')),
        version            INTEGER NOT NULL DEFAULT 0,
        created_at         TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at         TIMESTAMPTZ NOT NULL DEFAULT now(),
        CHECK ((status = 'closed') = (returned_at IS NOT NULL)),
        CHECK (returned_at IS NULL OR returned_at >= dispatched_at)
      );
      CREATE INDEX trips_asset ON trips (asset_id, dispatched_at DESC);
      CREATE INDEX trips_customer ON trips (customer_id, dispatched_at DESC);
      CREATE INDEX trips_dispatched ON trips (dispatched_at);
      CREATE INDEX trips_liner_lot ON trips (liner_lot_id);
      -- at most one open trip per bin
      CREATE UNIQUE INDEX trips_one_open_per_asset ON trips (asset_id) WHERE status = 'open';
      ALTER TABLE assets ADD CONSTRAINT assets_current_trip_fk FOREIGN KEY (current_trip_id) REFERENCES trips(id) ON DELETE SET NULL;

      -- The append-only log. Current state on assets/trips is derived from it.
      CREATE TABLE scan_events (
        id                BIGSERIAL PRIMARY KEY,
        asset_id          INTEGER NOT NULL REFERENCES assets(id) ON DELETE RESTRICT,
        action            VARCHAR(24) NOT NULL CHECK (action IN ('register', 'receive', 'prep_check', 'fit_liner', 'dispatch', 'deliver', 'fill_seal', 'discharge', 'fold', 'collect', 'quarantine', 'send_to_repair', 'release', 'retire', 'mark_missing', 'mark_found')),
        occurred_at       TIMESTAMPTZ NOT NULL,
        recorded_at       TIMESTAMPTZ NOT NULL DEFAULT now(),
        site_id           INTEGER REFERENCES sites(id) ON DELETE RESTRICT,
        user_id           INTEGER REFERENCES users(id) ON DELETE SET NULL,
        client_event_id   UUID,
        status_from       VARCHAR(24),
        status_to         VARCHAR(24) NOT NULL,
        trip_id           INTEGER REFERENCES trips(id) ON DELETE SET NULL,
        inferred          BOOLEAN NOT NULL DEFAULT FALSE,
        flagged           BOOLEAN NOT NULL DEFAULT FALSE,
        voided_at         TIMESTAMPTZ,
        voided_by         INTEGER REFERENCES users(id) ON DELETE SET NULL,
        void_reason       TEXT,
        payload           JSONB NOT NULL DEFAULT '{}'::jsonb,
        CHECK ((voided_at IS NULL) = (void_reason IS NULL))
      );
      CREATE INDEX scan_events_asset_time ON scan_events (asset_id, occurred_at, id);
      CREATE INDEX scan_events_occurred ON scan_events (occurred_at);
      CREATE INDEX scan_events_site_time ON scan_events (site_id, occurred_at DESC);
      CREATE INDEX scan_events_flagged ON scan_events (occurred_at) WHERE flagged AND voided_at IS NULL;

      -- Idempotency keys in a table of their own, so scan_events can later be
      -- partitioned by month (a partitioned table's unique keys must include
      -- the partition key). A replayed client event id finds its stored answer here.
      CREATE TABLE scan_event_keys (
        client_event_id UUID PRIMARY KEY,
        user_id         INTEGER REFERENCES users(id) ON DELETE SET NULL,
        scan_event_id   BIGINT,
        outcome         JSONB NOT NULL,
        created_at      TIMESTAMPTZ NOT NULL DEFAULT now()
      );

      CREATE TABLE inspections (
        id                    SERIAL PRIMARY KEY,
        asset_id              INTEGER NOT NULL REFERENCES assets(id) ON DELETE RESTRICT,
        kind                  VARCHAR(16) NOT NULL CHECK (kind IN ('prep_check', 'intermediate', 'full', 'after_repair')),
        performed_on          DATE NOT NULL,
        inspector_id          INTEGER REFERENCES users(id) ON DELETE SET NULL,
        site_id               INTEGER REFERENCES sites(id) ON DELETE SET NULL,
        checklist             JSONB NOT NULL DEFAULT '{}'::jsonb,
        leak_test_pressure_kpa NUMERIC(6,1) CHECK (leak_test_pressure_kpa > 0),
        leak_test_minutes     NUMERIC(6,1) CHECK (leak_test_minutes > 0),
        leak_test_passed      BOOLEAN,
        outcome               VARCHAR(8) NOT NULL CHECK (outcome IN ('pass', 'repair', 'fail')),
        next_intermediate_due DATE,
        next_full_due         DATE,
        photo_ids             INTEGER[] NOT NULL DEFAULT '{}',
        notes                 TEXT,
        scan_event_id         BIGINT REFERENCES scan_events(id) ON DELETE SET NULL,
        created_at            TIMESTAMPTZ NOT NULL DEFAULT now(),
        CHECK (kind = 'prep_check' OR outcome <> 'pass' OR next_intermediate_due IS NOT NULL),
        CHECK ((leak_test_pressure_kpa IS NULL) = (leak_test_minutes IS NULL))
      );
      CREATE INDEX inspections_asset ON inspections (asset_id, performed_on DESC);

      CREATE TABLE collection_requests (
        id               SERIAL PRIMARY KEY,
        source           VARCHAR(10) NOT NULL CHECK (source IN ('public', 'portal', 'planner')),
        asset_id         INTEGER REFERENCES assets(id) ON DELETE SET NULL,
        site_id          INTEGER REFERENCES sites(id) ON DELETE SET NULL,
        customer_id      INTEGER REFERENCES organisations(id) ON DELETE SET NULL,
        quantity         INTEGER NOT NULL CHECK (quantity BETWEEN 1 AND 500),
        location_note    VARCHAR(300),
        contact_name     VARCHAR(120),
        contact_phone    VARCHAR(40),
        contact_email    VARCHAR(254),
        note             TEXT,
        status           VARCHAR(10) NOT NULL DEFAULT 'open' CHECK (status IN ('open', 'scheduled', 'done', 'cancelled')),
        requested_by     INTEGER REFERENCES users(id) ON DELETE SET NULL,
        requester_ip     VARCHAR(64),
        version          INTEGER NOT NULL DEFAULT 0,
        created_at       TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at       TIMESTAMPTZ NOT NULL DEFAULT now()
      );
      CREATE INDEX collection_requests_status ON collection_requests (status, created_at DESC);

      CREATE TABLE damage_reports (
        id               SERIAL PRIMARY KEY,
        source           VARCHAR(10) NOT NULL CHECK (source IN ('public', 'portal', 'yard')),
        asset_id         INTEGER REFERENCES assets(id) ON DELETE SET NULL,
        site_id          INTEGER REFERENCES sites(id) ON DELETE SET NULL,
        description      TEXT NOT NULL CHECK (length(trim(description)) >= 3),
        photo_id         INTEGER REFERENCES attachments(id) ON DELETE SET NULL,
        contact_name     VARCHAR(120),
        contact_email    VARCHAR(254),
        status           VARCHAR(10) NOT NULL DEFAULT 'open' CHECK (status IN ('open', 'triaged', 'closed')),
        reported_by      INTEGER REFERENCES users(id) ON DELETE SET NULL,
        requester_ip     VARCHAR(64),
        version          INTEGER NOT NULL DEFAULT 0,
        created_at       TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at       TIMESTAMPTZ NOT NULL DEFAULT now()
      );
      CREATE INDEX damage_reports_status ON damage_reports (status, created_at DESC);
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP TABLE IF EXISTS damage_reports;
      DROP TABLE IF EXISTS collection_requests;
      DROP TABLE IF EXISTS inspections;
      DROP TABLE IF EXISTS scan_event_keys;
      DROP TABLE IF EXISTS scan_events;
      ALTER TABLE IF EXISTS assets DROP CONSTRAINT IF EXISTS assets_current_trip_fk;
      DROP TABLE IF EXISTS trips;
      DROP TABLE IF EXISTS assets;
      DROP TABLE IF EXISTS hire_orders;
      DROP TABLE IF EXISTS liner_lots;
      DROP TABLE IF EXISTS bin_types;
      DROP TABLE IF EXISTS attachments;
    `);
  },
};
