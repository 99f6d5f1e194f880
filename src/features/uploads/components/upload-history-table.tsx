import { useState } from "react";
import { Link } from "react-router-dom";
import { Button } from "@/components/ui/button";
import type { UploadSummary } from "@shared/schemas/upload";
import { RecordTable, Td, type RowOpening } from "@/components/ui/table";
import { formatCount, formatDateTime } from "@/lib/format";
import { cn } from "@/lib/cn";
import { shortSha, uploadStatusLabels } from "../words";
import { PersonName } from "@/lib/people";

/** Rows of the history on one page. */
export const HISTORY_PAGE_SIZE = 20;

/** Every file sent in, newest first, a page at a time; a row opens its preview. */
export function UploadHistoryTable({
  uploads,
  selectedId,
  hrefOf,
  onOpen,
  canUpload,
}: RowOpening<number> & { uploads: UploadSummary[]; canUpload: boolean }) {
  const sorted = [...uploads].sort((a, b) => b.uploadedAt.localeCompare(a.uploadedAt) || b.id - a.id);
  const pages = Math.max(1, Math.ceil(sorted.length / HISTORY_PAGE_SIZE));
  // Opened on the page that holds the upload shown above, if any.
  const selectedAt = sorted.findIndex((u) => u.id === selectedId);
  const [page, setPage] = useState(selectedAt >= 0 ? Math.floor(selectedAt / HISTORY_PAGE_SIZE) + 1 : 1);
  const current = Math.min(page, pages);
  const first = (current - 1) * HISTORY_PAGE_SIZE;
  const shown = sorted.slice(first, first + HISTORY_PAGE_SIZE);
  return (
    <div className="flex flex-col gap-2">
      <RecordTable
        caption="Uploads, newest first"
        columns={[
          { numeric: "#" },
          "Uploaded",
          "By",
          "File",
          { numeric: "Rows" },
          { numeric: "With errors" },
          { numeric: "Restatements" },
          "Status",
          "SHA-256",
        ]}
        records={shown}
        selectedId={selectedId}
        onOpen={onOpen}
        empty={{
          title: "No files uploaded yet",
          next: canUpload
            ? "Download the template, fill in one line per portfolio and business day, and choose the file above. Each upload is listed here with its checks."
            : "Files the analysts upload are listed here with their checks, whether committed or not.",
        }}
      >
        {(u) => (
          <>
            <Td numeric className="text-ink-muted">
              {u.id}
            </Td>
            <Td className="figures whitespace-nowrap">{formatDateTime(u.uploadedAt)}</Td>
            <Td>
              <PersonName email={u.uploadedBy} />
              {u.committedBy && u.committedBy !== u.uploadedBy ? (
                <span className="block text-xs text-ink-muted">
                  committed by <PersonName email={u.committedBy} />
                </span>
              ) : null}
            </Td>
            <Td className="break-all">
              <Link to={hrefOf(u.id)} aria-label={`Open upload #${u.id}, ${u.fileName}`}>
                {u.fileName}
              </Link>
            </Td>
            <Td numeric>{formatCount(u.rows)}</Td>
            <Td numeric className={cn(u.invalid > 0 && "font-medium text-danger")}>
              {formatCount(u.invalid)}
            </Td>
            <Td numeric>{formatCount(u.restatements)}</Td>
            <Td className={cn("whitespace-nowrap", u.status === "preview" && !u.expired && "font-medium text-accent")}>
              {u.status === "preview" && u.expired ? "Expired (not committed)" : uploadStatusLabels[u.status]}
            </Td>
            <Td>
              <code className="text-xs" title={u.sha256}>
                {shortSha(u.sha256)}
              </code>
            </Td>
          </>
        )}
      </RecordTable>
      {pages > 1 && (
        <nav aria-label="Pages of the upload history" className="flex items-center justify-end gap-4 text-sm">
          <span className="figures text-ink-muted">
            {formatCount(first + 1)}–{formatCount(first + shown.length)} of {formatCount(sorted.length)}
          </span>
          <Button variant="quiet" size="sm" disabled={current === 1} onClick={() => setPage(current - 1)}>
            Newer
          </Button>
          <span className="figures">
            Page {current} of {pages}
          </span>
          <Button variant="quiet" size="sm" disabled={current === pages} onClick={() => setPage(current + 1)}>
            Older
          </Button>
        </nav>
      )}
    </div>
  );
}
