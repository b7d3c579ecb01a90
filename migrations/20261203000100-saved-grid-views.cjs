'use strict';
// Saved grid views: a planner's named filter, sort and column layout for a
// grid, private or shared with every planner and admin. The state is checked
// by the app against the grid's column whitelist before it is stored.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      CREATE TABLE grid_views (
        id          SERIAL PRIMARY KEY,
        owner_id    INTEGER NOT NULL REFERENCES users(id) ON DELETE CASCADE,
        grid        VARCHAR(32) NOT NULL CHECK (grid ~ '^[a-z][a-z0-9-]*$'),
        name        VARCHAR(80) NOT NULL CHECK (length(trim(name)) > 0),
        shared      BOOLEAN NOT NULL DEFAULT FALSE,
        state       JSONB NOT NULL CHECK (jsonb_typeof(state) = 'object'),
        version     INTEGER NOT NULL DEFAULT 0,
        created_at  TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at  TIMESTAMPTZ NOT NULL DEFAULT now()
      );
      -- One name per owner and grid, whatever the letter case.
      CREATE UNIQUE INDEX grid_views_owner_name ON grid_views (owner_id, grid, lower(name));
      CREATE INDEX grid_views_shared ON grid_views (grid) WHERE shared;
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query('DROP TABLE IF EXISTS grid_views;');
  },
};
