import { render, screen, within } from "@testing-library/react";
import type { SnapshotFigures } from "@shared/schemas/snapshot";
import { SnapshotFigures as FiguresPanel } from "@/features/snapshots/components/snapshot-figures";
import { figures, snapshot } from "./support/snapshots";

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

/** A draft of Q4 2025 (support/snapshots.ts) in the green zone, its three exception days on the series given. */
function snapshotWith(pnlBasis: "max" | "actual" | "hypothetical", counts: { actual: number; hypothetical: number }) {
  return snapshot({
    history: [],
    figures: figures({
      pnlBasis,
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
      multiplier: 3,
      cumulativeProbability: 0.5,
      capital: null,
      addOn: null,
    }),
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
