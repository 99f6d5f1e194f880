import type { ReactNode } from "react";
import { cn } from "@/lib/cn";

/**
 * A notice that is not a zone: four eyes, open findings holding up sign-off, a filing waiting for
 * the mail server, a provisional window, someone else's save. It takes the neutral `notice` tone and
 * an icon, never a zone colour, so a yellow or amber on screen always means a traffic-light zone.
 */
export function Notice({
  children,
  role = "note",
  label,
  className,
  testId,
}: {
  children: ReactNode;
  /** "note" for standing information, "status" for something that changes on its own, "alert" for news the reader must act on. */
  role?: "note" | "status" | "alert";
  /** The notice's accessible name, when the screen needs one. */
  label?: string;
  className?: string;
  testId?: string;
}) {
  return (
    <div
      role={role}
      aria-label={label}
      data-tone="notice"
      data-testid={testId}
      className={cn(
        "flex items-start gap-2 border-l-2 border-notice-rule bg-notice-soft px-3 py-1.5 text-sm text-ink",
        className,
      )}
    >
      <NoticeIcon />
      <div className="min-w-0 flex-1">{children}</div>
    </div>
  );
}

/** A ringed "i": the notice's shape, so it does not rest on its colour alone. */
function NoticeIcon() {
  return (
    <svg viewBox="0 0 16 16" aria-hidden="true" focusable="false" className="mt-0.5 size-3.5 shrink-0 text-notice">
      <circle cx="8" cy="8" r="6.75" fill="none" stroke="currentColor" strokeWidth="1.5" />
      <path d="M8 7v4.5" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" />
      <circle cx="8" cy="4.75" r="0.95" fill="currentColor" />
    </svg>
  );
}

/**
 * A filed pack the mail server has not taken yet: the filings screen and the snapshot's filing say
 * it in the same words.
 */
export function FilingPendingNotice({ filing }: { filing: { sentBy: string; lastError: string | null } }) {
  return (
    <Notice role="status" testId="filing-pending">
      Filed by {filing.sentBy} and kept, but the mail server did not take the message
      {filing.lastError ? ` (${filing.lastError})` : ""}. It is sent automatically as soon as the server answers; the
      quarter becomes filed then.
    </Notice>
  );
}
