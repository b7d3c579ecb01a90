'use strict';
// The fleet grid pages through bins with ORDER BY <column>, id and OFFSET. With
// the id inside each sort column's index, PostgreSQL walks the index alone
// (an index-only scan) past the skipped rows, instead of visiting 90,000 table
// rows for a page deep in the list. These replace the single-column indexes of
// the same names; GRAI stays unique and now carries the id too.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP INDEX assets_next_due;   CREATE INDEX assets_next_due   ON assets (next_due, id);
      DROP INDEX assets_last_scan;  CREATE INDEX assets_last_scan  ON assets (last_scan_at, id);
      DROP INDEX assets_trip_count; CREATE INDEX assets_trip_count ON assets (trip_count, id);
      DROP INDEX assets_site_since; CREATE INDEX assets_site_since ON assets (site_since, id);
      DROP INDEX assets_serial;     CREATE INDEX assets_serial     ON assets (serial, id);
      CREATE INDEX assets_last_inspection ON assets (last_inspection_on, id);
      ALTER TABLE assets DROP CONSTRAINT assets_grai_key, ADD CONSTRAINT assets_grai_key UNIQUE (grai) INCLUDE (id);
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE assets DROP CONSTRAINT assets_grai_key, ADD CONSTRAINT assets_grai_key UNIQUE (grai);
      DROP INDEX assets_last_inspection;
      DROP INDEX assets_serial;     CREATE INDEX assets_serial     ON assets (serial);
      DROP INDEX assets_site_since; CREATE INDEX assets_site_since ON assets (site_since);
      DROP INDEX assets_trip_count; CREATE INDEX assets_trip_count ON assets (trip_count);
      DROP INDEX assets_last_scan;  CREATE INDEX assets_last_scan  ON assets (last_scan_at);
      DROP INDEX assets_next_due;   CREATE INDEX assets_next_due   ON assets (next_due);
    `);
  },
};
