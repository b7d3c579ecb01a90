'use strict';
// Liner specs and suppliers as records. A spec says what a liner is: material
// and layers, nominal capacity, bottom valve (type and size, e.g. DN50, DN80,
// or a thread such as S60x6), top gland size, food-contact grade, and the
// supplier's article number. A bin type lists the specs that fit it; a fit
// from a lot whose spec is not listed is refused with the reason. Suppliers
// carry the planning inputs: lead time, cost per order, pack size, minimum
// order and price. Existing lots keep their text `spec`; suppliers are made
// from the names lots already carry.

const SIZE = `'^(DN[0-9]{2,3}|S[0-9]{2,3}x[0-9]{1,2})$'`;

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      CREATE TABLE liner_suppliers (
        id               SERIAL PRIMARY KEY,
        name             VARCHAR(120) NOT NULL UNIQUE,
        order_email      VARCHAR(254) CHECK (order_email LIKE '%_@_%'),
        lead_time_days   INTEGER NOT NULL DEFAULT 14 CHECK (lead_time_days BETWEEN 0 AND 365),
        order_cost       NUMERIC(10, 2) NOT NULL DEFAULT 0 CHECK (order_cost >= 0),
        pack_size        INTEGER NOT NULL DEFAULT 1 CHECK (pack_size BETWEEN 1 AND 10000),
        min_order_qty    INTEGER NOT NULL DEFAULT 1 CHECK (min_order_qty BETWEEN 1 AND 1000000),
        price_per_liner  NUMERIC(10, 2) NOT NULL DEFAULT 0 CHECK (price_per_liner >= 0),
        active           BOOLEAN NOT NULL DEFAULT TRUE,
        version          INTEGER NOT NULL DEFAULT 0,
        created_at       TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at       TIMESTAMPTZ NOT NULL DEFAULT now()
      );

      CREATE TABLE liner_specs (
        id                  SERIAL PRIMARY KEY,
        code                VARCHAR(24) NOT NULL UNIQUE,
        name                VARCHAR(160) NOT NULL,
        material            VARCHAR(60) NOT NULL,
        layers              SMALLINT NOT NULL CHECK (layers BETWEEN 1 AND 9),
        nominal_capacity_l  INTEGER NOT NULL CHECK (nominal_capacity_l BETWEEN 50 AND 5000),
        valve_type          VARCHAR(12) NOT NULL CHECK (valve_type IN ('none', 'butterfly', 'ball', 'spout')),
        valve_size          VARCHAR(12) CHECK (valve_size ~ ${SIZE}),
        gland_size          VARCHAR(12) NOT NULL CHECK (gland_size ~ ${SIZE}),
        food_contact        BOOLEAN NOT NULL DEFAULT FALSE,
        max_fill_temp_c     SMALLINT CHECK (max_fill_temp_c BETWEEN -40 AND 100),
        supplier_id         INTEGER REFERENCES liner_suppliers(id) ON DELETE RESTRICT,
        article_number      VARCHAR(40),
        active              BOOLEAN NOT NULL DEFAULT TRUE,
        version             INTEGER NOT NULL DEFAULT 0,
        created_at          TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at          TIMESTAMPTZ NOT NULL DEFAULT now(),
        CHECK ((valve_type = 'none') = (valve_size IS NULL)),
        UNIQUE (supplier_id, article_number)
      );

      CREATE TABLE bin_type_liner_specs (
        bin_type_id    INTEGER NOT NULL REFERENCES bin_types(id) ON DELETE CASCADE,
        liner_spec_id  INTEGER NOT NULL REFERENCES liner_specs(id) ON DELETE CASCADE,
        PRIMARY KEY (bin_type_id, liner_spec_id)
      );
      CREATE INDEX bin_type_liner_specs_spec ON bin_type_liner_specs (liner_spec_id);

      ALTER TABLE liner_lots
        ADD COLUMN liner_spec_id INTEGER REFERENCES liner_specs(id) ON DELETE RESTRICT,
        ADD COLUMN supplier_id   INTEGER REFERENCES liner_suppliers(id) ON DELETE RESTRICT;

      INSERT INTO liner_suppliers (name) SELECT DISTINCT supplier FROM liner_lots ORDER BY supplier;
      UPDATE liner_lots l SET supplier_id = s.id FROM liner_suppliers s WHERE s.name = l.supplier;
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE liner_lots DROP COLUMN IF EXISTS liner_spec_id, DROP COLUMN IF EXISTS supplier_id;
      DROP TABLE IF EXISTS bin_type_liner_specs;
      DROP TABLE IF EXISTS liner_specs;
      DROP TABLE IF EXISTS liner_suppliers;
    `);
  },
};
