import type { ReactNode } from "react";
import { cn } from "@/lib/cn";
import { shortHash } from "@/lib/format";

/** A SHA-256 shortened in place, the whole of it on hover; `empty` says why there is none yet. */
export function Hash({ value, empty = "—", className }: { value: string | null | undefined; empty?: ReactNode; className?: string }) {
  if (!value) return <span className="text-ink-muted">{empty}</span>;
  return (
    <code className={cn("text-xs", className)} title={value}>
      {shortHash(value)}
    </code>
  );
}
