'use strict';
// Who is who: the operator and its customers, their sites, the people who sign
// in, and the operator-wide settings. Written as SQL so every constraint the
// domain has is visible in one place.

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      CREATE TABLE organisations (
        id            SERIAL PRIMARY KEY,
        name          VARCHAR(160) NOT NULL CHECK (length(trim(name)) > 0),
        kind          VARCHAR(16)  NOT NULL CHECK (kind IN ('operator', 'customer')),
        contact_email VARCHAR(254),
        -- hire terms (customers): free days on hire, then a daily rate per bin
        free_days     INTEGER      NOT NULL DEFAULT 0 CHECK (free_days >= 0 AND free_days <= 365),
        daily_rate    NUMERIC(10,2) NOT NULL DEFAULT 0 CHECK (daily_rate >= 0),
        trip_fee      NUMERIC(10,2) NOT NULL DEFAULT 0 CHECK (trip_fee >= 0),
        lost_bin_fee  NUMERIC(10,2) NOT NULL DEFAULT 0 CHECK (lost_bin_fee >= 0),
        currency      CHAR(3)      NOT NULL DEFAULT 'EUR' CHECK (currency ~ '^[A-Z]{3}$'),
        active        BOOLEAN      NOT NULL DEFAULT TRUE,
        version       INTEGER      NOT NULL DEFAULT 0,
        created_at    TIMESTAMPTZ  NOT NULL DEFAULT now(),
        updated_at    TIMESTAMPTZ  NOT NULL DEFAULT now()
      );
      CREATE UNIQUE INDEX organisations_name_key ON organisations (lower(name));
      -- Exactly one operator organisation: the company that owns the pool.
      CREATE UNIQUE INDEX organisations_one_operator ON organisations (kind) WHERE kind = 'operator';

      CREATE TABLE sites (
        id              SERIAL PRIMARY KEY,
        organisation_id INTEGER NOT NULL REFERENCES organisations(id) ON DELETE RESTRICT,
        code            VARCHAR(24)  NOT NULL UNIQUE CHECK (code ~ '^[A-Z0-9][A-Z0-9-]*$'),
        name            VARCHAR(160) NOT NULL CHECK (length(trim(name)) > 0),
        kind            VARCHAR(16)  NOT NULL CHECK (kind IN ('depot', 'customer', 'repair', 'recycling')),
        address         TEXT,
        latitude        NUMERIC(9,6) CHECK (latitude BETWEEN -90 AND 90),
        longitude       NUMERIC(9,6) CHECK (longitude BETWEEN -180 AND 180),
        active          BOOLEAN NOT NULL DEFAULT TRUE,
        version         INTEGER NOT NULL DEFAULT 0,
        created_at      TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at      TIMESTAMPTZ NOT NULL DEFAULT now(),
        CHECK ((latitude IS NULL) = (longitude IS NULL))
      );
      CREATE INDEX sites_organisation_id ON sites (organisation_id);
      CREATE INDEX sites_kind ON sites (kind);

      CREATE TABLE users (
        id                  SERIAL PRIMARY KEY,
        email               VARCHAR(254) NOT NULL CHECK (email = lower(email) AND email LIKE '%_@_%'),
        name                VARCHAR(160) NOT NULL CHECK (length(trim(name)) > 0),
        password_hash       VARCHAR(100),
        role                VARCHAR(16)  NOT NULL CHECK (role IN ('admin', 'planner', 'yard', 'customer')),
        organisation_id     INTEGER NOT NULL REFERENCES organisations(id) ON DELETE RESTRICT,
        home_site_id        INTEGER REFERENCES sites(id) ON DELETE SET NULL,
        qualified_inspector BOOLEAN NOT NULL DEFAULT FALSE,
        active              BOOLEAN NOT NULL DEFAULT TRUE,
        last_sign_in_at     TIMESTAMPTZ,
        version             INTEGER NOT NULL DEFAULT 0,
        created_at          TIMESTAMPTZ NOT NULL DEFAULT now(),
        updated_at          TIMESTAMPTZ NOT NULL DEFAULT now()
      );
      CREATE UNIQUE INDEX users_email_key ON users (email);
      CREATE INDEX users_organisation_id ON users (organisation_id);

      -- One-time links for invitations and password resets. Only a hash of the
      -- token is stored, so a database read does not hand out sign-ins.
      CREATE TABLE user_tokens (
        id          SERIAL PRIMARY KEY,
        user_id     INTEGER NOT NULL REFERENCES users(id) ON DELETE CASCADE,
        purpose     VARCHAR(16) NOT NULL CHECK (purpose IN ('invite', 'reset')),
        token_hash  CHAR(64) NOT NULL UNIQUE,
        expires_at  TIMESTAMPTZ NOT NULL,
        used_at     TIMESTAMPTZ,
        created_at  TIMESTAMPTZ NOT NULL DEFAULT now()
      );
      CREATE INDEX user_tokens_user_id ON user_tokens (user_id);

      -- Operator-wide settings: a single row.
      CREATE TABLE settings (
        id                  INTEGER PRIMARY KEY DEFAULT 1 CHECK (id = 1),
        operator_name       VARCHAR(160) NOT NULL,
        gs1_company_prefix  VARCHAR(12) NOT NULL CHECK (gs1_company_prefix ~ '^[0-9]{4,12}$'),
        gs1_prefix_length   INTEGER NOT NULL CHECK (gs1_prefix_length BETWEEN 4 AND 12),
        digital_link_base   VARCHAR(200) NOT NULL CHECK (digital_link_base ~ '^https?://'),
        time_zone           VARCHAR(64) NOT NULL,
        currency            CHAR(3) NOT NULL CHECK (currency ~ '^[A-Z]{3}$'),
        tax_rate            NUMERIC(5,4) NOT NULL CHECK (tax_rate >= 0 AND tax_rate < 1),
        mail_sender         VARCHAR(254) NOT NULL CHECK (mail_sender LIKE '%_@_%'),
        return_instructions TEXT NOT NULL DEFAULT '',
        version             INTEGER NOT NULL DEFAULT 0,
        updated_at          TIMESTAMPTZ NOT NULL DEFAULT now(),
        CHECK (length(gs1_company_prefix) = gs1_prefix_length)
      );
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query(`
      DROP TABLE IF EXISTS settings;
      DROP TABLE IF EXISTS user_tokens;
      DROP TABLE IF EXISTS users;
      DROP TABLE IF EXISTS sites;
      DROP TABLE IF EXISTS organisations;
    `);
  },
};
