import { useState, type ReactNode } from "react";
import { Table, TableHead, Td, Tr, type Column } from "./table";

/**
 * A chart's figures as a table, behind a disclosure beside the chart: the way to read them without
 * seeing the drawing (WCAG 1.1.1), and the exact values. The table is built only once opened, so a
 * long history costs nothing until someone asks for it. The scrolling box takes the focus, so the
 * keyboard can scroll it too.
 */
export function FiguresDisclosure({ label, children }: { label: string; children: () => ReactNode }) {
  const [open, setOpen] = useState(false);
  return (
    <details onToggle={(e) => setOpen(e.currentTarget.open)} className="text-sm">
      <summary className="w-fit text-sm text-accent underline-offset-2 hover:underline">
        {open ? "Hide the figures" : "Show the figures as a table"}
        <span className="sr-only">: {label}</span>
      </summary>
      {open && (
        <div
          role="region"
          aria-label={label}
          tabIndex={0}
          className="mt-2 max-h-96 overflow-auto border-y border-rule focus-visible:outline-offset-0"
        >
          {children()}
        </div>
      )}
    </details>
  );
}

/**
 * A dated series' figures behind the disclosure: a table of one row a date, oldest first, the date
 * in the first column and `cells` giving the rest of the row.
 */
export function DatedFiguresDisclosure<Row extends { date: string }>({
  label,
  caption,
  columns,
  rows,
  cells,
}: {
  label: string;
  caption: string;
  columns: readonly Column[];
  rows: readonly Row[];
  cells: (row: Row) => ReactNode;
}) {
  return (
    <FiguresDisclosure label={label}>
      {() => (
        <Table caption={caption}>
          <TableHead columns={columns} />
          <tbody>
            {rows.map((row) => (
              <Tr key={row.date}>
                <Td className="figures whitespace-nowrap">{row.date}</Td>
                {cells(row)}
              </Tr>
            ))}
          </tbody>
        </Table>
      )}
    </FiguresDisclosure>
  );
}
