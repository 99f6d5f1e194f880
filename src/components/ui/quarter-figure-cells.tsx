import { formatAmount, formatFactor } from "@/lib/format";
import { Td, Th } from "./table";

type QuarterFigures = {
  counted: number;
  plusFactor: number | null;
  multiplier: number | null;
  capital: number | null;
  addOn: number | null;
};

/** The heads of a quarter's frozen figures, in the order every list of quarters shows them. */
export function QuarterFigureHeads() {
  return (
    <>
      <Th numeric>Counted exceptions</Th>
      <Th numeric>Plus factor</Th>
      <Th numeric>Multiplier</Th>
      <Th numeric>Capital requirement</Th>
      <Th numeric>Capital add-on</Th>
    </>
  );
}

/** A quarter's frozen figures under QuarterFigureHeads, the amounts in `currency`. */
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
