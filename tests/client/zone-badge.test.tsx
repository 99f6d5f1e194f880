import { render, screen } from "@testing-library/react";
import { ZoneBadge } from "@/components/ui/zone-badge";

describe("ZoneBadge", () => {
  it("writes the zone's name, so the zone never rests on colour alone", () => {
    render(
      <>
        <ZoneBadge zone="green" />
        <ZoneBadge zone="yellow" regime="basel" />
        <ZoneBadge zone="red" />
      </>,
    );
    expect(screen.getByText("Green")).toBeInTheDocument();
    expect(screen.getByText("Yellow")).toBeInTheDocument();
    expect(screen.getByText("Red")).toBeInTheDocument();
  });

  it("says Amber for the middle zone under FRTB, as the FRTB text names it", () => {
    render(<ZoneBadge zone="yellow" regime="frtb" />);
    expect(screen.getByText("Amber")).toBeInTheDocument();
    expect(screen.queryByText("Yellow")).not.toBeInTheDocument();
  });

  it("marks a window with fewer than 250 observations as provisional in words", () => {
    render(<ZoneBadge zone="green" provisional />);
    expect(screen.getByText("Green").textContent).toContain("(provisional)");
  });
});
