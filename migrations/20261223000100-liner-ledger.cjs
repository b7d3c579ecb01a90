'use strict';
// The liner stock ledger: every change of a depot's liner stock is one row,
// and on hand per lot and depot is the sum of its rows — no counter to drift.
//
//   receipt           + a lot received at a depot
//   sent / arrived    − at the sending depot, + at the receiving one; a sent
//                     row with no arrived row pointing at it is in transit
//   fitted            − one liner fitted in a bin by a scan (scan_event_id)
//   kit_sent          − liners sent with folded bins for the customer to fit
//   scrapped          − liners off the shelf, with a reason
//   counted           counted − expected, both kept (may be 0: a count that matched;
//                     expected is the ledger's figure, below 0 only from the backfill)
//   fitted_discarded  0: a fitted liner taken out unused (fold at the depot,
//                     quarantine, a failed check) — the fit already took it
//                     off the shelf; this row says it was wasted, and why
//   reversal          − the row it reverses (a voided scan's moves)
//
// A statement trigger refuses any insert that leaves a lot's stock at a depot
// below zero; the services lock the lot row (FOR UPDATE) before they read the
// sum, so concurrent fits queue instead of both seeing the last liner.
// The backfill writes a receipt per lot and a fitted row per recorded fit;
// where history fitted more than was received, a count row says so.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      CREATE TABLE liner_moves (
        id                 BIGSERIAL PRIMARY KEY,
        lot_id             INTEGER NOT NULL REFERENCES liner_lots(id) ON DELETE RESTRICT,
        site_id            INTEGER NOT NULL REFERENCES sites(id) ON DELETE RESTRICT,
        kind               VARCHAR(20) NOT NULL CHECK (kind IN ('receipt', 'sent', 'arrived', 'fitted', 'kit_sent', 'scrapped', 'counted', 'fitted_discarded', 'reversal')),
        quantity           INTEGER NOT NULL CHECK (quantity BETWEEN -100000 AND 100000),
        occurred_at        TIMESTAMPTZ NOT NULL,
        user_id            INTEGER REFERENCES users(id) ON DELETE SET NULL,
        asset_id           INTEGER REFERENCES assets(id) ON DELETE RESTRICT,
        scan_event_id      BIGINT,
        hire_order_id      INTEGER REFERENCES hire_orders(id) ON DELETE RESTRICT,
        folded_bins        INTEGER CHECK (folded_bins > 0),
        to_site_id         INTEGER REFERENCES sites(id) ON DELETE RESTRICT,
        sent_move_id       BIGINT UNIQUE REFERENCES liner_moves(id) ON DELETE RESTRICT,
        reverses_move_id   BIGINT UNIQUE REFERENCES liner_moves(id) ON DELETE RESTRICT,
        counted            INTEGER CHECK (counted >= 0),
        expected           INTEGER,
        reason             TEXT CHECK (length(reason) <= 500),
        created_at         TIMESTAMPTZ NOT NULL DEFAULT now(),
        CHECK (kind NOT IN ('receipt', 'arrived') OR quantity > 0),
        CHECK (kind NOT IN ('sent', 'kit_sent', 'scrapped') OR quantity < 0),
        CHECK (kind <> 'fitted' OR (quantity = -1 AND asset_id IS NOT NULL)),
        CHECK (kind <> 'fitted_discarded' OR (quantity = 0 AND asset_id IS NOT NULL AND reason IS NOT NULL)),
        CHECK (kind <> 'sent' OR (to_site_id IS NOT NULL AND to_site_id <> site_id)),
        CHECK (kind <> 'arrived' OR sent_move_id IS NOT NULL),
        CHECK (kind <> 'kit_sent' OR (hire_order_id IS NOT NULL AND folded_bins IS NOT NULL)),
        CHECK (kind <> 'scrapped' OR reason IS NOT NULL),
        CHECK (kind <> 'counted' OR (counted IS NOT NULL AND expected IS NOT NULL AND quantity = counted - expected)),
        CHECK (kind <> 'reversal' OR reverses_move_id IS NOT NULL)
      );
      CREATE INDEX liner_moves_lot_site ON liner_moves (lot_id, site_id);
      CREATE INDEX liner_moves_site_time ON liner_moves (site_id, occurred_at);
      CREATE INDEX liner_moves_scan_event ON liner_moves (scan_event_id) WHERE scan_event_id IS NOT NULL;
      CREATE INDEX liner_moves_in_transit ON liner_moves (to_site_id) WHERE kind = 'sent';

      -- Backfill: a receipt per lot, then every recorded (not voided) fit.
      INSERT INTO liner_moves (lot_id, site_id, kind, quantity, occurred_at)
        SELECT id, site_id, 'receipt', quantity_received, received_on::timestamp AT TIME ZONE 'UTC' FROM liner_lots ORDER BY id;
      INSERT INTO liner_moves (lot_id, site_id, kind, quantity, occurred_at, user_id, asset_id, scan_event_id)
        SELECT l.id, COALESCE(e.site_id, l.site_id), 'fitted', -1, e.occurred_at, e.user_id, e.asset_id, e.id
          FROM scan_events e JOIN liner_lots l ON l.id = (e.payload->>'linerLotId')::int
         WHERE e.action = 'fit_liner' AND e.voided_at IS NULL AND NOT e.inferred AND (e.payload->>'linerLotId') ~ '^[0-9]{1,9}$'
         ORDER BY e.occurred_at, e.id;
      INSERT INTO liner_moves (lot_id, site_id, kind, quantity, occurred_at, counted, expected, reason)
        SELECT lot_id, site_id, 'counted', -sum(quantity), now(), 0, sum(quantity), 'Backfill: more fits recorded than liners received'
          FROM liner_moves GROUP BY lot_id, site_id HAVING sum(quantity) < 0;

      CREATE FUNCTION liner_moves_never_negative() RETURNS trigger LANGUAGE plpgsql AS $$
      DECLARE bad RECORD;
      BEGIN
        SELECT m.lot_id, m.site_id, sum(m.quantity) AS on_hand INTO bad
          FROM liner_moves m
         WHERE (m.lot_id, m.site_id) IN (SELECT DISTINCT lot_id, site_id FROM new_moves)
         GROUP BY m.lot_id, m.site_id HAVING sum(m.quantity) < 0 LIMIT 1;
        IF FOUND THEN
          RAISE EXCEPTION 'liner stock of lot % at site % would be %', bad.lot_id, bad.site_id, bad.on_hand
            USING ERRCODE = 'check_violation', CONSTRAINT = 'liner_moves_never_negative';
        END IF;
        RETURN NULL;
      END $$;
      CREATE TRIGGER liner_moves_never_negative AFTER INSERT ON liner_moves
        REFERENCING NEW TABLE AS new_moves FOR EACH STATEMENT EXECUTE FUNCTION liner_moves_never_negative();

      -- The ledger is append-only: a wrong move is reversed, never edited.
      CREATE FUNCTION liner_moves_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION 'liner_moves is append-only; reverse a move instead' USING ERRCODE = 'check_violation', CONSTRAINT = 'liner_moves_append_only';
      END $$;
      CREATE TRIGGER liner_moves_append_only BEFORE UPDATE OR DELETE ON liner_moves
        FOR EACH ROW EXECUTE FUNCTION liner_moves_append_only();
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP TABLE IF EXISTS liner_moves;
      DROP FUNCTION IF EXISTS liner_moves_never_negative();
      DROP FUNCTION IF EXISTS liner_moves_append_only();
    `);
  },
};
