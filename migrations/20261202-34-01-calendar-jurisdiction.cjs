"use strict";
/**
 * Calendars from a holiday library (docs/rules.md#business-days): each entity gets the country whose public
 * holidays it keeps, and each holiday row says where it came from — "library" (imported public holidays) or
 * "bank" (the bank's own closing days, added by hand). Existing rows are the bank's own.
 *
 * The country is derived from the currency where one currency means one country; a euro entity is left
 * without one until an admin chooses it on the entity form (the euro is the currency of many countries).
 */
const { notNull, nullable } = require("./support/columns.cjs");

const COUNTRY_OF_CURRENCY = {
  GBP: "GB",
  USD: "US",
  SGD: "SG",
  CHF: "CH",
  JPY: "JP",
  HKD: "HK",
  CAD: "CA",
  AUD: "AU",
  SEK: "SE",
  NOK: "NO",
  DKK: "DK",
};

module.exports = {
  async up(qi) {
    await qi.addColumn("entities", "country", { ...nullable.char(2), after: "currency" });
    for (const [currency, country] of Object.entries(COUNTRY_OF_CURRENCY)) {
      await qi.sequelize.query("UPDATE entities SET country = :country WHERE currency = :currency", {
        replacements: { country, currency },
      });
    }
    await qi.addColumn("holidays", "source", {
      ...notNull.oneOf("bank", "library"),
      defaultValue: "bank",
      after: "name",
    });
  },

  async down(qi) {
    await qi.removeColumn("holidays", "source");
    await qi.removeColumn("entities", "country");
  },
};
