import type { HTMLAttributes, TdHTMLAttributes } from "react";
import { flexRender, type CellContext, type Row, type Table as TanstackTable } from "@tanstack/react-table";
import { cn } from "@/lib/cn";
import { Table, Td, Th, Tr } from "./table";

declare module "@tanstack/react-table" {
  interface ColumnMeta<TData, TValue> {
    /** Right-aligned, tabular figures. */
    numeric?: boolean;
    /** Extra attributes for each body cell of the column (aria-invalid, title, classes). */
    cellProps?: (ctx: CellContext<TData, TValue>) => TdHTMLAttributes<HTMLTableCellElement>;
    headerClassName?: string;
  }
}

const sortMark = { asc: "▲", desc: "▼" } as const;

/**
 * A TanStack Table drawn with the house table pieces. Sortable columns get a header button and
 * `aria-sort`; everything else (paging, filtering) stays with the caller, who owns the table state.
 */
export function DataTable<T>({
  table,
  caption,
  rowProps,
  className,
}: {
  table: TanstackTable<T>;
  caption: string;
  rowProps?: (row: Row<T>) => HTMLAttributes<HTMLTableRowElement>;
  className?: string;
}) {
  return (
    <Table caption={caption} className={className}>
      <thead>
        {table.getHeaderGroups().map((group) => (
          <tr key={group.id}>
            {group.headers.map((header) => {
              const meta = header.column.columnDef.meta;
              const sorted = header.column.getIsSorted();
              const content = header.isPlaceholder
                ? null
                : flexRender(header.column.columnDef.header, header.getContext());
              return (
                <Th
                  key={header.id}
                  numeric={meta?.numeric}
                  className={meta?.headerClassName}
                  aria-sort={
                    header.column.getCanSort()
                      ? sorted === "asc"
                        ? "ascending"
                        : sorted === "desc"
                          ? "descending"
                          : "none"
                      : undefined
                  }
                >
                  {header.column.getCanSort() ? (
                    <button
                      type="button"
                      onClick={header.column.getToggleSortingHandler()}
                      className={cn(
                        "inline-flex items-center gap-1 uppercase hover:text-ink",
                        meta?.numeric && "flex-row-reverse",
                      )}
                    >
                      {content}
                      <span aria-hidden="true" className={cn("text-[0.6rem]", !sorted && "text-ink-faint")}>
                        {sorted ? sortMark[sorted] : "↕"}
                      </span>
                    </button>
                  ) : (
                    content
                  )}
                </Th>
              );
            })}
          </tr>
        ))}
      </thead>
      <tbody>
        {table.getRowModel().rows.map((row) => {
          const extra = rowProps?.(row) ?? {};
          return (
            <Tr key={row.id} {...extra}>
              {row.getVisibleCells().map((cell) => {
                const meta = cell.column.columnDef.meta;
                const props = meta?.cellProps?.(cell.getContext()) ?? {};
                return (
                  <Td key={cell.id} numeric={meta?.numeric} {...props}>
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </Td>
                );
              })}
            </Tr>
          );
        })}
      </tbody>
    </Table>
  );
}
