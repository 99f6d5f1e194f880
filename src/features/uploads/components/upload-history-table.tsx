import { Link } from "react-router-dom";
import type { UploadSummary } from "@shared/schemas/upload";
import { EmptyState, SelectableTr, Table, Td, Th } from "@/components/ui/table";
import { formatCount, formatDateTime } from "@/lib/format";
import { cn } from "@/lib/cn";
import { shortSha, uploadStatusLabels } from "../words";
import { PersonName } from "@/lib/people";

/** Every file sent in, newest first; a row opens its preview. */
export function UploadHistoryTable({
  uploads,
  selectedId,
  uploadHref,
  onOpen,
  canUpload,
}: {
  uploads: UploadSummary[];
  selectedId?: number;
  uploadHref: (id: number) => string;
  onOpen: (id: number) => void;
  canUpload: boolean;
}) {
  if (uploads.length === 0) {
    return (
      <EmptyState title="No files uploaded yet">
        {canUpload
          ? "Download the template, fill in one line per portfolio and business day, and choose the file above. Each upload is listed here with its checks."
          : "Files the analysts upload are listed here with their checks, whether committed or not."}
      </EmptyState>
    );
  }
  const sorted = [...uploads].sort((a, b) => b.uploadedAt.localeCompare(a.uploadedAt) || b.id - a.id);
  return (
    <Table caption="Uploads, newest first">
      <thead>
        <tr>
          <Th numeric>#</Th>
          <Th>Uploaded</Th>
          <Th>By</Th>
          <Th>File</Th>
          <Th numeric>Rows</Th>
          <Th numeric>With errors</Th>
          <Th numeric>Restatements</Th>
          <Th>Status</Th>
          <Th>SHA-256</Th>
        </tr>
      </thead>
      <tbody>
        {sorted.map((u) => {
          const selected = u.id === selectedId;
          return (
            <SelectableTr key={u.id} selected={selected} onOpen={() => onOpen(u.id)}>
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
                <Link to={uploadHref(u.id)} aria-label={`Open upload #${u.id}, ${u.fileName}`}>
                  {u.fileName}
                </Link>
              </Td>
              <Td numeric>{formatCount(u.rows)}</Td>
              <Td numeric className={cn(u.invalid > 0 && "font-medium text-danger")}>
                {formatCount(u.invalid)}
              </Td>
              <Td numeric>{formatCount(u.restatements)}</Td>
              <Td
                className={cn("whitespace-nowrap", u.status === "preview" && !u.expired && "font-medium text-accent")}
              >
                {u.status === "preview" && u.expired ? "Expired (not committed)" : uploadStatusLabels[u.status]}
              </Td>
              <Td>
                <code className="text-xs" title={u.sha256}>
                  {shortSha(u.sha256)}
                </code>
              </Td>
            </SelectableTr>
          );
        })}
      </tbody>
    </Table>
  );
}
