import { useMemo, useState } from "react";
import {
  createColumnHelper,
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from "@tanstack/react-table";
import type { ExceptionDayDto } from "@shared/schemas/backtest";
import { DataTable } from "@/components/ui/data-table";
import { EmptyState } from "@/components/ui/table";
import { Button } from "@/components/ui/button";
import { cn } from "@/lib/cn";
import { formatAmount } from "@/lib/format";
import { seriesOf } from "@/lib/pnl-series";
import { reviewStatusOf } from "@/lib/review-labels";

const col = createColumnHelper<ExceptionDayDto>();
const nullsLast = (a: number | null, b: number | null) => (a === null ? (b === null ? 0 : -1) : b === null ? 1 : a - b);

/** The exception days of the window as the engine listed them: sortable, and each opens its review. */
export function ExceptionTable({
  days,
  currency,
  selected,
  onSelect,
}: {
  days: ExceptionDayDto[];
  currency: string;
  selected: string | null;
  onSelect: (date: string) => void;
}) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "date", desc: true }]);
  const columns = useMemo(
    () => [
      col.accessor("date", {
        header: "Date",
        cell: (c) => <span className="figures whitespace-nowrap">{c.getValue()}</span>,
      }),
      col.accessor("actualPnl", {
        header: `Actual P&L (${currency})`,
        cell: (c) => formatAmount(c.getValue()),
        sortingFn: (a, b) => nullsLast(a.original.actualPnl, b.original.actualPnl),
        meta: { numeric: true },
      }),
      col.accessor("hypotheticalPnl", {
        header: `Hypothetical P&L (${currency})`,
        cell: (c) => formatAmount(c.getValue()),
        sortingFn: (a, b) => nullsLast(a.original.hypotheticalPnl, b.original.hypotheticalPnl),
        meta: { numeric: true },
      }),
      col.accessor("var99", {
        header: `VaR 99% (${currency})`,
        cell: (c) => formatAmount(c.getValue()),
        sortingFn: (a, b) => nullsLast(a.original.var99, b.original.var99),
        meta: { numeric: true },
      }),
      col.accessor("excessActual", {
        header: "Excess over VaR, actual",
        cell: (c) => (c.row.original.actual ? formatAmount(c.getValue()) : "—"),
        sortingFn: (a, b) => nullsLast(a.original.excessActual, b.original.excessActual),
        meta: { numeric: true },
      }),
      col.accessor("excessHypothetical", {
        header: "Excess over VaR, hypothetical",
        cell: (c) => (c.row.original.hypothetical ? formatAmount(c.getValue()) : "—"),
        sortingFn: (a, b) => nullsLast(a.original.excessHypothetical, b.original.excessHypothetical),
        meta: { numeric: true },
      }),
      col.accessor((d) => seriesOf(d), {
        id: "series",
        header: "Series",
        cell: (c) => (
          <span className="whitespace-nowrap">
            {c.getValue()}
            {c.row.original.missing && <span className="block text-2xs text-ink-muted">value missing</span>}
          </span>
        ),
      }),
      col.accessor((d) => reviewStatusOf(d), {
        id: "review",
        header: "Review",
        cell: (c) => (
          <span className={cn("whitespace-nowrap", c.row.original.review === null && "font-medium text-danger")}>
            {c.getValue()}
            {c.row.original.excluded && <span className="block text-2xs text-ink-muted">not counted</span>}
          </span>
        ),
      }),
      col.display({
        id: "open",
        header: () => <span className="sr-only">Open</span>,
        cell: (c) => (
          <Button
            variant="quiet"
            size="sm"
            onClick={() => onSelect(c.row.original.date)}
            aria-label={`Review the exception of ${c.row.original.date}`}
          >
            {selected === c.row.original.date ? "Open" : "Review"}
          </Button>
        ),
      }),
    ],
    [currency, onSelect, selected],
  );
  const table = useReactTable({
    data: days,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });
  if (days.length === 0) {
    return (
      <EmptyState title="No exception in the window.">
        Every day's loss stayed within the 99% VaR; there is nothing to review.
      </EmptyState>
    );
  }
  return (
    <DataTable
      table={table}
      caption="Exceptions in the window"
      rowProps={(row) => ({
        "aria-selected": row.original.date === selected,
        className: cn("cursor-pointer", row.original.date === selected && "bg-accent-soft hover:bg-accent-soft"),
        onClick: () => onSelect(row.original.date),
      })}
    />
  );
}
