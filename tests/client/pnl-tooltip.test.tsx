import { render, screen } from "@testing-library/react";
import { PnlTooltip } from "@/features/backtest/components/pnl-chart";

// The P&L chart's tooltip lists only the figures the hovered day has, each once (issue 13 item 7: no empty lines).
describe("the P&L chart's tooltip", () => {
  it("shows the date and the day's figures; a series without a value on the day and the scatter's date are left out", () => {
    const payload = [
      { name: "Actual P&L", value: -1_250_000, dataKey: "pnl" },
      { name: "−VaR 99%", value: -1_100_000, dataKey: "negVar" },
      { name: "Exception", value: null, dataKey: "exception" },
      { name: "date", value: "2026-03-27", dataKey: "date" },
      { name: "Exception", value: -1_250_000, dataKey: "exception" },
      { name: "Exception excluded by the supervisor", value: undefined, dataKey: "excluded" },
    ];
    const { container } = render(<PnlTooltip active label="2026-03-27" payload={payload as never} currency="EUR" />);
    const lines = [...container.querySelectorAll("p")].map((p) => p.textContent);
    expect(lines).toEqual([
      "2026-03-27",
      "Actual P&L: −1,250,000 EUR",
      "−VaR 99%: −1,100,000 EUR",
      "Exception: −1,250,000 EUR",
    ]);
    expect(lines.every((l) => l && l.trim() !== "")).toBe(true);
  });

  it("shows nothing when not hovering", () => {
    const { container } = render(<PnlTooltip active={false} payload={[]} currency="EUR" />);
    expect(container).toBeEmptyDOMElement();
    expect(screen.queryByText(/EUR/)).not.toBeInTheDocument();
  });
});
