import { describe, expect, it } from "vitest";
import { parseObservationCsv } from "../../../shared/ingest/parse-csv";

const ref = { portfolios: new Map([["BOOK-A", { entityCode: "E1", holidays: new Map<string, string>() }]]) };
const HEADER = "portfolio,date,actual_pnl,hypothetical_pnl,var_99";
const one = (cells: string) => parseObservationCsv(`${HEADER}\nBOOK-A,2026-03-03,${cells}\n`, ref);

describe("amounts in a daily file", () => {
  it("when an amount has more than 13 whole digits, then the cell is refused with that reason (a double could not store it exactly)", () => {
    const parsed = one("12345678901234.5,-1,10");
    expect(parsed.rows).toEqual([]);
    expect(parsed.errors).toEqual([{ line: 2, column: "actual_pnl", message: '"12345678901234.5" has more than 13 digits before the decimal point' }]);
  });

  it("when an amount has 13 whole digits and cents, then it is stored exactly as written", () => {
    expect(one("-9999999999999.99,1234567890123.45,10").rows[0]).toMatchObject({ actual_pnl: -9999999999999.99, hypothetical_pnl: 1234567890123.45 });
  });

  it("when an amount ends in half a cent, then it rounds away from zero whatever its sign (common practice)", () => {
    expect(one("0.125,-0.125,10.005").rows[0]).toMatchObject({ actual_pnl: 0.13, hypothetical_pnl: -0.13, var_99: 10.01 });
  });
});
