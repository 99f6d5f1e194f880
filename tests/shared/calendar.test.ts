import fc from "fast-check";
import {
  addBusinessDays,
  businessDaysBetween,
  isBusinessDay,
  nextBusinessDayOnOrAfter,
} from "../../shared/backtest/calendar";
import { EngineInputError } from "../../shared/backtest/errors";

// Dates checked against a printed calendar: 25 Sep 2026 is a Friday, 1 Jan 2027 a Friday.
const HOLIDAYS = new Set(["2026-09-28", "2026-12-25", "2027-01-01"]);

describe("business-day calendar (weekdays minus the entity's holidays)", () => {
  it("when a date is a Saturday, Sunday or holiday, then it is not a business day", () => {
    expect(isBusinessDay("2026-09-25")).toBe(true);
    expect(isBusinessDay("2026-09-26")).toBe(false);
    expect(isBusinessDay("2026-09-27")).toBe(false);
    expect(isBusinessDay("2026-09-28")).toBe(true);
    expect(isBusinessDay("2026-09-28", HOLIDAYS)).toBe(false);
  });

  it("when one business day is added to a Friday, then it lands on Monday, or Tuesday when Monday is a holiday", () => {
    expect(addBusinessDays("2026-09-25", 1)).toBe("2026-09-28");
    expect(addBusinessDays("2026-09-25", 1, HOLIDAYS)).toBe("2026-09-29");
    expect(addBusinessDays("2026-09-29", -1, HOLIDAYS)).toBe("2026-09-25");
    expect(addBusinessDays("2026-09-25", 0)).toBe("2026-09-25");
  });

  it("when crossing the year end with Christmas and New Year holidays, then both are skipped", () => {
    // Thu 24 Dec → (Fri 25 holiday) Mon 28, Tue 29, Wed 30, Thu 31, (Fri 1 Jan holiday) Mon 4 Jan
    expect(addBusinessDays("2026-12-24", 5, HOLIDAYS)).toBe("2027-01-04");
    expect(businessDaysBetween("2026-12-24", "2027-01-04", HOLIDAYS)).toBe(5);
  });

  it("when counting from Friday to the next Friday, then there are 5 business days, 4 with a Monday holiday; the start day is not counted", () => {
    expect(businessDaysBetween("2026-09-25", "2026-10-02")).toBe(5);
    expect(businessDaysBetween("2026-09-25", "2026-10-02", HOLIDAYS)).toBe(4);
    expect(businessDaysBetween("2026-09-25", "2026-09-25")).toBe(0);
    expect(businessDaysBetween("2026-10-02", "2026-09-25")).toBe(-5);
  });

  it("when a weekend date is rolled forward, then the next business day is returned", () => {
    expect(nextBusinessDayOnOrAfter("2026-09-26", HOLIDAYS)).toBe("2026-09-29");
  });

  it("when n business days are added, then counting the business days between gives n back (property)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 20000 }), fc.integer({ min: 0, max: 400 }), (offset, n) => {
        const start = new Date(Date.UTC(2000, 0, 1) + offset * 86_400_000).toISOString().slice(0, 10);
        const end = addBusinessDays(start, n, HOLIDAYS);
        expect(businessDaysBetween(start, end, HOLIDAYS)).toBe(n);
        if (n > 0) expect(isBusinessDay(end, HOLIDAYS)).toBe(true);
      }),
    );
  });

  it("when a date is malformed, then it throws an EngineInputError", () => {
    expect(() => addBusinessDays("2026-02-29", 1)).toThrow(EngineInputError);
    expect(() => businessDaysBetween("20260101", "2026-01-05")).toThrow(/YYYY-MM-DD/);
  });
});
