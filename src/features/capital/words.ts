/** Said wherever a capital figure cannot be computed, so a dash is never the only answer. */
export const NO_CAPITAL_INPUTS = "No capital inputs in the data";

/** A distribution row below this chance reads 0.00% and is left out of the table and chart. */
export const SHOWN_FROM = 0.00005;
