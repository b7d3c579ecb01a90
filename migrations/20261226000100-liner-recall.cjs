'use strict';
// Hold and recall of a liner lot, and the notices sent to customers about it.
// A lot's status records when it last changed and who changed it: a fit made on
// a phone before the phone could know of the change is kept (and flagged), a fit
// after it is refused (a stopped lot with no date refuses every fit). A notice is one message a planner wrote about a lot; each
// address it went to is a row, with the outbox message it became.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE liner_lots
        ADD COLUMN status_changed_at TIMESTAMPTZ,
        ADD COLUMN status_changed_by INTEGER REFERENCES users(id) ON DELETE SET NULL;
      -- Lots stopped before this column existed: their last edit is the best date there is.
      UPDATE liner_lots SET status_changed_at = updated_at WHERE status <> 'released';

      CREATE TABLE liner_recall_notices (
        id          SERIAL PRIMARY KEY,
        lot_id      INTEGER NOT NULL REFERENCES liner_lots(id) ON DELETE RESTRICT,
        sent_by     INTEGER REFERENCES users(id) ON DELETE SET NULL,
        sent_at     TIMESTAMPTZ NOT NULL,
        lot_status  VARCHAR(12) NOT NULL CHECK (lot_status IN ('released', 'on_hold', 'recalled')),
        subject     VARCHAR(300) NOT NULL,
        message     TEXT NOT NULL CHECK (length(message) BETWEEN 1 AND 4000),
        created_at  TIMESTAMPTZ NOT NULL DEFAULT now()
      );
      CREATE INDEX liner_recall_notices_lot ON liner_recall_notices (lot_id, sent_at DESC);

      CREATE TABLE liner_recall_notice_recipients (
        id               SERIAL PRIMARY KEY,
        notice_id        INTEGER NOT NULL REFERENCES liner_recall_notices(id) ON DELETE CASCADE,
        organisation_id  INTEGER NOT NULL REFERENCES organisations(id) ON DELETE RESTRICT,
        email            VARCHAR(254) NOT NULL CHECK (email LIKE '%_@_%'),
        mail_id          INTEGER REFERENCES mail_outbox(id) ON DELETE SET NULL,
        status           VARCHAR(8) NOT NULL CHECK (status IN ('sent', 'failed')),
        uses             INTEGER NOT NULL CHECK (uses > 0),
        UNIQUE (notice_id, email)
      );
      CREATE INDEX liner_recall_notice_recipients_org ON liner_recall_notice_recipients (organisation_id);
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP TABLE IF EXISTS liner_recall_notice_recipients;
      DROP TABLE IF EXISTS liner_recall_notices;
      ALTER TABLE liner_lots DROP COLUMN IF EXISTS status_changed_by, DROP COLUMN IF EXISTS status_changed_at;
    `);
  },
};
