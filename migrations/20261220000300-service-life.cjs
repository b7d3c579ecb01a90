'use strict';
// ADR 4.1.1.15: rigid plastics IBCs and composite IBCs with a rigid plastics inner receptacle may be used
// for dangerous goods for 5 years from the manufacture of the inner receptacle. A bin type says whether
// the rule applies to it (not to bins lined with a single-use flexible liner) and for how many years; a bin
// of such a type keeps the month its inner receptacle was made.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE bin_types
        ADD COLUMN service_life_applies BOOLEAN NOT NULL DEFAULT FALSE,
        ADD COLUMN service_life_years   INTEGER NOT NULL DEFAULT 5 CHECK (service_life_years BETWEEN 1 AND 5);
      ALTER TABLE assets
        ADD COLUMN inner_made_month DATE CHECK (inner_made_month IS NULL OR extract(day FROM inner_made_month) = 1);
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE assets DROP COLUMN IF EXISTS inner_made_month;
      ALTER TABLE bin_types DROP COLUMN IF EXISTS service_life_years, DROP COLUMN IF EXISTS service_life_applies;
    `);
  },
};
