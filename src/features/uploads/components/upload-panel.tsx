import { useId, useRef, useState, type DragEvent } from "react";
import { UPLOAD_MAX_LABEL, type UploadPreview } from "@shared/schemas/upload";
import { ProgressBar } from "@/components/ui/progress-bar";
import { FilePicker } from "@/components/ui/file-picker";
import { cn } from "@/lib/cn";
import { ApiError } from "@/lib/api-client";
import { formatBytes } from "@/lib/format";
import { TEMPLATE_URL } from "../api/upload-queries";
import { useSendUpload, type UploadProgress } from "../api/send-upload";
import { FileProblems } from "./file-problems";

function Progress({ progress, fileName }: { progress: UploadProgress; fileName: string }) {
  if (progress.phase === "sending") {
    const pct = progress.total > 0 ? (progress.loaded / progress.total) * 100 : 0;
    const text = `Sending… ${Math.floor(pct)}% of ${formatBytes(progress.total)}`;
    return <ProgressBar label={`Sending ${fileName}`} value={pct} text={text} />;
  }
  return <ProgressBar label={`Checking ${fileName}`} text="Checking rows on the server…" />;
}

/** Drop zone and file button for the day's CSV; sends it for a preview, nothing is stored yet. */
export function UploadPanel({
  onUploaded,
  uploadHref,
}: {
  onUploaded: (preview: UploadPreview) => void;
  uploadHref: (id: number) => string;
}) {
  const send = useSendUpload();
  const inputRef = useRef<HTMLInputElement>(null);
  const inputId = useId();
  const hintId = useId();
  const [over, setOver] = useState(false);
  const [file, setFile] = useState<File>();
  const [refused, setRefused] = useState<ApiError>();

  function start(f: File) {
    setRefused(undefined);
    setFile(f);
    send.mutate(f, { onSuccess: onUploaded });
  }

  function drop(e: DragEvent) {
    e.preventDefault();
    setOver(false);
    if (send.isPending) return;
    const files = [...e.dataTransfer.files];
    if (files.length === 0) return;
    if (files.length > 1) {
      send.reset();
      setRefused(new ApiError(400, "one_file", `${files.length} files were dropped; upload one file at a time.`));
      return;
    }
    start(files[0]);
  }

  const busy = send.isPending;
  const error = refused ?? send.error;

  return (
    <section aria-labelledby="upload-title" className="grid gap-4 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
      <div className="flex flex-col gap-2">
        <div className="flex items-baseline justify-between gap-4">
          <h2 id="upload-title">Upload the day's file</h2>
          <a href={TEMPLATE_URL} download className="text-sm">
            Download the template
          </a>
        </div>
        <div
          onDragOver={(e) => {
            e.preventDefault();
            if (!busy) setOver(true);
          }}
          onDragLeave={() => setOver(false)}
          onDrop={drop}
          data-dragging={over || undefined}
          className={cn(
            "flex flex-col items-center gap-2 rounded-sm border border-dashed px-4 py-5 text-center transition-colors",
            over ? "border-accent bg-accent-soft" : "border-rule-strong bg-paper-raised",
          )}
        >
          <p className="text-sm text-ink-soft">Drop a CSV file here, or</p>
          <FilePicker
            inputRef={inputRef}
            id={inputId}
            accept=".csv,text/csv"
            disabled={busy}
            describedBy={hintId}
            onFile={start}
            look="primary"
          >
            Choose a CSV file
          </FilePicker>
          <p id={hintId} className="text-2xs text-ink-muted">
            One file, at most {UPLOAD_MAX_LABEL}. Columns as in the template; nothing is stored until you commit the
            preview.
          </p>
        </div>
        <div aria-live="polite" className="min-h-9">
          {busy && send.progress && file && <Progress progress={send.progress} fileName={file.name} />}
        </div>
      </div>
      <div>
        {error ? (
          <FileProblems error={error} fileName={file?.name} uploadHref={uploadHref} />
        ) : (
          <div className="text-sm text-ink-muted">
            <h3 className="text-xs font-semibold tracking-wide text-ink-muted uppercase">What the server checks</h3>
            <ul className="mt-1 list-disc pl-4 text-sm">
              <li>header: known column names, each once, the five required ones present</li>
              <li>every row: a known portfolio, a business day of its entity, plain amounts, VaR above zero</li>
              <li>each portfolio and day once per file; days already stored become restatements</li>
            </ul>
          </div>
        )}
      </div>
    </section>
  );
}
