'use strict';
// The 2.5-year clock runs from the last inspection done with a leakproofness test (ADR 6.5.4.4.2), which
// need not be the last inspection: a 5-year inspection without one restarts only the 5-year clock. So a bin
// keeps the day of its last leakproofness test beside its last inspection of any kind. Until now every
// recorded inspection restarted both clocks, so the last inspection is where each bin's clock stands today.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE assets ADD COLUMN last_leak_test_on DATE;
      UPDATE assets SET last_leak_test_on = last_inspection_on WHERE last_inspection_on IS NOT NULL;
      ALTER TABLE assets ADD CONSTRAINT assets_leak_test_not_after_inspection
        CHECK (last_leak_test_on IS NULL OR (last_inspection_on IS NOT NULL AND last_leak_test_on <= last_inspection_on));
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query('ALTER TABLE assets DROP COLUMN IF EXISTS last_leak_test_on;');
  },
};
