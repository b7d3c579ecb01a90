'use strict';
// Collections as truck runs: a run is one truck from a depot to customer sites and back, its stops in driving
// order, each stop with the bins expected there; the collection requests it serves point at it. Trailers are
// admin data (inside size and payload) that a run's capacity is planned with. A site's minimum collection
// quantity keeps a run from driving out for a handful of bins.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      CREATE TABLE trailers (
        id                SERIAL PRIMARY KEY,
        name              VARCHAR(120) NOT NULL UNIQUE CHECK (length(trim(name)) > 0),
        inside_length_mm  INTEGER NOT NULL CHECK (inside_length_mm BETWEEN 1000 AND 20000),
        inside_width_mm   INTEGER NOT NULL CHECK (inside_width_mm BETWEEN 1000 AND 3000),
        inside_height_mm  INTEGER NOT NULL CHECK (inside_height_mm BETWEEN 1000 AND 4000),
        payload_kg        INTEGER NOT NULL CHECK (payload_kg BETWEEN 100 AND 60000),
        active            BOOLEAN NOT NULL DEFAULT TRUE,
        version           INTEGER NOT NULL DEFAULT 0,
        created_at        TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at        TIMESTAMPTZ NOT NULL DEFAULT now()
      );

      ALTER TABLE sites ADD COLUMN min_collection_qty INTEGER NOT NULL DEFAULT 1 CHECK (min_collection_qty BETWEEN 1 AND 500);

      CREATE TABLE truck_runs (
        id             SERIAL PRIMARY KEY,
        reference      VARCHAR(32) NOT NULL UNIQUE,
        depot_site_id  INTEGER NOT NULL REFERENCES sites(id) ON DELETE RESTRICT,
        trailer_id     INTEGER REFERENCES trailers(id) ON DELETE RESTRICT,
        bin_type_id    INTEGER REFERENCES bin_types(id) ON DELETE RESTRICT,
        carrier        VARCHAR(120) CHECK (carrier IS NULL OR length(trim(carrier)) > 0),
        planned_on     DATE NOT NULL,
        status         VARCHAR(10) NOT NULL DEFAULT 'planned' CHECK (status IN ('planned', 'confirmed', 'done', 'cancelled')),
        road_km        INTEGER CHECK (road_km IS NULL OR road_km >= 0),
        created_by     INTEGER REFERENCES users(id) ON DELETE SET NULL,
        confirmed_at   TIMESTAMPTZ,
        finished_at    TIMESTAMPTZ,
        version        INTEGER NOT NULL DEFAULT 0,
        created_at     TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at     TIMESTAMPTZ NOT NULL DEFAULT now(),
        CHECK (status NOT IN ('confirmed', 'done') OR (carrier IS NOT NULL AND confirmed_at IS NOT NULL)),
        CHECK (status NOT IN ('done', 'cancelled') OR finished_at IS NOT NULL)
      );
      CREATE INDEX truck_runs_depot_day ON truck_runs (depot_site_id, planned_on) WHERE status IN ('planned', 'confirmed');

      CREATE TABLE truck_run_stops (
        id             SERIAL PRIMARY KEY,
        run_id         INTEGER NOT NULL REFERENCES truck_runs(id) ON DELETE CASCADE,
        position       INTEGER NOT NULL CHECK (position >= 1),
        site_id        INTEGER NOT NULL REFERENCES sites(id) ON DELETE RESTRICT,
        expected_bins  INTEGER NOT NULL CHECK (expected_bins BETWEEN 1 AND 500),
        UNIQUE (run_id, position),
        UNIQUE (run_id, site_id)
      );

      ALTER TABLE collection_requests ADD COLUMN truck_run_id INTEGER REFERENCES truck_runs(id) ON DELETE SET NULL;
      CREATE INDEX collection_requests_run ON collection_requests (truck_run_id) WHERE truck_run_id IS NOT NULL;
      CREATE INDEX scan_events_run ON scan_events (((payload->>'runId')::int)) WHERE action = 'receive' AND payload ? 'runId';
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP INDEX IF EXISTS scan_events_run;
      DROP INDEX IF EXISTS collection_requests_run;
      ALTER TABLE collection_requests DROP COLUMN IF EXISTS truck_run_id;
      DROP TABLE IF EXISTS truck_run_stops;
      DROP TABLE IF EXISTS truck_runs;
      ALTER TABLE sites DROP COLUMN IF EXISTS min_collection_qty;
      DROP TABLE IF EXISTS trailers;
    `);
  },
};
