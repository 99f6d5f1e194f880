import { useId, useState, type ReactNode } from "react";
import type { CommitResult, UploadPreview } from "@shared/schemas/upload";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import { isApiError } from "@/lib/api-client";
import { formatCount, formatDateTime, plural } from "@/lib/format";
import { cn } from "@/lib/cn";
import { firstRowsPage, useCommitUpload, useDiscardUpload } from "../api/upload-queries";
import { shortSha, uploadStatusLabels } from "../words";
import { PreviewRowsTable } from "./preview-rows-table";
import { quarterWords, RestatedDays } from "./restated-days";
import { PersonName } from "@/lib/people";

/** A count in the upload's summary, right-aligned; a count of errors above zero is marked in red with an arrow. */
function CountFigure({ label, value, tone }: { label: string; value: number; tone?: "bad" }) {
  return (
    <div className="flex flex-col">
      <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">{label}</dt>
      <dd
        className={cn(
          "figures text-right text-base font-medium",
          tone === "bad" && value > 0 ? "text-danger" : "text-ink",
        )}
      >
        {tone === "bad" && value > 0 && (
          <span aria-hidden="true" className="mr-1 text-xs">
            ▲
          </span>
        )}
        {formatCount(value)}
      </dd>
    </div>
  );
}

function Fact({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="flex flex-col">
      <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">{label}</dt>
      <dd className="text-sm">{children}</dd>
    </div>
  );
}

function Fingerprint({ sha256 }: { sha256: string }) {
  const [copied, setCopied] = useState<"yes" | "no">();
  async function copy() {
    try {
      await navigator.clipboard.writeText(sha256);
      setCopied("yes");
    } catch {
      setCopied("no");
    }
  }
  return (
    <span className="inline-flex flex-wrap items-baseline gap-x-2">
      <code className="text-xs" title={sha256}>
        {shortSha(sha256)}…
      </code>
      <Button
        variant="quiet"
        size="sm"
        className="h-auto!"
        onClick={copy}
        aria-label="Copy the full SHA-256 of the file"
      >
        Copy
      </Button>
      <span role="status" className="text-2xs text-ink-muted">
        {copied === "yes" ? "Copied" : ""}
      </span>
      {copied === "no" && <code className="text-2xs break-all select-all">{sha256}</code>}
    </span>
  );
}

function committedLine(r: CommitResult): string {
  // `inserted` counts every version written: the new days and the new versions of restated ones.
  return `Upload #${r.id} is committed: ${plural(r.inserted - r.restated, "new day", "new days")} written, ${plural(r.restated, "day", "days")} restated (earlier versions kept), ${formatCount(r.unchanged)} unchanged.`;
}

