import { describe, expect, it } from "vitest";
import { parseObservationCsv } from "../../../shared/ingest/parse-csv";

const ref = { portfolios: new Map([["BOOK-A", { entityCode: "E1", holidays: new Map<string, string>() }]]) };
const HEADER = "portfolio,date,actual_pnl,hypothetical_pnl,var_99";
const one = (cells: string) => parseObservationCsv(`${HEADER}\nBOOK-A,2026-03-03,${cells}\n`, ref);

describe("amounts in a daily file", () => {
  it("when an amount has more than 13 whole digits, then the cell is refused with that reason (a double could not store it exactly)", () => {
    const parsed = one("12345678901234.5,-1,10");
    expect(parsed.rows).toEqual([]);
    expect(parsed.errors).toEqual([
      { line: 2, column: "actual_pnl", message: '"12345678901234.5" has more than 13 digits before the decimal point' },
    ]);
  });

  it("when an amount has 13 whole digits and cents, then it is stored exactly as written", () => {
    expect(one("-9999999999999.99,1234567890123.45,10").rows[0]).toMatchObject({
      actual_pnl: -9999999999999.99,
      hypothetical_pnl: 1234567890123.45,
    });
  });

  it("when an amount ends in half a cent, then it rounds away from zero whatever its sign (common practice)", () => {
    expect(one("0.125,-0.125,10.005").rows[0]).toMatchObject({
      actual_pnl: 0.13,
      hypothetical_pnl: -0.13,
      var_99: 10.01,
    });
  });
});

describe("one row per portfolio and day", () => {
  const ref2 = {
    portfolios: new Map(
      ["BOOK-A", "BOOK-B"].map((c) => [c, { entityCode: "E1", holidays: new Map<string, string>() }]),
    ),
  };
  const file = (lines: string[]) =>
    parseObservationCsv(`${HEADER}\n${lines.map((l) => `${l},-1,-1,10`).join("\n")}\n`, ref2);

  it("when a day comes back after later days, in order or not, then the repeat is refused with the line it first appeared on", () => {
    const parsed = file([
      "BOOK-A,2026-03-02", // line 2
      "BOOK-A,2026-03-03",
      "BOOK-A,2026-03-05",
      "BOOK-A,2026-03-03", // line 5: a repeat out of order
      "BOOK-A,2026-03-04", // line 6: out of order, but new
      "BOOK-B,2026-03-03", // another portfolio's day
      "BOOK-A,2026-03-06",
      "BOOK-A,2026-03-04", // line 9: repeats line 6
      "BOOK-A,2026-03-02", // line 10: repeats line 2
    ]);
    expect(parsed.errors).toEqual([
      { line: 5, column: "date", message: "BOOK-A on 2026-03-03 already appears on line 3" },
      { line: 9, column: "date", message: "BOOK-A on 2026-03-04 already appears on line 6" },
      { line: 10, column: "date", message: "BOOK-A on 2026-03-02 already appears on line 2" },
    ]);
    expect(parsed.rows.map((r) => `${r.portfolio} ${r.date}`)).toEqual([
      "BOOK-A 2026-03-02",
      "BOOK-A 2026-03-03",
      "BOOK-A 2026-03-05",
      "BOOK-A 2026-03-04",
      "BOOK-B 2026-03-03",
      "BOOK-A 2026-03-06",
    ]);
  });

  it("when days come in order with the last one repeated, then the repeat is refused", () => {
    expect(file(["BOOK-A,2026-03-02", "BOOK-A,2026-03-03", "BOOK-A,2026-03-03"]).errors).toEqual([
      { line: 4, column: "date", message: "BOOK-A on 2026-03-03 already appears on line 3" },
    ]);
  });
});
