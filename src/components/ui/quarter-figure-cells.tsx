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
