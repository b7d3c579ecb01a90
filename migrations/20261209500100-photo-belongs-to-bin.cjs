'use strict';
// A photo named by a scan belongs to one bin: the first scan that names it
// claims it (attachments.asset_id), and a scan of another bin cannot name it.
// Existing references are carried over: damage reports, inspections, and the
// photo ids kept in scan events' payloads (the earliest event wins).

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE attachments ADD COLUMN asset_id INTEGER REFERENCES assets(id) ON DELETE SET NULL;
      UPDATE attachments a SET asset_id = e.asset_id
        FROM (SELECT DISTINCT ON (pid) pid, asset_id
                FROM (SELECT jsonb_array_elements_text(payload->'photoIds')::int AS pid, asset_id, id
                        FROM scan_events WHERE jsonb_typeof(payload->'photoIds') = 'array') x
               ORDER BY pid, id) e
       WHERE a.id = e.pid AND a.asset_id IS NULL;
      UPDATE attachments a SET asset_id = i.asset_id
        FROM (SELECT DISTINCT ON (pid) unnest(photo_ids) AS pid, asset_id FROM inspections ORDER BY pid, id) i
       WHERE a.id = i.pid AND a.asset_id IS NULL;
      UPDATE attachments a SET asset_id = d.asset_id
        FROM damage_reports d WHERE d.photo_id = a.id AND d.asset_id IS NOT NULL AND a.asset_id IS NULL;
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`ALTER TABLE attachments DROP COLUMN asset_id;`);
  },
};
