'use strict';
// Seed runs: a row is written when the demo seed starts and finished when its
// last transaction commits (in that same transaction). A row left unfinished
// means a seed was interrupted half-way: the next `npm start` wipes the data
// and seeds again instead of taking a half-filled database as seeded.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      CREATE TABLE seed_runs (
        id           SERIAL PRIMARY KEY,
        name         VARCHAR(32) NOT NULL,
        started_at   TIMESTAMPTZ NOT NULL DEFAULT clock_timestamp(),
        finished_at  TIMESTAMPTZ,
        summary      JSONB,
        CHECK (finished_at IS NULL OR finished_at >= started_at)
      );
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query('DROP TABLE IF EXISTS seed_runs;');
  },
};
