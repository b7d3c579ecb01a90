'use strict';
// A damage report remembers whose hire the bin was on when the fault was
// reported (as a collection request does), so a later damage charge-back reads
// it from the report rather than from wherever the bin has gone since.
// Both request tables get an index per bin for "reports about this bin".

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE damage_reports ADD COLUMN customer_id INTEGER REFERENCES organisations(id) ON DELETE SET NULL;
      CREATE INDEX damage_reports_asset ON damage_reports (asset_id, created_at DESC);
      CREATE INDEX collection_requests_asset ON collection_requests (asset_id, created_at DESC);
      CREATE INDEX damage_reports_created_at ON damage_reports (created_at DESC);
      CREATE INDEX collection_requests_created_at ON collection_requests (created_at DESC);
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP INDEX IF EXISTS collection_requests_created_at;
      DROP INDEX IF EXISTS damage_reports_created_at;
      DROP INDEX IF EXISTS collection_requests_asset;
      DROP INDEX IF EXISTS damage_reports_asset;
      ALTER TABLE damage_reports DROP COLUMN IF EXISTS customer_id;
    `);
  },
};
