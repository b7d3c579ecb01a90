'use strict';
// Sessions are encrypted cookies (no session table), so ending one needs a note
// on the server that the middleware reads with the user row:
// - ended_sessions: the session ids signed out on their own device, kept until
//   the latest copy of that cookie would have expired, then deleted by the
//   `ended-sessions-cleanup` job;
// - users.session_epoch: "end all of this person's sessions" counts it up, and a
//   cookie carrying an older epoch stops working on every device at once.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE users ADD COLUMN session_epoch INTEGER NOT NULL DEFAULT 0 CHECK (session_epoch >= 0);
      CREATE TABLE ended_sessions (
        session_id  UUID PRIMARY KEY,
        user_id     INTEGER REFERENCES users(id) ON DELETE CASCADE,
        ended_at    TIMESTAMPTZ NOT NULL DEFAULT now(),
        expires_at  TIMESTAMPTZ NOT NULL,
        CHECK (expires_at >= ended_at)
      );
      CREATE INDEX ended_sessions_expires ON ended_sessions (expires_at);
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP TABLE ended_sessions;
      ALTER TABLE users DROP COLUMN session_epoch;
    `);
  },
};
