import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { dayNumber, fromDayNumber } from "../../shared/backtest/calendar";

// Cross-checked against the platform's own Gregorian calendar (Date.UTC): common practice.
describe("day numbers for ISO dates", () => {
  it("agree with Date.UTC for every day from 1800 to 2400, and fromDayNumber inverts them", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: Date.UTC(1800, 0, 1) / 86_400_000, max: Date.UTC(2400, 0, 1) / 86_400_000 }),
        (day) => {
          const iso = new Date(day * 86_400_000).toISOString().slice(0, 10);
          expect(dayNumber(iso)).toBe(day);
          expect(fromDayNumber(dayNumber(iso))).toBe(iso);
        },
      ),
      { numRuns: 2000 },
    );
  });

  it("refuse days that do not exist, including 29 February outside leap years (1900 is not one, 2000 is)", () => {
    for (const bad of [
      "2026-02-29",
      "1900-02-29",
      "2024-02-30",
      "2026-04-31",
      "2026-13-01",
      "2026-00-10",
      "2026-1-01",
      "26-01-01",
    ]) {
      expect(() => dayNumber(bad), bad).toThrow(/not a real date/);
    }
    expect(fromDayNumber(dayNumber("2000-02-29"))).toBe("2000-02-29");
  });
});
