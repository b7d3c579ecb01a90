'use strict';
// The trailer a load leaves on (admin data, chosen when the truck is sent): its size checks the load and the
// dispatch note names it. Loads sent before this have none.
/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query('ALTER TABLE loads ADD COLUMN trailer_id INTEGER REFERENCES trailers(id) ON DELETE RESTRICT;');
  },
  async down(queryInterface) {
    await queryInterface.sequelize.query('ALTER TABLE loads DROP COLUMN IF EXISTS trailer_id;');
  },
};