/** One upload: its figures, its rows with the errors in place, and what may be done with it. */
export function UploadPreviewPanel({
  preview,
  canChange,
  onDiscarded,
}: {
  preview: UploadPreview;
  canChange: boolean;
  onDiscarded: () => void;
}) {
  const commit = useCommitUpload();
  const discard = useDiscardUpload();
  const [askDiscard, setAskDiscard] = useState(false);
  const [signedOffConfirmed, setSignedOffConfirmed] = useState(false);
  const blockedId = useId();
  const warningId = useId();
  const p = preview;
  const pending = p.status === "preview";
  const expired = pending && p.expired;
  const needsConfirmation = p.signedOffRestatements > 0;
  const busy = commit.isPending || discard.isPending;
  const actionError = commit.error ?? discard.error;
  const range = p.from && p.to ? (p.from === p.to ? p.from : `${p.from} to ${p.to}`) : "—";

  return (
    <section aria-labelledby="preview-title" className="flex flex-col gap-3 border-t border-rule pt-4">
      <div className="flex flex-wrap items-baseline gap-x-3 gap-y-1">
        <h2 id="preview-title">
          Upload #{p.id} <span className="font-normal text-ink-soft">· {p.fileName}</span>
        </h2>
        <span className={cn("text-xs font-medium", pending ? "text-accent" : "text-ink-muted")}>
          {expired ? "Expired" : uploadStatusLabels[p.status]}
        </span>
        {pending && p.expiresAt && (
          <span className={cn("text-xs", expired ? "font-medium text-danger" : "text-ink-muted")}>
            {expired
              ? `Expired ${formatDateTime(p.expiresAt)}: upload the file again to commit it`
              : `Can be committed until ${formatDateTime(p.expiresAt)}`}
          </span>
        )}
        <span className="text-xs text-ink-muted">
          by <PersonName email={p.uploadedBy} />, {formatDateTime(p.uploadedAt)}
          {p.committedAt && (
            <>
              {" · committed "}
              {p.committedBy && p.committedBy !== p.uploadedBy && (
                <>
                  by <PersonName email={p.committedBy} />,{" "}
                </>
              )}
              {formatDateTime(p.committedAt)}
            </>
          )}
        </span>
      </div>

      <dl aria-label="Summary of the file" className="flex flex-wrap gap-x-8 gap-y-2 border-y border-rule py-2">
        <CountFigure label="Rows" value={p.rows} />
        <CountFigure label="Valid" value={p.valid} />
        <CountFigure label="With errors" value={p.invalid} tone="bad" />
        <CountFigure label="New days" value={p.newRows} />
        <CountFigure label="Restatements" value={p.restatements} />
        <CountFigure label="Unchanged" value={p.unchanged} />
        <Fact label="Portfolios">{p.portfolios.length > 0 ? p.portfolios.join(", ") : "—"}</Fact>
        <Fact label="Business dates">
          <span className="figures">{range}</span>
        </Fact>
        <Fact label="SHA-256">
          <Fingerprint sha256={p.sha256} />
        </Fact>
      </dl>

      {p.invalid > 0 && (
        <p className="text-sm text-ink-soft">
          {plural(p.invalid, "row has", "rows have")} {plural(p.errorCount, "problem", "problems")} in total; each is
          written under its cell below.
        </p>
      )}

      {pending && needsConfirmation && (
        <div id={warningId} role="note" className="flex flex-col gap-1 border-l-2 border-danger pl-3 text-sm">
          <p className="font-medium text-danger">
            This file restates {plural(p.signedOffRestatements, "day", "days")} in signed-off quarters:{" "}
            {p.signedOffQuarters.map((q) => `${quarterWords(q)}, ${plural(q.days, "day", "days")}`).join("; ")}.
          </p>
          <p>
            Their snapshots keep the figures as signed off and are marked restated; the CRO and the supervisor may need
            to hear why. Commit only if the data really was wrong.
            {p.signedOffQuarters.some((q) => q.status === "filed") &&
              " A filed quarter is then corrected by preparing its amendment on Quarter close; the filing itself stays as sent."}
          </p>
        </div>
      )}
      <RestatedDays preview={p} />

      {commit.data && <FormMessage tone="done">{committedLine(commit.data)}</FormMessage>}
      <FormMessage>
        {actionError ? (isApiError(actionError) ? actionError.message : "The change could not be saved.") : undefined}
      </FormMessage>

      {canChange && pending && (
        <div className="flex flex-wrap items-center gap-3">
          {needsConfirmation && !expired && (
            <label className="flex basis-full items-center gap-2 text-sm">
              <input
                type="checkbox"
                checked={signedOffConfirmed}
                onChange={(e) => setSignedOffConfirmed(e.target.checked)}
                aria-describedby={warningId}
                className="size-4 accent-accent"
              />
              I mean to restate {plural(p.signedOffRestatements, "day", "days")} of signed-off quarters
            </label>
          )}
          <Button
            disabled={p.invalid > 0 || busy || expired || (needsConfirmation && !signedOffConfirmed)}
            aria-describedby={p.invalid > 0 ? blockedId : undefined}
            onClick={() => commit.mutate({ id: p.id, confirmSignedOff: needsConfirmation && signedOffConfirmed })}
          >
            {commit.isPending ? "Committing…" : `Commit ${formatCount(p.valid)} ${p.valid === 1 ? "row" : "rows"}`}
          </Button>
          {askDiscard ? (
            <span className="flex items-center gap-2 text-sm">
              Discard this preview? Nothing of it is kept.
              <Button
                variant="danger"
                size="sm"
                disabled={busy}
                onClick={() => discard.mutate(p.id, { onSuccess: onDiscarded })}
              >
                {discard.isPending ? "Discarding…" : "Yes, discard"}
              </Button>
              <Button variant="quiet" size="sm" onClick={() => setAskDiscard(false)}>
                Keep it
              </Button>
            </span>
          ) : (
            <Button variant="secondary" disabled={busy} onClick={() => setAskDiscard(true)}>
              Discard
            </Button>
          )}
          {p.invalid > 0 && (
            <p id={blockedId} className="basis-full text-sm text-danger">
              Nothing can be committed while {plural(p.invalid, "row has", "rows have")} errors. Fix them in the file
              and upload it again.
            </p>
          )}
        </div>
      )}
      {!canChange && pending && (
        <p className="text-sm text-ink-muted">This preview waits for an analyst to commit or discard it.</p>
      )}

      {p.status === "discarded" ? (
        <p className="text-sm text-ink-muted">
          This preview was discarded; its rows are no longer kept and nothing of it was written.
        </p>
      ) : (
        <PreviewRowsTable key={p.id} uploadId={p.id} initial={firstRowsPage(p.invalid)} />
      )}
    </section>
  );
}
