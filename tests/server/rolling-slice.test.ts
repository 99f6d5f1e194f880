/**
 * Cutting a date range out of the stored rolling series' text gives exactly what parsing it,
 * filtering by date and writing it again gives (the reference: JSON.parse / JSON.stringify).
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { rollingRowsBetween } from "../../server/modules/figures/rolling-slice";
import { rollingBacktest } from "../../shared/backtest/exceptions";
import type { RollingRowDto } from "../../shared/schemas/backtest";

const day = fc.integer({ min: 0, max: 3000 }).map((n) => new Date(Date.UTC(2018, 0, 1) + n * 86_400_000));
const iso = day.map((d) => d.toISOString().slice(0, 10));

const rowsArb = fc.uniqueArray(iso, { maxLength: 60 }).chain((dates) =>
  fc.tuple(
    ...[...dates].sort().map((date) =>
      fc.record({
        date: fc.constant(date),
        actual: fc.integer({ min: 0, max: 300 }),
        hypothetical: fc.integer({ min: 0, max: 300 }),
        counted: fc.integer({ min: 0, max: 300 }),
        zone: fc.constantFrom("green", "yellow", "red"),
        plusFactor: fc.double({ min: 0, max: 1, noNaN: true }),
        complete: fc.boolean(),
      }),
    ),
  ),
);

const reference = (json: string, from?: string, to?: string) =>
  JSON.stringify(
    (JSON.parse(json) as RollingRowDto[]).filter((r) => (!from || r.date >= from) && (!to || r.date <= to)),
  );

describe("rollingRowsBetween", () => {
  it("equals parse, filter and stringify for any rows and any bounds", () => {
    fc.assert(
      fc.property(rowsArb, fc.option(iso, { nil: undefined }), fc.option(iso, { nil: undefined }), (rows, from, to) => {
        const json = JSON.stringify(rows);
        expect(rollingRowsBetween(json, from, to)).toBe(reference(json, from, to));
      }),
      { numRuns: 500 },
    );
  });

  it("cuts the engine's own rolling series the same way", () => {
    const observations = Array.from({ length: 400 }, (_, i) => {
      const d = new Date(Date.UTC(2024, 0, 1) + i * 86_400_000).toISOString().slice(0, 10);
      return { date: d, actualPnl: i % 37 === 0 ? -120 : 5, hypotheticalPnl: i % 41 === 0 ? -130 : 4, var99: 100 };
    });
    const json = JSON.stringify(rollingBacktest(observations, { regime: "basel", pnlBasis: "max" }));
    for (const [from, to] of [
      ["2024-03-01", "2024-09-30"],
      ["2024-06-15", undefined],
      [undefined, "2024-02-10"],
      ["2030-01-01", undefined],
    ] as const)
      expect(rollingRowsBetween(json, from, to)).toBe(reference(json, from, to));
  });
});
