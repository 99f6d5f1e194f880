"use strict";
/**
 * FRTB charges per portfolio and day (docs/rules.md#frtb-aggregation): the internal-model default
 * risk charge, the standardised figures (sensitivities-based method, residual risk add-on, default
 * risk charge) and, at the top of house, the standardised charge of the desks in the model
 * together. All optional, DECIMAL(20,2) like the other amounts.
 */
const { columnsAdded } = require("./support/columns.cjs");
const COLUMNS = ["ima_drc", "sbm", "rrao", "sa_drc", "sa_ga"];

module.exports = columnsAdded("observations", COLUMNS, "DECIMAL(20,2) NULL");
