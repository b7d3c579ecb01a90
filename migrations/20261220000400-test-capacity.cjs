'use strict';
// How many periodic tests a depot's bench can do per weekday (Sunday first), for the test-day plan.
// The default, eight a day on weekdays, is a placeholder to be set per depot (common practice, not a rule).

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE sites ADD COLUMN test_capacity INTEGER[] NOT NULL DEFAULT '{0,8,8,8,8,8,0}'
        CHECK (array_length(test_capacity, 1) = 7 AND 0 <= ALL (test_capacity));
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query('ALTER TABLE sites DROP COLUMN IF EXISTS test_capacity;');
  },
};
