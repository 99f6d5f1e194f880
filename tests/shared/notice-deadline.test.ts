import { describe, expect, it } from "vitest";
import {
  countedOvershooting,
  noticeDueOn,
  noticeIsLate,
  noticeReminderOn,
} from "../../shared/backtest/notice-deadline";

// CRR Art. 366(5): "no later than within five working days" (docs/rules.md#overshooting-notice);
// each expected day below was worked by hand on a 2026 calendar.
describe("overshooting notice deadline", () => {
  it("is the fifth business day after the day it was revealed", () => {
    // Wednesday 2 December 2026 → Thu 3, Fri 4, Mon 7, Tue 8, Wed 9.
    expect(noticeDueOn("2026-12-02", new Set())).toBe("2026-12-09");
  });

  it("skips the entity's holidays and weekends", () => {
    // Friday 18 December 2026, Christmas Day a Friday → Mon 21, Tue 22, Wed 23, Thu 24, Mon 28.
    expect(noticeDueOn("2026-12-18", new Set(["2026-12-25"]))).toBe("2026-12-28");
  });

  it("counts from a Saturday as from the Friday before: Monday is working day one", () => {
    expect(noticeDueOn("2026-12-05", new Set())).toBe("2026-12-11");
  });

  it("reminds one business day before the due day", () => {
    expect(noticeReminderOn("2026-12-28", new Set(["2026-12-25"]))).toBe("2026-12-24");
    expect(noticeReminderOn("2026-12-07", new Set())).toBe("2026-12-04");
  });

  it("is late when not sent after the due day, or sent after it; never when withdrawn", () => {
    const dueOn = "2026-12-09";
    expect(noticeIsLate({ status: "open", dueOn, sentOn: null }, "2026-12-09")).toBe(false);
    expect(noticeIsLate({ status: "open", dueOn, sentOn: null }, "2026-12-10")).toBe(true);
    expect(noticeIsLate({ status: "sent", dueOn, sentOn: "2026-12-09" }, "2027-01-01")).toBe(false);
    expect(noticeIsLate({ status: "sent", dueOn, sentOn: "2026-12-10" }, "2026-12-10")).toBe(true);
    expect(noticeIsLate({ status: "withdrawn", dueOn, sentOn: null }, "2027-01-01")).toBe(false);
  });

  it("counts only the series the P&L basis counts, strictly beyond VaR (docs/rules.md#exception)", () => {
    const day = { actualPnl: -1250.5, hypotheticalPnl: -1100, var99: 1000 };
    expect(countedOvershooting(day, "max")).toEqual({ series: "both", excess: 250.5 });
    expect(countedOvershooting(day, "hypothetical")).toEqual({ series: "hypothetical", excess: 100 });
    expect(countedOvershooting({ ...day, hypotheticalPnl: -900 }, "hypothetical")).toBeNull();
    expect(countedOvershooting({ actualPnl: -1000, hypotheticalPnl: null, var99: 1000 }, "max")).toBeNull();
    expect(countedOvershooting({ actualPnl: -2000, hypotheticalPnl: null, var99: null }, "max")).toBeNull();
  });
});
