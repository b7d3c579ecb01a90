'use strict';
// Online payment: each checkout the app opens at the payment provider (its session id, the invoice, the amount
// asked) and how it ended, and every provider event received, kept by the provider's event id so a replayed
// event changes nothing. Payment reminders for invoices past due, and when each went out.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      CREATE TABLE payment_checkouts (
        id           VARCHAR(120) PRIMARY KEY,
        invoice_id   INTEGER NOT NULL REFERENCES invoices(id) ON DELETE RESTRICT,
        amount_minor BIGINT NOT NULL CHECK (amount_minor > 0),
        currency     CHAR(3) NOT NULL,
        status       VARCHAR(14) NOT NULL DEFAULT 'open' CHECK (status IN ('open', 'processing', 'paid', 'failed', 'needs_review')),
        problem      TEXT,
        created_by   INTEGER REFERENCES users(id) ON DELETE SET NULL,
        created_at   TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at   TIMESTAMPTZ NOT NULL DEFAULT now()
      );
      CREATE INDEX payment_checkouts_invoice ON payment_checkouts (invoice_id, created_at DESC);

      -- Payment reminders: days past the due date before the first one (then weekly), and each one sent.
      ALTER TABLE settings ADD COLUMN payment_reminder_days INTEGER NOT NULL DEFAULT 7 CHECK (payment_reminder_days BETWEEN 1 AND 90);
      CREATE TABLE invoice_reminders (
        id          SERIAL PRIMARY KEY,
        invoice_id  INTEGER NOT NULL REFERENCES invoices(id) ON DELETE RESTRICT,
        sent_on     DATE NOT NULL,
        mail_id     INTEGER,
        created_at  TIMESTAMPTZ NOT NULL DEFAULT now(),
        UNIQUE (invoice_id, sent_on)
      );

      CREATE TABLE payment_events (
        id          VARCHAR(120) PRIMARY KEY,
        type        VARCHAR(80) NOT NULL,
        checkout_id VARCHAR(120),
        outcome     VARCHAR(20) NOT NULL,
        received_at TIMESTAMPTZ NOT NULL DEFAULT now()
      );
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP TABLE IF EXISTS payment_events; DROP TABLE IF EXISTS invoice_reminders; DROP TABLE IF EXISTS payment_checkouts;
      ALTER TABLE settings DROP COLUMN IF EXISTS payment_reminder_days;`);
  },
};
