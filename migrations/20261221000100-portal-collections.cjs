'use strict';
// The customer portal's collection requests: the day the empties are ready
// (asked by the customer) and the day the collection run is planned (set by
// the planner when scheduling), so the customer sees when the haulier comes.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE collection_requests
        ADD COLUMN ready_on    DATE,
        ADD COLUMN planned_for DATE,
        ADD CONSTRAINT collection_requests_planned_after_ready CHECK (planned_for IS NULL OR ready_on IS NULL OR planned_for >= ready_on);
      CREATE INDEX collection_requests_customer ON collection_requests (customer_id, created_at DESC);
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP INDEX IF EXISTS collection_requests_customer;
      ALTER TABLE collection_requests DROP CONSTRAINT IF EXISTS collection_requests_planned_after_ready,
        DROP COLUMN IF EXISTS planned_for, DROP COLUMN IF EXISTS ready_on;
    `);
  },
};
