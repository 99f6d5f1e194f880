"use strict";
/**
 * Users carry a row version like entities do: an admin's edit sends the version they saw, and a
 * stale one is refused (409), so two admins editing the same user cannot both win. Existing rows
 * start at 1. It is not the token version, which only counts session revocations.
 */
const { columnAdded, version } = require("./support/columns.cjs");

module.exports = columnAdded("users", "version", version());
