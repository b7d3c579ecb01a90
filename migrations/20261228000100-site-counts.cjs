'use strict';
// The monthly count: once a month a customer confirms, per site, the bins they hold. The count keeps the pool's list
// as it stood and what the customer confirmed; each difference is a line the planner resolves (found, moved, lost).

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      CREATE TABLE site_counts (
        id              SERIAL PRIMARY KEY,
        organisation_id INTEGER NOT NULL REFERENCES organisations(id),
        site_id         INTEGER NOT NULL REFERENCES sites(id),
        month           CHAR(7) NOT NULL CHECK (month ~ '^[0-9]{4}-(0[1-9]|1[0-2])$'),
        method          TEXT NOT NULL CHECK (method IN ('ticked', 'scanned')),
        expected_grais  TEXT[] NOT NULL,
        confirmed_grais TEXT[] NOT NULL,
        status          TEXT NOT NULL CHECK (status IN ('agreed', 'disputed', 'resolved')),
        counted_by      INTEGER NOT NULL REFERENCES users(id),
        counted_at      TIMESTAMPTZ NOT NULL DEFAULT now(),
        resolved_at     TIMESTAMPTZ,
        version         INTEGER NOT NULL DEFAULT 0,
        UNIQUE (site_id, month),
        CHECK ((status = 'resolved') = (resolved_at IS NOT NULL))
      );
      CREATE INDEX site_counts_organisation ON site_counts (organisation_id, month);
      CREATE INDEX site_counts_open ON site_counts (counted_at) WHERE status = 'disputed';
      -- A count names a site of the organisation that counted.
      CREATE FUNCTION site_counts_same_organisation() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF NOT EXISTS (SELECT 1 FROM sites s WHERE s.id = NEW.site_id AND s.organisation_id = NEW.organisation_id) THEN
          RAISE EXCEPTION 'a count must name a site of the counting organisation' USING ERRCODE = '23514';
        END IF;
        RETURN NEW;
      END $$;
      CREATE TRIGGER site_counts_same_organisation BEFORE INSERT OR UPDATE ON site_counts
        FOR EACH ROW EXECUTE FUNCTION site_counts_same_organisation();

      CREATE TABLE site_count_lines (
        id               SERIAL PRIMARY KEY,
        count_id         INTEGER NOT NULL REFERENCES site_counts(id) ON DELETE CASCADE,
        grai             TEXT NOT NULL CHECK (grai ~ '^0[0-9]{13}[!-~]{1,16}$'),
        asset_id         INTEGER REFERENCES assets(id),
        kind             TEXT NOT NULL CHECK (kind IN ('missing', 'unexpected')),
        resolution       TEXT CHECK (resolution IN ('found', 'moved', 'lost')),
        moved_to_site_id INTEGER REFERENCES sites(id),
        note             TEXT CHECK (char_length(note) <= 1000),
        scan_event_id    BIGINT REFERENCES scan_events(id),
        resolved_by      INTEGER REFERENCES users(id),
        resolved_at      TIMESTAMPTZ,
        version          INTEGER NOT NULL DEFAULT 0,
        UNIQUE (count_id, grai),
        CHECK ((resolution IS NULL) = (resolved_at IS NULL)),
        CHECK ((resolution = 'moved') = (moved_to_site_id IS NOT NULL) OR resolution IS NULL AND moved_to_site_id IS NULL),
        CHECK (NOT (kind = 'unexpected' AND resolution = 'lost')),
        CHECK (kind = 'unexpected' OR asset_id IS NOT NULL)
      );
      CREATE INDEX site_count_lines_asset ON site_count_lines (asset_id);
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP TABLE IF EXISTS site_count_lines;
      DROP TABLE IF EXISTS site_counts;
      DROP FUNCTION IF EXISTS site_counts_same_organisation();
    `);
  },
};
