'use strict';
// Collection requests for the same bin or site within a window merge into one: it counts the reports it holds and
// when the latest came (quantities are not added up: the latest quantity stated stands).

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE collection_requests
        ADD COLUMN report_count     INTEGER NOT NULL DEFAULT 1 CHECK (report_count >= 1),
        ADD COLUMN last_reported_at TIMESTAMPTZ;
      UPDATE collection_requests SET last_reported_at = created_at;
      ALTER TABLE collection_requests ALTER COLUMN last_reported_at SET NOT NULL, ALTER COLUMN last_reported_at SET DEFAULT now();
      CREATE INDEX collection_requests_merge ON collection_requests (last_reported_at DESC) WHERE status IN ('open', 'scheduled');
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP INDEX IF EXISTS collection_requests_merge;
      ALTER TABLE collection_requests DROP COLUMN IF EXISTS report_count, DROP COLUMN IF EXISTS last_reported_at;
    `);
  },
};
