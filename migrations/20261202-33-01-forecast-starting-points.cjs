"use strict";
/**
 * The starting point of the forecast and the what-if, stored with the headline book's figures
 * (server/modules/figures/stored-figures.ts): the last 250 days up to the latest one, the calendar
 * and exclusions that touch them, and the settings records. Refreshed in the same transaction as
 * the rest of the row; a row without it (made before this column) is computed on its first read.
 */
const { columnAdded, nullable } = require("./support/columns.cjs");

module.exports = columnAdded("portfolio_figures", "start_json", nullable.text("long"));
