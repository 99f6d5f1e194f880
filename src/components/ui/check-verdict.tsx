import { useState } from "react";
import { useQuery, type QueryKey, type UseQueryOptions } from "@tanstack/react-query";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import { isApiError } from "@/lib/api-client";
import { cn } from "@/lib/cn";

/**
 * What a server-side check found (a hash or a kept pack), in the server's words, or why it could
 * not be asked. A check that failed, or one still running, leaves no earlier verdict on screen.
 */
type Verdict = { valid: boolean; detail: string };

type VerdictTexts = {
  /** The verdict's accessible name, e.g. "Hash check". */
  label: string;
  validText: string;
  invalidText: string;
  /** Shown when the check failed without a message of the server's. */
  unreachableText: string;
};

export function CheckVerdict({
  check,
  label,
  validText,
  invalidText,
  unreachableText,
}: VerdictTexts & {
  check: { data?: Verdict; isFetching: boolean; isError: boolean; error: unknown };
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

/**
 * A check the server runs only when asked (`query` stays off until the button is pressed, then runs
 * afresh on every press): the button, a line on what it checks (`about`), and what it found.
 */
export function ServerCheck<T extends Verdict, K extends QueryKey>({
  query,
  ask,
  askAgain,
  about,
  wrap = false,
  ...texts
}: VerdictTexts & {
  query: UseQueryOptions<T, Error, T, K>;
  ask: string;
  askAgain: string;
  about: string;
  /** The button and its line may wrap onto two lines. */
  wrap?: boolean;
}) {
  const [asked, setAsked] = useState(false);
  const check = useQuery({ ...query, enabled: asked });
  return (
    <>
      <div className={cn("flex items-center gap-3", wrap && "flex-wrap")}>
        <Button
          variant="secondary"
          size="sm"
          disabled={check.isFetching}
          onClick={() => (asked ? void check.refetch() : setAsked(true))}
        >
          {check.isFetching ? "Checking…" : check.data ? askAgain : ask}
        </Button>
        <span className="text-xs text-ink-muted">{about}</span>
      </div>
      <CheckVerdict check={check} {...texts} />
    </>
  );
}
