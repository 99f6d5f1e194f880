import type { ReactNode } from "react";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import { useDownload } from "@/lib/download";

/** The control that starts a download: quiet, and marked busy (not disabled, so it keeps focus) while it runs. */
export function DownloadControl({
  busy,
  onStart,
  label,
  children,
}: {
  busy: boolean;
  onStart: () => void;
  /** The control's accessible name where its text alone does not say what downloads. */
  label?: string;
  children: ReactNode;
}) {
  return (
    <Button
      variant="quiet"
      size="sm"
      className="h-auto aria-disabled:cursor-progress aria-disabled:opacity-70"
      onClick={onStart}
      aria-disabled={busy || undefined}
      aria-busy={busy || undefined}
      aria-label={label}
    >
      {children}
    </Button>
  );
}

/**
 * Downloads a file from our API (a pack PDF) by fetching it, so the reader sees why a download was
 * refused — in the server's words, beside the control — rather than a failed item in the browser's
 * download list. Saves under the server's file name; `fallbackName` only when it sent none.
 */
export function DownloadButton({
  href,
  fallbackName,
  children,
  busyText = "Downloading…",
  note,
}: {
  href: string;
  fallbackName: string;
  children: ReactNode;
  busyText?: string;
  /** A line beside the control, e.g. what the file holds. */
  note?: ReactNode;
}) {
  const { start, busy, error } = useDownload(href, fallbackName);
  return (
    <div className="flex flex-col gap-1.5">
      <p className="flex flex-wrap items-baseline gap-x-3 text-sm">
        <DownloadControl busy={busy} onStart={() => void start()}>
          {busy ? busyText : children}
        </DownloadControl>
        {note}
      </p>
      <FormMessage>{error}</FormMessage>
    </div>
  );
}
