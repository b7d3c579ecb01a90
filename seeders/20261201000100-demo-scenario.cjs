'use strict';
// Seeds the invented demo scenario by running the TypeScript seeding script
// (it goes through the app's own models and services, so seeded state and the
// event log agree). The script does nothing when the database already has data.
const { execFileSync } = require('node:child_process');
const path = require('node:path');

module.exports = {
  async up() {
    const root = path.resolve(__dirname, '..');
    execFileSync(process.execPath, ['--import', 'tsx', path.join(root, 'src', 'db', 'seed', 'run-demo.ts')], {
      cwd: root,
      stdio: 'inherit',
      env: process.env,
    });
  },
  async down(queryInterface) {
    // Removes every row but keeps the schema (migrations own it).
    await queryInterface.sequelize.query(`
      DO $$ DECLARE t text; BEGIN
        FOR t IN SELECT tablename FROM pg_tables WHERE schemaname = 'public'
                 AND tablename NOT IN ('sequelize_meta', 'sequelize_data') LOOP
          EXECUTE format('TRUNCATE TABLE %I RESTART IDENTITY CASCADE', t);
        END LOOP;
      END $$;`);
  },
};
