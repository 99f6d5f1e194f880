import { render, screen, within } from "@testing-library/react";
import { snapshotSchema, type SnapshotFigures } from "@shared/schemas/snapshot";
import { SnapshotFigures as FiguresPanel } from "@/features/snapshots/components/snapshot-figures";

// A snapshot's exception list says which P&L series each day is an exception on and whether the count holds it
// (issue 13 item 7). Under "the higher of the two" the count is on the series with more exceptions
// (docs/rules.md#pnl-basis; EBA Q&A 2016_2759).
const day = (date: string, actual: boolean, hypothetical: boolean, excluded = false) => ({
  date,
  actualPnl: -150,
  hypotheticalPnl: -140,
  var99: 100,
  actual,
  hypothetical,
  excluded,
  excessActual: actual ? 50 : null,
  excessHypothetical: hypothetical ? 40 : null,
  cause: null,
  narrative: null,
  exclusionStatus: excluded ? "approved" : "none",
  decisionReference: null,
  decisionDate: null,
});

function snapshotWith(pnlBasis: "max" | "actual" | "hypothetical", counts: { actual: number; hypothetical: number }) {
  const figures: SnapshotFigures = {
    portfolio: "LKS-EU-TOTAL",
    regime: "eu",
    pnlBasis,
    currency: "EUR",
    asOf: "2025-12-31",
    window: { start: "2025-01-02", end: "2025-12-31", observations: 250, complete: true },
    exceptions: { ...counts, counted: Math.max(counts.actual, counts.hypothetical), excluded: 1 },
    exceptionDates: ["2025-03-10", "2025-04-07", "2025-06-13"],
    exceptionDetail: [
      day("2025-03-10", true, true),
      day("2025-04-07", false, true),
      day("2025-06-13", true, false, true),
    ] as SnapshotFigures["exceptionDetail"],
    zone: "green",
    zoneLabel: "Green",
    plusFactor: 0,
    qualitativeAddend: 0,
    multiplier: 3,
    expected: 2.5,
    cumulativeProbability: 0.5,
    capital: null,
    addOn: null,
    capitalNote: null,
    desks: [],
  };
  return snapshotSchema.parse({
    id: 12,
    entity: "LKS-EU",
    entityName: "Larkspur Markets SA",
    quarterEnd: "2025-12-31",
    status: "draft",
    zone: "green",
    counted: figures.exceptions.counted,
    plusFactor: 0,
    multiplier: 3,
    capital: null,
    addOn: null,
    figures,
    inputsSha256: "9c1f0a7e55d2b8e4c3a1f6d0b9e8c7a6f5e4d3c2b1a09f8e7d6c5b4a39281706",
    engineVersion: "1.4.0",
    preparedBy: "analyst@larkspur.test",
    preparedAt: "2026-01-08T10:15:00.000Z",
    submittedBy: null,
    submittedAt: null,
    approvedBy: null,
    approvedAt: null,
    history: [],
    prevHash: null,
    hash: null,
    restatedAfterSignOff: null,
    amends: null,
    amendedBy: null,
    amendment: null,
    openFindings: 0,
    version: 1,
  });
}

describe("a snapshot's exception days", () => {
  it("under the higher of the two, each day names its series and whether it counts on the series with more exceptions", () => {
    render(<FiguresPanel snapshot={snapshotWith("max", { actual: 1, hypothetical: 2 })} />);
    const list = screen.getByRole("list", { name: "Exception days and their series" });
    expect(
      within(list)
        .getAllByRole("listitem")
        .map((li) => li.textContent),
    ).toEqual([
      "2025-03-10: beyond VaR on actual and hypothetical P&L · counts on hypothetical P&L",
      "2025-04-07: beyond VaR on hypothetical P&L · counts on hypothetical P&L",
      "2025-06-13: beyond VaR on actual P&L · excluded by the supervisor",
    ]);
    expect(screen.getByText("The count is on hypothetical P&L.")).toBeInTheDocument();
  });

  it("on the actual P&L basis, a day beyond VaR only on hypothetical P&L is said to be outside the count", () => {
    render(<FiguresPanel snapshot={snapshotWith("actual", { actual: 1, hypothetical: 2 })} />);
    const items = within(screen.getByRole("list", { name: "Exception days and their series" })).getAllByRole(
      "listitem",
    );
    expect(items[1]).toHaveTextContent(
      "2025-04-07: beyond VaR on hypothetical P&L · not in the count (actual P&L stayed within VaR)",
    );
  });
});
