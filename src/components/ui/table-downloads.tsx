import { DownloadControl } from "./download-button";
import { FormMessage } from "@/components/ui/field";
import { useDownload } from "@/lib/download";
import { withQuery } from "@/lib/api-client";

const FORMATS = {
  csv: { label: "CSV", accept: "text/csv, application/json;q=0.9" },
  xlsx: {
    label: "Excel (.xlsx)",
    accept: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet, application/json;q=0.9",
  },
} as const;

/** `/api/findings` + `{ entity: "LKS-EU" }` + "csv" → `/api/findings.csv?entity=LKS-EU` (empty values left out). */
export function tableHref(
  path: string,
  format: keyof typeof FORMATS,
  query: Record<string, string | null | undefined> = {},
): string {
  return withQuery(`${path}.${format}`, query);
}

function FormatButton({ href, what, format }: { href: string; what: string; format: keyof typeof FORMATS }) {
  const { start, busy, error } = useDownload(href, `${what}.${format}`, FORMATS[format].accept);
  return (
    <>
      <DownloadControl busy={busy} onStart={() => void start()} label={`Download ${what} as ${FORMATS[format].label}`}>
        {busy ? "Downloading…" : FORMATS[format].label}
      </DownloadControl>
      {error && <FormMessage>{error}</FormMessage>}
    </>
  );
}

/**
 * The table as the reader sees it (its filter applied) as CSV or XLSX, for checking and reconciling
 * in a spreadsheet. Left out of print.
 */
export function TableDownloads({
  path,
  query,
  what,
}: {
  /** The list's API path without suffix, e.g. `/api/portfolios/LKS-EU-TRADING/exceptions`. */
  path: string;
  query?: Record<string, string | null | undefined>;
  /** What the table holds, in words: "the exceptions". */
  what: string;
}) {
  return (
    <div className="flex flex-wrap items-baseline gap-x-1 text-sm text-ink-muted print:hidden">
      <span>Download {what}:</span>
      <FormatButton href={tableHref(path, "csv", query)} what={what} format="csv" />
      <FormatButton href={tableHref(path, "xlsx", query)} what={what} format="xlsx" />
    </div>
  );
}
