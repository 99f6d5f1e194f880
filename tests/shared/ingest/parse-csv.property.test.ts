import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  parseObservationCsv,
  serialiseObservationCsv,
  CsvByteStream,
  CsvFileError,
  decodeCsvBytes,
  recheckReferenceData,
} from "../../../shared/ingest/parse-csv";
import { ALL_COLUMNS, CELL_PATTERNS, REQUIRED_COLUMNS, observationCellsSchema } from "../../../shared/schemas/upload";

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
      fc.property(
        fc.uniqueArray(validRow, { minLength: 1, maxLength: 40, selector: (r) => `${r.portfolio}|${r.date}` }),
        (rows) => {
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
        },
      ),
      { numRuns: 200 },
    );
  });

  it("when days come in any order with repeats, then exactly the repeats are refused, each naming the line the day first appeared on", () => {
    // Runs that go forward, then jump back: the order files usually have, and the order they break it in.
    const day = fc.integer({ min: 0, max: 60 });
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.constantFrom("BOOK-A", "BOOK-B"), day), { minLength: 1, maxLength: 80 }),
        (picks) => {
          const dates = picks.map(([, n]) =>
            new Date(Date.UTC(2025, 0, 6) + (Math.floor(n / 5) * 7 + (n % 5)) * 86_400_000).toISOString().slice(0, 10),
          );
          const text = [REQUIRED_COLUMNS.join(","), ...picks.map(([p], i) => `${p},${dates[i]},-1,-1,10`)].join("\n");
          // The model: a set of what was seen, with the first line of each.
          const first = new Map<string, number>();
          const expected: { line: number; column: string; message: string }[] = [];
          picks.forEach(([p], i) => {
            const key = `${p} on ${dates[i]}`;
            const line = i + 2;
            if (first.has(key))
              expected.push({ line, column: "date", message: `${key} already appears on line ${first.get(key)}` });
            else first.set(key, line);
          });
          const parsed = parseObservationCsv(text, ref);
          expect(parsed.errors).toEqual(expected);
          expect(parsed.rows.length).toBe(first.size);
        },
      ),
      { numRuns: 500 },
    );
  });

  it("when cells are arbitrary text, then the parser never throws unexpectedly and everything it accepts is valid", () => {
    const cell = fc.oneof(
      fc.string({ maxLength: 12 }),
      cents(-1000, 1000),
      fc.constantFrom("NaN", "1e308", "-0", "", "  7 ", "1,5", '"', "__proto__"),
    );
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.constantFrom("BOOK-A", "BOOK-B", "nope", ""), weekday, cell, cell, cell), {
          minLength: 1,
          maxLength: 30,
        }),
        (cells) => {
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
          expect(parsed.rows.length + parsed.invalidCount).toBeLessThanOrEqual(parsed.totalRows);
        },
      ),
      { numRuns: 300 },
    );
  });

  it("when a file is read line by line in place, then it gives exactly the rows and problems of the general way", () => {
    // parseObservationCsv reads plain lines straight from the text and hands every other line to
    // the cell-by-cell checks; { plainLines: false } sends every line the general way.
    const amount = fc.oneof(
      cents(-9_000_000_00, 9_000_000_00),
      fc.stringMatching(/^-?\d{1,17}(\.\d{1,8})?$/),
      fc.integer({ min: -99_999_999, max: 99_999_999 }).map(String),
      fc.constantFrom(
        "",
        "-0",
        "0",
        "0.001",
        "0.005",
        "-0.015",
        "1.005",
        "12345678901234.56",
        "99999999999999999.99999999",
        "7.",
        ".5",
        "1e3",
        " 7",
        "NaN",
        "1,5",
      ),
    );
    const portfolio = fc.constantFrom("BOOK-A", "BOOK-B", "book-a", " BOOK-B", "BOOK-A ", "nope", "", "-X", "BOOK-A\t");
    const date = fc.oneof(
      weekday,
      fc.constantFrom(
        "2026-12-25",
        "2026-02-30",
        "2026-13-01",
        "2026-1-01",
        " 2026-03-03",
        "2026-03-03 ",
        "20260303",
        "",
      ),
    );
    const line = fc.tuple(portfolio, date, amount, amount, amount, amount).map((cells) => cells.join(","));
    const extra = fc.constantFrom("", "   ", "BOOK-A,2026-03-03,1,1", "BOOK-A,2026-03-03,1,1,1,1,1");
    fc.assert(
      fc.property(
        fc.array(fc.oneof({ weight: 8, arbitrary: line }, { weight: 1, arbitrary: extra }), {
          minLength: 1,
          maxLength: 40,
        }),
        fc.constantFrom("\n", "\r\n"),
        (lines, eol) => {
          const text = ["portfolio,date,actual_pnl,hypothetical_pnl,var_99,var_975", ...lines].join(eol);
          const read = (plainLines: boolean) => {
            try {
              return parseObservationCsv(text, ref, { plainLines });
            } catch (err) {
              return { refused: (err as Error).message };
            }
          };
          expect(read(true)).toEqual(read(false));
        },
      ),
      { numRuns: 1500 },
    );
  });

  it("when a file arrives in pieces cut anywhere, then reading it as it comes gives exactly what reading it whole gives", () => {
    // The upload parses while the file is received (CsvByteStream); the whole file is the reference.
    const good = fc
      .tuple(
        fc.constantFrom("BOOK-A", "BOOK-B", "book-b"),
        weekday,
        cents(-1_000_00, 1_000_00),
        cents(-1_000_00, 1_000_00),
        cents(1, 5_000_00),
      )
      .map((c) => c.join(","));
    const odd = fc.constantFrom(
      "",
      "  ",
      "nope,2026-03-03,1,1,1",
      "BOOK-A,2026-03-07,1,1,1",
      "BOOK-A,2026-03-03,NaN,1,1",
      "BOOK-A,2026-03-03,1,1",
      'BOOK-A,"2026-03-03",1,1,1',
      "BOOK-A,2026-03-03,1\r,1,1",
      "BOOK-A,2026-03-03,1,1,1\u0000",
      "BOOK-A,2026-03-03,1,1,-1",
      "Bücher,2026-03-03,1,1,1",
    );
    const header = fc.constantFrom(
      "portfolio,date,actual_pnl,hypothetical_pnl,var_99",
      "\ufeffportfolio,date,actual_pnl,hypothetical_pnl,var_99",
      "\ufeff\ufeffportfolio,date,actual_pnl,hypothetical_pnl,var_99",
      "portfolio,date,actual_pnl",
      "PORTFOLIO, date ,actual_pnl,hypothetical_pnl,var_99",
      "",
    );
    const file = fc.tuple(
      header,
      fc.array(fc.oneof({ weight: 6, arbitrary: good }, { weight: 1, arbitrary: odd }), { maxLength: 30 }),
      fc.constantFrom("\n", "\r\n", "\r"),
      fc.boolean(),
    );
    const bytesOf = ([head, lines, eol, trailing]: [string, string[], string, boolean]) => {
      const bytes = Buffer.from([head, ...lines].join(eol) + (trailing ? eol : ""));
      return bytes;
    };
    const outcome = (read: () => unknown) => {
      try {
        return read();
      } catch (err) {
        return {
          refused: (err as Error).message,
          status: err instanceof CsvFileError ? err.status : undefined,
          errors: err instanceof CsvFileError ? err.errors : undefined,
        };
      }
    };
    fc.assert(
      fc.property(
        file,
        fc.array(fc.integer({ min: 0, max: 4000 }), { maxLength: 12 }),
        fc.boolean(),
        (parts, cuts, broken) => {
          let bytes = bytesOf(parts);
          if (broken && bytes.length > 2)
            bytes = Buffer.concat([
              bytes.subarray(0, bytes.length >> 1),
              Buffer.from([0xc3]),
              bytes.subarray(bytes.length >> 1),
            ]); // not UTF-8
          const at = [...new Set(cuts.map((c) => c % (bytes.length + 1)))].sort((a, b) => a - b);
          const whole = outcome(() => parseObservationCsv(decodeCsvBytes(bytes), ref));
          const streamed = outcome(() => {
            const stream = new CsvByteStream(ref);
            let from = 0;
            for (const to of [...at, bytes.length]) {
              stream.push(bytes.subarray(from, to));
              from = to;
            }
            return stream.end(bytes);
          });
          expect(streamed).toEqual(whole);
        },
      ),
      { numRuns: 2000 },
    );
  });

  it("when a plain file arrives in pieces, then it is read as it comes, not again at the end", () => {
    const text =
      "portfolio,date,actual_pnl,hypothetical_pnl,var_99\r\nBOOK-A,2026-03-03,-1.5,-1,10\r\nBOOK-B,2026-03-04,2,1,10\r\n";
    const bytes = Buffer.from(text);
    const stream = new CsvByteStream(ref);
    for (let i = 0; i < bytes.length; i += 7) stream.push(bytes.subarray(i, i + 7));
    // Given other bytes at the end, a stream that had read the file already keeps what it read.
    const parsed = stream.end(Buffer.from("not the file"));
    expect(parsed.rows.map((r) => [r.line, r.portfolio, r.date, r.actual_pnl])).toEqual([
      [2, "BOOK-A", "2026-03-03", -1.5],
      [3, "BOOK-B", "2026-03-04", 2],
    ]);
  });

  it("when a file has a line far longer than any daily line, then both ways refuse the file at that line, before any pattern reads it", () => {
    const long = "x".repeat(200_000);
    const bytes = Buffer.from(
      `portfolio,date,actual_pnl,hypothetical_pnl,var_99\nBOOK-A,2026-03-03,-1,-1,10\n${long}\nBOOK-A,2026-03-04,-1,-1,10\n`,
    );
    const stream = new CsvByteStream(ref);
    for (let i = 0; i < bytes.length; i += 16_384) stream.push(bytes.subarray(i, i + 16_384));
    const refusal = (parse: () => unknown) => {
      try {
        parse();
      } catch (err) {
        return err;
      }
      throw new Error("the file was not refused");
    };
    const streamed = refusal(() => stream.end(bytes));
    const whole = refusal(() => parseObservationCsv(decodeCsvBytes(bytes), ref));
    expect(streamed).toBeInstanceOf(CsvFileError);
    expect(streamed).toEqual(whole);
    expect((whole as CsvFileError).message).toMatch(/^Line 3 is 200000 characters long/);
  });

  it("a row whose cells all match the cell patterns is exactly a row the zod schema accepts", () => {
    // The parser tests CELL_PATTERNS directly and runs the schema only on rows that fail one.
    const cell = fc.oneof(
      fc.string({ maxLength: 24 }),
      fc.stringMatching(/^-?\d{1,18}(\.\d{0,9})?$/),
      fc.stringMatching(/^\s?\d{4}-\d{2}-\d{2}\s?$/),
      fc.stringMatching(/^\s?[A-Za-z0-9][A-Za-z0-9_-]{0,41}\s?$/),
      fc.constantFrom("", " ", "NaN", "1e5", "1,234.5", "-0", "00.10", "\u00a0LKS"),
    );
    fc.assert(
      fc.property(
        fc.record(
          Object.fromEntries(ALL_COLUMNS.map((c) => [c, cell])) as Record<
            (typeof ALL_COLUMNS)[number],
            fc.Arbitrary<string>
          >,
        ),
        (record) => {
          const byPatterns = ALL_COLUMNS.every((c) => CELL_PATTERNS[c].test(record[c]));
          expect(observationCellsSchema.safeParse(record).success).toBe(byPatterns);
        },
      ),
      { numRuns: 2000 },
    );
  });

  it("when a day became a holiday after the preview, then checking the rows again reports it", () => {
    const parsed = parseObservationCsv(
      "portfolio,date,actual_pnl,hypothetical_pnl,var_99\nBOOK-B,2026-12-25,-1,-1,10\n",
      ref,
    );
    const later = {
      portfolios: new Map([["BOOK-B", { entityCode: "E2", holidays: new Map([["2026-12-25", "Christmas Day"]]) }]]),
    };
    expect(recheckReferenceData(parsed.rows, ref)).toEqual([]);
    expect(recheckReferenceData(parsed.rows, later)).toEqual([expect.objectContaining({ line: 2, column: "date" })]);
  });

  it("when a portfolio was removed after the preview, then checking the rows again reports it", () => {
    const parsed = parseObservationCsv(
      "portfolio,date,actual_pnl,hypothetical_pnl,var_99\nBOOK-A,2026-12-24,-1,-1,10\n",
      ref,
    );
    const later = { portfolios: new Map([["BOOK-B", ref.portfolios.get("BOOK-B")!]]) };
    expect(recheckReferenceData(parsed.rows, later)).toEqual([
      expect.objectContaining({ line: 2, column: "portfolio" }),
    ]);
  });

  it("the template's columns are exactly the columns the parser knows", () => {
    const header = serialiseObservationCsv([]).trim();
    expect(header.split(",")).toEqual([...ALL_COLUMNS]);
  });
});
