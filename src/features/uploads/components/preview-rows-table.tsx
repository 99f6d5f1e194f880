import { useMemo, useState } from "react";
import { useQuery } from "@tanstack/react-query";
import {
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type FilterFn,
  type SortingState,
} from "@tanstack/react-table";
import type { RowError } from "@shared/schemas/upload";
import { DataTable } from "@/components/ui/data-table";
import { Button } from "@/components/ui/button";
import { FormMessage, TextField } from "@/components/ui/field";
import { EmptyState } from "@/components/ui/table";
import { errorMessage } from "@/lib/api-client";
import { cn } from "@/lib/cn";
import { PREVIEW_PAGE_SIZE, uploadQueries, type UploadRowsParams } from "../api/upload-queries";
import { formatCount } from "@/lib/format";

type FileRow = { line: number; cells: Record<string, string>; errors: RowError[] };

const TEXT_COLUMNS = new Set(["portfolio", "date"]);

/** The filter box looks at the portfolio and date text of the rows on this page. */
const portfolioOrDate: FilterFn<FileRow> = (row, _columnId, value: string) => {
  const q = value.trim().toLowerCase();
  if (!q) return true;
  return `${row.original.cells.portfolio ?? ""} ${row.original.cells.date ?? ""}`.toLowerCase().includes(q);
};

/** A plain decimal as written, with thousands separators and its own decimals (string work: no rounding). */
function groupThousands(text: string): string {
  const m = /^(-?)(\d+)(\.\d+)?$/.exec(text.trim());
  if (!m) return text;
  return `${m[1]}${m[2].replace(/\B(?=(\d{3})+(?!\d))/g, ",")}${m[3] ?? ""}`;
}

function ErrorMarker() {
  return (
    <span
      aria-hidden="true"
      className="mr-1 inline-flex size-3.5 items-center justify-center rounded-full bg-danger text-[0.6rem] leading-none font-bold text-paper-raised"
    >
      !
    </span>
  );
}

function columnsFor(fileColumns: string[]): ColumnDef<FileRow>[] {
  const line: ColumnDef<FileRow> = {
    id: "line",
    header: "Line",
    accessorFn: (r) => r.line,
    enableSorting: true,
    sortingFn: "basic",
    sortDescFirst: false,
    meta: { numeric: true, cellProps: () => ({ className: "text-ink-muted" }) },
  };
  const cells: ColumnDef<FileRow>[] = fileColumns.map((c) => {
    const numeric = !TEXT_COLUMNS.has(c);
    return {
      id: `cell:${c}`,
      header: c,
      accessorFn: (r) => r.cells[c] ?? "",
      enableSorting: false,
      meta: {
        numeric,
        cellProps: ({ row }) => {
          const problems = row.original.errors.filter((e) => e.column === c);
          if (problems.length === 0) return { className: "whitespace-nowrap" };
          return {
            "aria-invalid": true,
            title: problems.map((p) => p.message).join("; "),
            className: "bg-danger-soft/70 shadow-[inset_0_-2px_0_var(--color-danger)] whitespace-nowrap",
          };
        },
      },
      cell: ({ row, getValue }) => {
        const problems = row.original.errors.filter((e) => e.column === c);
        const value = String(getValue());
        // Clean amounts read with separators; a cell with a problem shows exactly what the file says.
        if (problems.length === 0)
          return value === "" ? <span className="text-ink-faint">—</span> : numeric ? groupThousands(value) : value;
        return (
          <div className="flex flex-col gap-0.5 whitespace-normal">
            <span className={cn("whitespace-nowrap", numeric && "text-right")}>
              <ErrorMarker />
              {value === "" ? <span className="text-ink-muted italic">empty</span> : value}
            </span>
            {problems.map((p, i) => (
              <span key={i} className="min-w-40 text-left text-2xs leading-snug text-danger">
                {p.message}
              </span>
            ))}
          </div>
        );
      },
    };
  });
  const problems: ColumnDef<FileRow> = {
    id: "problems",
    header: "Problems",
    enableSorting: false,
    cell: ({ row }) => {
      const errors = row.original.errors;
      if (errors.length === 0) return <span className="text-xs text-ink-faint">None</span>;
      // Cell errors already sit under their cell; row-wide ones (no matching column) are written out here.
      const rowWide = errors.filter((e) => !fileColumns.includes(e.column));
      return (
        <div className="flex min-w-44 flex-col gap-0.5 text-xs text-danger">
          <span className="font-medium">
            <ErrorMarker />
            {errors.length === 1 ? "1 problem" : `${errors.length} problems`}
          </span>
          {rowWide.map((e, i) => (
            <span key={i}>
              {e.column ? `${e.column}: ` : ""}
              {e.message}
            </span>
          ))}
        </div>
      );
    },
  };
  return [line, ...cells, problems];
}

