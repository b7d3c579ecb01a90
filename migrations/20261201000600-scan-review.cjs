'use strict';
// Flagged scans (missed steps inferred, seal numbers that did not match) wait
// for a planner's look; the review is recorded on the event, the log itself
// stays as it was.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE scan_events ADD COLUMN reviewed_at TIMESTAMPTZ, ADD COLUMN reviewed_by INTEGER REFERENCES users(id) ON DELETE SET NULL;
      CREATE INDEX scan_events_to_review ON scan_events (occurred_at DESC) WHERE flagged AND NOT inferred AND voided_at IS NULL AND reviewed_at IS NULL;
    `);
  },
  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP INDEX IF EXISTS scan_events_to_review;
      ALTER TABLE scan_events DROP COLUMN IF EXISTS reviewed_at, DROP COLUMN IF EXISTS reviewed_by;
    `);
  },
};
