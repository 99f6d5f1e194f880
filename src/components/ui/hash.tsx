import type { ReactNode } from "react";
import { cn } from "@/lib/cn";
import { shortHash } from "@/lib/format";
import { CopyButton } from "./copy-button";

/** A SHA-256 shortened in place, the whole of it on hover; `empty` says why there is none yet. */
export function Hash({
  value,
  empty = "—",
  className,
}: {
  value: string | null | undefined;
  empty?: ReactNode;
  className?: string;
}) {
  if (!value) return <span className="text-ink-muted">{empty}</span>;
  return (
    <code className={cn("text-xs", className)} title={value}>
      {shortHash(value)}
    </code>
  );
}

/**
 * A SHA-256 written out in full, for a reader who compares it character by character with the file
 * they hold: monospace, wrapping, selectable as one piece, with a Copy button where the browser
 * lets the page write to the clipboard (HTTPS or the machine itself).
 */
export function FullHash({ value, className }: { value: string; className?: string }) {
  return (
    <span className={cn("flex flex-wrap items-start gap-x-2 gap-y-1", className)}>
      <code className="min-w-0 font-mono text-xs font-normal break-all select-all">{value}</code>
      <CopyButton value={value} what="The SHA-256" />
    </span>
  );
}
