'use strict';
// Indexes for the pool overview, trip statistics and reuse report: trips by
// return time (rotations per period and month), and the few log entries that
// take a bin out of the pool (the shrinkage window and "left the pool on").

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      CREATE INDEX trips_returned ON trips (returned_at) WHERE returned_at IS NOT NULL;
      CREATE INDEX scan_events_pool_exits ON scan_events (occurred_at, asset_id)
        WHERE action IN ('retire', 'mark_missing', 'mark_found') AND voided_at IS NULL;
    `);
  },
  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP INDEX IF EXISTS scan_events_pool_exits;
      DROP INDEX IF EXISTS trips_returned;
    `);
  },
};
