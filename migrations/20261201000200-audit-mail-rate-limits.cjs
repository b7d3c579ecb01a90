'use strict';
// Cross-cutting tables: the audit trail of admin and planner edits, the record
// of mail the app sent, and the counters of the sign-in / public-form rate limits
// (kept in PostgreSQL so several app servers share them).

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      CREATE TABLE audit_entries (
        id          BIGSERIAL PRIMARY KEY,
        user_id     INTEGER REFERENCES users(id) ON DELETE SET NULL,
        action      VARCHAR(64) NOT NULL,
        entity_type VARCHAR(40) NOT NULL,
        entity_id   VARCHAR(64),
        before      JSONB,
        after       JSONB,
        ip          VARCHAR(64),
        created_at  TIMESTAMPTZ NOT NULL DEFAULT now()
      );
      CREATE INDEX audit_entries_entity ON audit_entries (entity_type, entity_id);
      CREATE INDEX audit_entries_created_at ON audit_entries (created_at DESC);

      CREATE TABLE mail_outbox (
        id          SERIAL PRIMARY KEY,
        to_address  VARCHAR(254) NOT NULL,
        subject     VARCHAR(300) NOT NULL,
        text_body   TEXT NOT NULL,
        kind        VARCHAR(40) NOT NULL,
        status      VARCHAR(16) NOT NULL DEFAULT 'queued' CHECK (status IN ('queued', 'sent', 'failed')),
        message_id  VARCHAR(300),
        error       TEXT,
        created_at  TIMESTAMPTZ NOT NULL DEFAULT now(),
        sent_at     TIMESTAMPTZ
      );
      CREATE INDEX mail_outbox_created_at ON mail_outbox (created_at DESC);

      -- Storage of rate-limiter-flexible's RateLimiterPostgres (its documented layout).
      CREATE TABLE rate_limits (
        key    VARCHAR(255) PRIMARY KEY,
        points INTEGER NOT NULL DEFAULT 0,
        expire BIGINT
      );
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP TABLE IF EXISTS rate_limits;
      DROP TABLE IF EXISTS mail_outbox;
      DROP TABLE IF EXISTS audit_entries;
    `);
  },
};
