'use strict';
// Gap-free numbering of invoices and credit notes: one counter row per series
// and year, locked FOR UPDATE by the transaction that issues the document (not
// a sequence: a sequence skips numbers when a transaction rolls back).

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface) {
    await queryInterface.sequelize.query(`
      CREATE TABLE document_number_counters (
        series      VARCHAR(16) NOT NULL CHECK (series IN ('invoice', 'credit_note')),
        year        INTEGER     NOT NULL CHECK (year BETWEEN 2000 AND 9999),
        last_number INTEGER     NOT NULL DEFAULT 0 CHECK (last_number >= 0),
        updated_at  TIMESTAMPTZ NOT NULL DEFAULT now(),
        PRIMARY KEY (series, year)
      );
    `);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query('DROP TABLE IF EXISTS document_number_counters;');
  },
};
