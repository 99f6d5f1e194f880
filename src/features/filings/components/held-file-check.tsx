import { useId, useState } from "react";
import type { Filing } from "@shared/schemas/filing";
import { FormMessage } from "@/components/ui/field";
import { Hash } from "@/components/ui/hash";
import { FilePicker } from "@/components/ui/file-picker";
import { cn } from "@/lib/cn";
import { canHashFiles, sameSha256, sha256OfFile } from "../sha256-of-file";

type Outcome = { name: string; sha256: string } | { name: string; failed: true };

/** The reader picks the PDF they hold; the browser hashes it and compares it with the filing's SHA-256. Nothing is uploaded. */
export function HeldFileCheck({ filing }: { filing: Filing }) {
  const inputId = useId();
  const hintId = useId();
  const [outcome, setOutcome] = useState<Outcome>();
  const [busy, setBusy] = useState(false);
  const available = canHashFiles();

  async function check(file: File) {
    setBusy(true);
    setOutcome(undefined);
    try {
      setOutcome({ name: file.name, sha256: await sha256OfFile(file) });
    } catch {
      setOutcome({ name: file.name, failed: true });
    } finally {
      setBusy(false);
    }
  }

  const matches = outcome && "sha256" in outcome ? sameSha256(outcome.sha256, filing.sha256) : undefined;
  return (
    <div className="flex flex-col gap-2">
      <h4 className="text-xs font-semibold tracking-wide text-ink-muted uppercase">A file you hold</h4>
      {!available ? (
        <div className="flex flex-col gap-1 text-sm text-ink-soft" data-testid="held-file-by-hand">
          <p>This browser computes no SHA-256 on a page served without HTTPS, so compare the file by hand:</p>
          <ol className="list-decimal pl-5">
            <li>
              Compute its SHA-256 on your machine:{" "}
              <code className="font-mono text-xs">sha256sum {filing.fileName}</code> (Linux),{" "}
              <code className="font-mono text-xs">shasum -a 256 {filing.fileName}</code> (macOS) or{" "}
              <code className="font-mono text-xs">certutil -hashfile {filing.fileName} SHA256</code> (Windows).
            </li>
            <li>
              Compare all 64 characters with the pack SHA-256 written out in full above (case does not matter): the file
              is the pack as sent only if every one matches.
            </li>
          </ol>
        </div>
      ) : (
        <>
          <div className="flex flex-wrap items-center gap-3">
            <FilePicker
              id={inputId}
              accept=".pdf,application/pdf"
              disabled={busy}
              describedBy={hintId}
              onFile={(f) => void check(f)}
              look="secondary"
            >
              Check a file you hold
            </FilePicker>
            <span id={hintId} className="text-xs text-ink-muted">
              Choose the PDF you received: your browser computes its SHA-256 and compares it with the filing's. The file
              is not uploaded.
            </span>
          </div>
          <div aria-live="polite">
            {busy && <p className="text-sm text-ink-muted">Computing the file's SHA-256…</p>}
            {outcome && "failed" in outcome && (
              <FormMessage>{outcome.name} could not be read to compute its SHA-256. Choose the file again.</FormMessage>
            )}
            {outcome && "sha256" in outcome && (
              <div
                role="status"
                aria-label="File check"
                className={cn(
                  "border-l-2 px-3 py-1.5 text-sm",
                  matches ? "border-accent bg-accent-soft" : "border-danger bg-danger-soft text-danger",
                )}
              >
                <p className="font-semibold">
                  {matches
                    ? `Match: ${outcome.name} is the pack as it was sent.`
                    : `No match: ${outcome.name} is not the pack as it was sent.`}
                </p>
                <p className="text-ink-soft">
                  Its SHA-256 <Hash value={outcome.sha256} />
                  {matches ? (
                    " equals the filing's."
                  ) : (
                    <>
                      {" "}
                      differs from the filing's <Hash value={filing.sha256} />: ask the bank for the file again.
                    </>
                  )}
                </p>
              </div>
            )}
          </div>
        </>
      )}
    </div>
  );
}
