import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { parseObservationCsv, serialiseObservationCsv, CsvFileError, decodeCheckedRows, encodeCheckedRows } from "../../../shared/ingest/parse-csv";
import { ALL_COLUMNS, REQUIRED_COLUMNS } from "../../../shared/schemas/upload";

const ref = {
  portfolios: new Map([
    ["BOOK-A", { entityCode: "E1", holidays: new Map([["2026-12-25", "Christmas Day"]]) }],
    ["BOOK-B", { entityCode: "E2", holidays: new Map<string, string>() }],
  ]),
};

// Amounts as the file would hold them: cents, any sign for P&L, positive for VaR.
const cents = (min: number, max: number) => fc.integer({ min, max }).map((c) => (c / 100).toFixed(2));
const weekday = fc.integer({ min: 0, max: 400 }).map((n) => {
  const d = new Date(Date.UTC(2025, 0, 1) + n * 86_400_000);
  return d.toISOString().slice(0, 10);
});
const validRow = fc.record({
  portfolio: fc.constantFrom("BOOK-A", "BOOK-B"),
  date: weekday,
  actual_pnl: cents(-5_000_000_00, 5_000_000_00),
  hypothetical_pnl: cents(-5_000_000_00, 5_000_000_00),
  var_99: cents(1, 9_000_000_00),
  var_975: fc.option(cents(1, 9_000_000_00), { nil: undefined }),
});

function isBusinessDay(portfolio: string, date: string): boolean {
  const wd = new Date(`${date}T00:00:00Z`).getUTCDay();
  return wd !== 0 && wd !== 6 && !(portfolio === "BOOK-A" && date === "2026-12-25");
}

describe("parsing generated daily files (property-based, fast-check)", () => {
  it("when every row is valid, then every row is accepted and parse ∘ serialise gives the same values back", () => {
    fc.assert(
      fc.property(fc.uniqueArray(validRow, { minLength: 1, maxLength: 40, selector: (r) => `${r.portfolio}|${r.date}` }), (rows) => {
        const businessRows = rows.filter((r) => isBusinessDay(r.portfolio, r.date));
        fc.pre(businessRows.length > 0);
        const text = serialiseObservationCsv(businessRows);
        const parsed = parseObservationCsv(text, ref);
        expect(parsed.errors).toEqual([]);
        expect(parsed.rows.length).toBe(businessRows.length);
        parsed.rows.forEach((row, i) => {
          const src = businessRows[i];
          expect(row.portfolio).toBe(src.portfolio);
          expect(row.date).toBe(src.date);
          expect(row.actual_pnl).toBe(Number(src.actual_pnl));
          expect(row.var_99).toBe(Number(src.var_99));
          expect(row.var_975 ?? undefined).toBe(src.var_975 === undefined ? undefined : Number(src.var_975));
        });
        // And written back out, the file reads the same again.
        const again = parseObservationCsv(serialiseObservationCsv(parsed.rows), ref);
        expect(again.rows.map(({ line: _l, ...r }) => r)).toEqual(parsed.rows.map(({ line: _l, ...r }) => r));
      }),
      { numRuns: 200 },
    );
  });

  it("when cells are arbitrary text, then the parser never throws unexpectedly and everything it accepts is valid", () => {
    const cell = fc.oneof(fc.string({ maxLength: 12 }), cents(-1000, 1000), fc.constantFrom("NaN", "1e308", "-0", "", "  7 ", "1,5", "\"", "__proto__"));
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.constantFrom("BOOK-A", "BOOK-B", "nope", ""), weekday, cell, cell, cell), { minLength: 1, maxLength: 30 }), (cells) => {
        const text = [REQUIRED_COLUMNS.join(","), ...cells.map((c) => c.join(","))].join("\n");
        let parsed;
        try {
          parsed = parseObservationCsv(text, ref);
        } catch (err) {
          expect(err).toBeInstanceOf(CsvFileError); // the only way a file is refused as a whole
          return;
        }
        for (const row of parsed.rows) {
          expect(ref.portfolios.has(row.portfolio)).toBe(true);
          expect(isBusinessDay(row.portfolio, row.date)).toBe(true);
          for (const v of [row.actual_pnl, row.hypothetical_pnl]) expect(v === null || Number.isFinite(v)).toBe(true);
          expect(row.var_99 === null || (row.var_99 as number) > 0).toBe(true);
        }
        expect(parsed.rows.length + parsed.invalidLines.size).toBeLessThanOrEqual(parsed.totalRows);
      }),
      { numRuns: 300 },
    );
  });

  it("when a preview's checked rows are encoded and decoded, then the commit sees exactly the rows the preview accepted", () => {
    fc.assert(
      fc.property(fc.uniqueArray(validRow, { minLength: 1, maxLength: 40, selector: (r) => `${r.portfolio}|${r.date}` }), (rows) => {
        const business = rows.filter((r) => isBusinessDay(r.portfolio, r.date));
        fc.pre(business.length > 0);
        const parsed = parseObservationCsv(serialiseObservationCsv(business), ref);
        const back = decodeCheckedRows(encodeCheckedRows(parsed.rows), ref);
        expect(back.errors).toEqual([]);
        expect(back.rows).toEqual(parsed.rows);
      }),
      { numRuns: 100 },
    );
  });

  it("when a day became a holiday after the preview, then decoding the checked rows reports it", () => {
    const parsed = parseObservationCsv("portfolio,date,actual_pnl,hypothetical_pnl,var_99\nBOOK-B,2026-12-25,-1,-1,10\n", ref);
    const later = { portfolios: new Map([["BOOK-B", { entityCode: "E2", holidays: new Map([["2026-12-25", "Christmas Day"]]) }]]) };
    expect(decodeCheckedRows(encodeCheckedRows(parsed.rows), later).errors).toEqual([expect.objectContaining({ line: 2, column: "date" })]);
  });

  it("the template's columns are exactly the columns the parser knows", () => {
    const header = serialiseObservationCsv([]).trim();
    expect(header.split(",")).toEqual([...ALL_COLUMNS]);
  });
});
