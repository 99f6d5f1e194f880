import type { ReactNode } from "react";
import { Link } from "react-router-dom";
import { quarterLabel } from "@shared/backtest/quarters";
import { formatAmount, formatFactor } from "@/lib/format";
import { Td, type Column } from "./table";

type QuarterFigures = {
  counted: number;
  plusFactor: number | null;
  multiplier: number | null;
  capital: number | null;
  addOn: number | null;
};

/** The columns of a quarter's frozen figures, in the order every list of quarters shows them. */
export const quarterFigureColumns: readonly Column[] = [
  { numeric: "Counted exceptions" },
  { numeric: "Plus factor" },
  { numeric: "Multiplier" },
  { numeric: "Capital requirement" },
  { numeric: "Capital add-on" },
];

/** A quarter's frozen figures under quarterFigureColumns, the amounts in `currency`. */
export function QuarterFigureCells({ quarter, currency }: { quarter: QuarterFigures; currency: string }) {
  return (
    <>
      <Td numeric>{quarter.counted}</Td>
      <Td numeric>{formatFactor(quarter.plusFactor)}</Td>
      <Td numeric>{formatFactor(quarter.multiplier)}</Td>
      <Td numeric className="whitespace-nowrap">
        {formatAmount(quarter.capital, currency)}
      </Td>
      <Td numeric className="whitespace-nowrap">
        {formatAmount(quarter.addOn, currency)}
      </Td>
    </>
  );
}

/**
 * A list's cell that names a quarter and opens its record: the quarter as the link (`openLabel` names
 * it for screen readers), its last day below it, then `children` (what amends what).
 */
export function QuarterLinkCell({
  quarterEnd,
  href,
  openLabel,
  children,
}: {
  quarterEnd: string;
  href: string;
  openLabel: (quarter: string) => string;
  children?: ReactNode;
}) {
  const quarter = quarterLabel(quarterEnd);
  return (
    <Td className="whitespace-nowrap">
      <Link to={href} aria-label={openLabel(quarter)} className="font-medium">
        {quarter}
      </Link>
      <span className="figures block text-2xs text-ink-muted">{quarterEnd}</span>
      {children}
    </Td>
  );
}
