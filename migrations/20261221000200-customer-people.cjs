'use strict';
// People of a customer: a customer admin invites colleagues and may limit a user to some of the organisation's
// sites. A user with no rows in user_sites sees every site of their organisation.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      ALTER TABLE users ADD COLUMN portal_admin BOOLEAN NOT NULL DEFAULT FALSE,
        ADD CONSTRAINT users_portal_admin_customer CHECK (NOT portal_admin OR role = 'customer');
      CREATE TABLE user_sites (
        user_id    INTEGER NOT NULL REFERENCES users(id) ON DELETE CASCADE,
        site_id    INTEGER NOT NULL REFERENCES sites(id) ON DELETE CASCADE,
        created_at TIMESTAMPTZ NOT NULL DEFAULT now(),
        PRIMARY KEY (user_id, site_id)
      );
      CREATE INDEX user_sites_site ON user_sites (site_id);
      -- A site limit names a site of the user's own organisation, and only customer users have one.
      CREATE FUNCTION user_sites_same_organisation() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF NOT EXISTS (SELECT 1 FROM users u JOIN sites s ON s.organisation_id = u.organisation_id
                        WHERE u.id = NEW.user_id AND s.id = NEW.site_id AND u.role = 'customer') THEN
          RAISE EXCEPTION 'a site limit must name a site of the customer user''s own organisation' USING ERRCODE = '23514';
        END IF;
        RETURN NEW;
      END $$;
      CREATE TRIGGER user_sites_same_organisation BEFORE INSERT OR UPDATE ON user_sites
        FOR EACH ROW EXECUTE FUNCTION user_sites_same_organisation();
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP TABLE IF EXISTS user_sites;
      DROP FUNCTION IF EXISTS user_sites_same_organisation();
      ALTER TABLE users DROP CONSTRAINT IF EXISTS users_portal_admin_customer, DROP COLUMN IF EXISTS portal_admin;
    `);
  },
};
