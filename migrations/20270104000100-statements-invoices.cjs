'use strict';
// Hire billing in the database. Tariffs gain the terms the billing rule reads (which ends of a hire count, the
// events that start and stop it, the liner and truck-stop charges); customers their country and VAT number, the
// operator its country (for reverse charge). A statement is one customer's month as issued: its lines never
// change (no UPDATE path in the code; `billed_as` keeps the latest recomputation of its own period so the next
// month's adjustment lines say only what changed since). An invoice or credit note carries a gap-free number from
// document_number_counters; payments and the provider's webhook events are kept by their ids so a replay is a no-op.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE tariffs
        ADD COLUMN first_day_counts BOOLEAN NOT NULL DEFAULT FALSE,
        ADD COLUMN last_day_counts  BOOLEAN NOT NULL DEFAULT TRUE,
        ADD COLUMN hire_starts_at   VARCHAR(8)  NOT NULL DEFAULT 'delivery' CHECK (hire_starts_at IN ('dispatch', 'delivery')),
        ADD COLUMN hire_stops_at    VARCHAR(14) NOT NULL DEFAULT 'collection' CHECK (hire_stops_at IN ('ready_notice', 'collection', 'depot_receipt')),
        ADD COLUMN liner_fee        NUMERIC(10,2) NOT NULL DEFAULT 0 CHECK (liner_fee >= 0),
        ADD COLUMN stop_fee         NUMERIC(10,2) NOT NULL DEFAULT 0 CHECK (stop_fee >= 0);
      ALTER TABLE organisations
        ADD COLUMN country CHAR(2) CHECK (country ~ '^[A-Z]{2}$'),
        ADD COLUMN vat_id  VARCHAR(20) CHECK (vat_id ~ '^[A-Z]{2}[0-9A-Z+*.]{2,18}$');
      ALTER TABLE settings ADD COLUMN country CHAR(2) NOT NULL DEFAULT 'NL' CHECK (country ~ '^[A-Z]{2}$');

      CREATE TABLE statements (
        id              SERIAL PRIMARY KEY,
        customer_id     INTEGER NOT NULL REFERENCES organisations(id) ON DELETE RESTRICT,
        period_from     DATE NOT NULL,
        period_to       DATE NOT NULL CHECK (period_to >= period_from),
        currency        CHAR(3) NOT NULL CHECK (currency ~ '^[A-Z]{3}$'),
        net_minor       BIGINT NOT NULL,
        tax_minor       BIGINT NOT NULL,
        gross_minor     BIGINT NOT NULL CHECK (gross_minor = net_minor + tax_minor),
        tax_kind        VARCHAR(14) NOT NULL CHECK (tax_kind IN ('rate', 'reverse_charge')),
        tax_rate_bp     INTEGER CHECK (tax_rate_bp BETWEEN 0 AND 9999),
        customer_vat_id VARCHAR(20),
        tax_note        TEXT NOT NULL,
        rounding        TEXT NOT NULL,
        billed_as       JSONB NOT NULL,
        issued_at       TIMESTAMPTZ NOT NULL DEFAULT now(),
        issued_by       INTEGER REFERENCES users(id) ON DELETE SET NULL,
        UNIQUE (customer_id, period_from),
        CHECK ((tax_kind = 'rate') = (tax_rate_bp IS NOT NULL))
      );

      CREATE TABLE statement_lines (
        id                   SERIAL PRIMARY KEY,
        statement_id         INTEGER NOT NULL REFERENCES statements(id) ON DELETE RESTRICT,
        position             INTEGER NOT NULL CHECK (position >= 1),
        kind                 VARCHAR(16) NOT NULL CHECK (kind IN ('free_days', 'hire', 'trip_fee', 'liners', 'transport', 'damage', 'lost_bin', 'lost_bin_credit', 'adjustment')),
        bin_label            VARCHAR(64),
        trip_id              INTEGER REFERENCES trips(id) ON DELETE RESTRICT,
        reference            VARCHAR(64),
        from_on              DATE NOT NULL,
        to_on                DATE NOT NULL CHECK (to_on >= from_on),
        trip_day_first       INTEGER,
        trip_day_last        INTEGER,
        quantity             INTEGER NOT NULL,
        unit_minor           BIGINT NOT NULL,
        amount_minor         BIGINT NOT NULL,
        estimated            BOOLEAN NOT NULL DEFAULT FALSE,
        photo_ids            INTEGER[] NOT NULL DEFAULT '{}',
        text                 TEXT NOT NULL,
        adjusts_statement_id INTEGER REFERENCES statements(id) ON DELETE RESTRICT,
        UNIQUE (statement_id, position),
        CHECK ((kind = 'adjustment') = (adjusts_statement_id IS NOT NULL))
      );

      CREATE TABLE invoices (
        id                  SERIAL PRIMARY KEY,
        series              VARCHAR(16) NOT NULL CHECK (series IN ('invoice', 'credit_note')),
        number              VARCHAR(20) NOT NULL UNIQUE,
        customer_id         INTEGER NOT NULL REFERENCES organisations(id) ON DELETE RESTRICT,
        statement_id        INTEGER REFERENCES statements(id) ON DELETE RESTRICT,
        corrects_invoice_id INTEGER REFERENCES invoices(id) ON DELETE RESTRICT,
        currency            CHAR(3) NOT NULL,
        net_minor           BIGINT NOT NULL,
        tax_minor           BIGINT NOT NULL,
        gross_minor         BIGINT NOT NULL CHECK (gross_minor = net_minor + tax_minor),
        reason              TEXT,
        issued_at           TIMESTAMPTZ NOT NULL DEFAULT now(),
        due_on              DATE,
        issued_by           INTEGER REFERENCES users(id) ON DELETE SET NULL,
        CHECK ((series = 'invoice') = (statement_id IS NOT NULL)),
        CHECK ((series = 'credit_note') = (corrects_invoice_id IS NOT NULL AND reason IS NOT NULL))
      );
      CREATE UNIQUE INDEX invoices_one_per_statement ON invoices (statement_id) WHERE statement_id IS NOT NULL;
      CREATE INDEX invoices_customer ON invoices (customer_id, issued_at DESC);

      CREATE TABLE invoice_payments (
        id           SERIAL PRIMARY KEY,
        invoice_id   INTEGER NOT NULL REFERENCES invoices(id) ON DELETE RESTRICT,
        amount_minor BIGINT NOT NULL CHECK (amount_minor > 0),
        method       VARCHAR(14) NOT NULL CHECK (method IN ('card', 'bank_transfer')),
        provider_ref VARCHAR(120) UNIQUE,
        paid_on      DATE NOT NULL,
        note         TEXT CHECK (length(note) <= 500),
        recorded_by  INTEGER REFERENCES users(id) ON DELETE SET NULL,
        created_at   TIMESTAMPTZ NOT NULL DEFAULT now()
      );
      CREATE INDEX invoice_payments_invoice ON invoice_payments (invoice_id);
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP TABLE IF EXISTS invoice_payments;
      DROP TABLE IF EXISTS invoices;
      DROP TABLE IF EXISTS statement_lines;
      DROP TABLE IF EXISTS statements;
      ALTER TABLE settings DROP COLUMN IF EXISTS country;
      ALTER TABLE organisations DROP COLUMN IF EXISTS country, DROP COLUMN IF EXISTS vat_id;
      ALTER TABLE tariffs DROP COLUMN IF EXISTS first_day_counts, DROP COLUMN IF EXISTS last_day_counts, DROP COLUMN IF EXISTS hire_starts_at,
        DROP COLUMN IF EXISTS hire_stops_at, DROP COLUMN IF EXISTS liner_fee, DROP COLUMN IF EXISTS stop_fee;
    `);
  },
};
