'use strict';
// Customer mail: the overdue-return reminder's threshold (days over the free days before a bin is in a reminder), a
// per-user opt-out of non-essential mail, and the log of reminders sent (at most one per contact per week).

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE settings ADD COLUMN reminder_days_over INTEGER NOT NULL DEFAULT 3 CHECK (reminder_days_over BETWEEN 1 AND 365);
      ALTER TABLE users ADD COLUMN mail_opt_out BOOLEAN NOT NULL DEFAULT FALSE;
      CREATE TABLE customer_reminders (
        id       SERIAL PRIMARY KEY,
        user_id  INTEGER NOT NULL REFERENCES users(id) ON DELETE CASCADE,
        kind     TEXT NOT NULL CHECK (kind IN ('overdue_reminder', 'count_due')),
        about    TEXT NOT NULL CHECK (char_length(about) BETWEEN 1 AND 40),
        bins     INTEGER NOT NULL CHECK (bins >= 0),
        mail_id  INTEGER REFERENCES mail_outbox(id) ON DELETE SET NULL,
        sent_at  TIMESTAMPTZ NOT NULL DEFAULT now(),
        -- one count-due mail per contact and month ('about' is the month), one overdue reminder per contact and run
        UNIQUE (user_id, kind, about)
      );
      CREATE INDEX customer_reminders_last ON customer_reminders (user_id, kind, sent_at DESC);
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP TABLE IF EXISTS customer_reminders;
      ALTER TABLE users DROP COLUMN IF EXISTS mail_opt_out;
      ALTER TABLE settings DROP COLUMN IF EXISTS reminder_days_over;
    `);
  },
};
