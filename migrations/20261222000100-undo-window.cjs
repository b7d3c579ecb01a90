'use strict';
// How long the person who recorded a scan may undo it themselves (seconds; 0 = no undo).
/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE settings ADD COLUMN undo_seconds INTEGER NOT NULL DEFAULT 30 CHECK (undo_seconds BETWEEN 0 AND 600);
    `);
  },
  async down(queryInterface) {
    await queryInterface.sequelize.query('ALTER TABLE settings DROP COLUMN IF EXISTS undo_seconds;');
  },
};
