"use strict";
/**
 * The overshooting notice's PDF exactly as sent (its sha256 is already kept): the office and the
 * audit can download what the supervisor received.
 */
const { columnAdded, nullable } = require("./support/columns.cjs");

module.exports = columnAdded("overshooting_notices", "pdf", nullable.blob("medium"));