/** The file's rows as the server read them, a page at a time, each error under its cell. */
export function PreviewRowsTable({ uploadId, initial }: { uploadId: number; initial: UploadRowsParams }) {
  const [params, setParams] = useState<UploadRowsParams>(initial);
  const { data, error, isFetching, isPlaceholderData } = useQuery(uploadQueries.rows(uploadId, params));
  const [sorting, setSorting] = useState<SortingState>([]);
  const [filter, setFilter] = useState("");

  const fileColumns = data?.columns;
  const columns = useMemo(() => columnsFor(fileColumns ?? []), [fileColumns]);
  const table = useReactTable({
    data: data?.rows ?? [],
    columns,
    state: { sorting, globalFilter: filter },
    onSortingChange: setSorting,
    onGlobalFilterChange: setFilter,
    globalFilterFn: portfolioOrDate,
    getColumnCanGlobalFilter: (col) => col.id === "line",
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getRowId: (r) => String(r.line),
  });

  const total = data?.total ?? 0;
  const first = total === 0 ? 0 : params.offset + 1;
  const last = Math.min(total, params.offset + params.limit);
  const shown = table.getRowModel().rows.length;

  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-end gap-x-5 gap-y-2">
        <label className="flex items-center gap-2 pb-1.5 text-sm">
          <input
            type="checkbox"
            checked={params.invalidOnly}
            onChange={(e) => setParams({ offset: 0, limit: PREVIEW_PAGE_SIZE, invalidOnly: e.target.checked })}
            className="size-4 accent-accent"
          />
          Only rows with errors
        </label>
        <TextField
          label="Find on this page (portfolio or date)"
          type="search"
          value={filter}
          onChange={(e) => setFilter(e.target.value)}
          placeholder="e.g. LKS-EU or 2026-03"
          className="w-72"
        />
        <p className="figures ml-auto pb-1.5 text-sm text-ink-muted" aria-live="polite">
          {total === 0
            ? "No rows"
            : `Lines ${formatCount(first)}–${formatCount(last)} of ${formatCount(total)} ${params.invalidOnly ? "rows with errors" : "rows"}`}
          {filter.trim() && total > 0 && ` · ${formatCount(shown)} match`}
          {isFetching && " · loading…"}
        </p>
      </div>
      <FormMessage>{errorMessage(error, "The rows of this file could not load.")}</FormMessage>
      {data && data.rows.length === 0 ? (
        <EmptyState title={params.invalidOnly ? "No row has an error" : "The file has no data rows"}>
          {params.invalidOnly
            ? "Every row passed the checks. Clear “Only rows with errors” to read them all."
            : "Add one line per portfolio and day below the header row and upload again."}
        </EmptyState>
      ) : data ? (
        <div
          className={cn(
            "max-h-[32rem] overflow-y-auto border-b border-rule [&_thead_th]:sticky [&_thead_th]:top-0 [&_thead_th]:z-10 [&_thead_th]:bg-paper",
            isPlaceholderData && "opacity-60",
          )}
        >
          <DataTable
            table={table}
            caption="Rows of the uploaded file"
            rowProps={(row) => (row.original.errors.length > 0 ? { className: "bg-danger-soft/25" } : {})}
          />
          {shown === 0 && (
            <EmptyState title="No row on this page matches">Clear the search box or look on another page.</EmptyState>
          )}
        </div>
      ) : null}
      {total > params.limit && (
        <nav aria-label="Pages of the file" className="flex items-center gap-3 text-sm">
          <Button
            variant="secondary"
            size="sm"
            disabled={params.offset === 0}
            onClick={() => setParams((p) => ({ ...p, offset: Math.max(0, p.offset - p.limit) }))}
          >
            Previous {formatCount(params.limit)}
          </Button>
          <span className="figures text-ink-muted">
            Page {formatCount(Math.floor(params.offset / params.limit) + 1)} of{" "}
            {formatCount(Math.ceil(total / params.limit))}
          </span>
          <Button
            variant="secondary"
            size="sm"
            disabled={params.offset + params.limit >= total}
            onClick={() => setParams((p) => ({ ...p, offset: p.offset + p.limit }))}
          >
            Next {formatCount(params.limit)}
          </Button>
        </nav>
      )}
    </div>
  );
}
