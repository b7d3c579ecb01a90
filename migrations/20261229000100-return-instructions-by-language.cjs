'use strict';
// The operator's own return instructions per language of the public bin page ({"nl": "…", "de": "…"}); the main
// `return_instructions` stays the wording shown where a language has none.
/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE settings ADD COLUMN return_instructions_by_language JSONB NOT NULL DEFAULT '{}'::jsonb
        CHECK (jsonb_typeof(return_instructions_by_language) = 'object');
    `);
  },
  async down(queryInterface) {
    await queryInterface.sequelize.query('ALTER TABLE settings DROP COLUMN IF EXISTS return_instructions_by_language;');
  },
};
