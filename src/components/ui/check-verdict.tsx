import { FormMessage } from "@/components/ui/field";
import { isApiError } from "@/lib/api-client";
import { cn } from "@/lib/cn";

/**
 * What a server-side check found (a hash or a kept pack), in the server's words, or why it could
 * not be asked. A check that failed, or one still running, leaves no earlier verdict on screen.
 */
export function CheckVerdict({
  check,
  label,
  validText,
  invalidText,
  unreachableText,
}: {
  check: { data?: { valid: boolean; detail: string }; isFetching: boolean; isError: boolean; error: unknown };
  /** The verdict's accessible name, e.g. "Hash check". */
  label: string;
  validText: string;
  invalidText: string;
  /** Shown when the check failed without a message of the server's. */
  unreachableText: string;
}) {
  const result = check.data;
  return (
    <>
      {check.isError && !check.isFetching && (
        <FormMessage>{isApiError(check.error) ? check.error.message : unreachableText}</FormMessage>
      )}
      {result && !check.isFetching && !check.isError && (
        <div
          role="status"
          aria-label={label}
          className={cn(
            "border-l-2 px-3 py-1.5 text-sm",
            result.valid ? "border-accent bg-accent-soft" : "border-danger bg-danger-soft text-danger",
          )}
        >
          <p className="font-semibold">{result.valid ? validText : invalidText}</p>
          <p className={cn(result.valid ? "text-ink-soft" : "text-ink")}>{result.detail}</p>
        </div>
      )}
    </>
  );
}
