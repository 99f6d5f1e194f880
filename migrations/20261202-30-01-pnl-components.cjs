"use strict";
/**
 * The parts of a day's actual P&L that the rule sets treat differently (docs/rules.md#pnl-definition):
 * fees and commissions, reserves and valuation adjustments, net interest income, intraday trading and
 * new-trade P&L. All optional and signed, DECIMAL(20,2) like the other amounts.
 */
const { columnsAdded } = require("./support/columns.cjs");
const COLUMNS = ["fees_commissions", "reserves_adjustments", "net_interest_income", "intraday_pnl", "new_trade_pnl"];

module.exports = columnsAdded("observations", COLUMNS, "DECIMAL(20,2) NULL");
