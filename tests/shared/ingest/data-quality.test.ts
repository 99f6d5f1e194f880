import { findDataQualityIssues } from "../../../shared/ingest/data-quality";

const day = (date: string, rtpl: number | null, hypotheticalPnl: number | null = 5) => ({
  date,
  actualPnl: 5,
  hypotheticalPnl,
  var99: 100 + Number(date.slice(8)),
  rtpl,
});

describe("data-quality checks: HPL without RTPL", () => {
  it("when a desk reports RTPL but one day has HPL without it, then that day is a finding (the PLA leaves it out)", () => {
    const found = findDataQualityIssues(
      [day("2026-03-02", 4), day("2026-03-03", null), day("2026-03-04", 6), day("2026-03-05", null, null)],
      new Set(),
    );
    const hpl = found.filter((f) => f.kind === "hpl_without_rtpl");
    expect(hpl).toEqual([
      {
        kind: "hpl_without_rtpl",
        from: "2026-03-03",
        to: "2026-03-03",
        detail:
          "Hypothetical P&L without risk-theoretical P&L on 2026-03-03: the P&L attribution test leaves the day out",
      },
    ]);
  });

  it("when a portfolio never reports RTPL (a top of house, or not FRTB), then no day is a finding", () => {
    const found = findDataQualityIssues([day("2026-03-02", null), day("2026-03-03", null)], new Set());
    expect(found.filter((f) => f.kind === "hpl_without_rtpl")).toEqual([]);
  });
});
