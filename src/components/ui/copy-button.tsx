import { useState } from "react";
import { cn } from "@/lib/cn";
import { Button } from "./button";

const canCopy = () => typeof navigator !== "undefined" && typeof navigator.clipboard?.writeText === "function";

/**
 * A Copy button where the browser lets the page write to the clipboard (HTTPS or the machine
 * itself), and nothing elsewhere; `what` names the copied thing in the spoken confirmation
 * ("The SHA-256 is copied."), and a refusal says to select the text by hand.
 */
export function CopyButton({ value, what, label }: { value: string; what: string; label?: string }) {
  const [copy, setCopy] = useState<"copied" | "failed">();
  if (!canCopy()) return null;
  async function copyIt() {
    try {
      await navigator.clipboard.writeText(value);
      setCopy("copied");
    } catch {
      setCopy("failed");
    }
  }
  return (
    <>
      <Button
        variant="secondary"
        size="sm"
        className="h-6 px-2 text-xs"
        aria-label={label}
        onClick={() => void copyIt()}
      >
        {copy === "copied" ? "Copied" : "Copy"}
      </Button>
      <span aria-live="polite" className={cn("text-xs font-normal", copy === "failed" ? "text-danger" : "sr-only")}>
        {copy === "copied"
          ? `${what} is copied.`
          : copy === "failed"
            ? "The browser refused to copy it: select the text and copy it by hand."
            : ""}
      </span>
    </>
  );
}
