import { useState } from "react";
import { render, screen } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { TextareaField } from "@/components/ui/field";
import { Figure } from "@/components/ui/figure";
import {
  formatAmount,
  formatChance,
  formatChange,
  formatCount,
  formatFactor,
  formatPercent,
  plural,
} from "@/lib/format";

describe("the formatting every screen shares", () => {
  it("writes an amount in whole units with its currency and a true minus sign", () => {
    expect(formatAmount(-1204330.4, "EUR")).toBe("−1,204,330 EUR");
    expect(formatAmount(1204330.6)).toBe("1,204,331");
    expect(formatAmount(null, "EUR")).toBe("—");
  });

  it("prints plus factors and multipliers with two places, a probability as a percentage, and a dash where there is none", () => {
    expect(formatFactor(0.4)).toBe("0.40");
    expect(formatFactor(3)).toBe("3.00");
    expect(formatFactor(null)).toBe("—");
    expect(formatPercent(0.99237)).toBe("99.24%");
  });

  it("writes a chance strictly between 0 and 0.01% as < 0.01%, strictly between 99.99% and 100% as > 99.99%, and the ends as they are", () => {
    expect(formatChance(0)).toBe("0.00%");
    expect(formatChance(1e-9)).toBe("< 0.01%");
    expect(formatChance(0.00009999)).toBe("< 0.01%");
    expect(formatChance(0.0001)).toBe("0.01%");
    expect(formatChance(0.5)).toBe("50.00%");
    expect(formatChance(0.9999)).toBe("99.99%");
    expect(formatChance(0.99999999)).toBe("> 99.99%");
    expect(formatChance(1)).toBe("100.00%");
  });

  it("writes a change with its sign, and no sign where the change rounds to nothing", () => {
    expect(formatChange(0.25, formatFactor)).toBe("+0.25");
    expect(formatChange(-12_400.2, (v) => formatAmount(v, "EUR"))).toBe("−12,400 EUR");
    expect(formatChange(0.001, formatFactor)).toBe("0.00");
    expect(formatChange(0, String)).toBe("0");
  });

  it("counts with thousands separators and the noun in the right number", () => {
    expect(formatCount(12480)).toBe("12,480");
    expect(plural(1, "observation", "observations")).toBe("1 observation");
    expect(plural(1250, "observation", "observations")).toBe("1,250 observations");
  });
});

describe("Figure", () => {
  it("pairs the label with its value and hint in a description list", () => {
    render(
      <dl>
        <Figure label="Plus factor" hint="BCBS 1996 Table 2">
          0.40
        </Figure>
      </dl>,
    );
    expect(screen.getByRole("term")).toHaveTextContent("Plus factor");
    expect(screen.getAllByRole("definition").map((d) => d.textContent)).toEqual(["0.40", "BCBS 1996 Table 2"]);
  });
});

describe("TextareaField", () => {
  function Note({ error }: { error?: string }) {
    const [value, setValue] = useState("");
    return (
      <TextareaField
        label="Note"
        hint="A sentence or two."
        value={value}
        onChange={(e) => setValue(e.target.value)}
        error={error}
      />
    );
  }

  it("is named by its label and described by its hint while there is no error", async () => {
    render(<Note />);
    const note = screen.getByRole("textbox", { name: "Note" });
    expect(note).toHaveAccessibleDescription("A sentence or two.");
    expect(note).not.toHaveAttribute("aria-invalid");
    await userEvent.type(note, "Uploaded again");
    expect(note).toHaveValue("Uploaded again");
  });

  it("when there is an error, then the error replaces the hint and the field is marked invalid", () => {
    render(<Note error="Say in a few words why" />);
    const note = screen.getByRole("textbox", { name: "Note" });
    expect(note).toHaveAccessibleDescription("Say in a few words why");
    expect(note).toHaveAttribute("aria-invalid", "true");
    expect(screen.queryByText("A sentence or two.")).not.toBeInTheDocument();
  });
});
