// sequelize-cli configuration. Every environment reads DATABASE_URL, which the
// project's scripts (src/cli/start.mjs, src/cli/test.mjs) set for the local
// cluster, or which you set to point at another PostgreSQL server.
const url = process.env.DATABASE_URL;
if (!url) {
  throw new Error('DATABASE_URL is not set: run through `npm start` / `npm test`, or export it (see README).');
}
const common = { url, dialect: 'postgres', logging: false, migrationStorageTableName: 'sequelize_meta', seederStorage: 'sequelize', seederStorageTableName: 'sequelize_data' };
module.exports = { development: common, test: common, production: common };
