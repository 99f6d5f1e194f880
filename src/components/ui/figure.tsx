import type { ReactNode } from "react";
import { cn } from "@/lib/cn";

/**
 * "plain" sits in a grid of many figures; "ruled" is the headline row, with a rule between
 * figures and a larger value.
 */
export type FigureLook = "plain" | "ruled";

/** One labelled figure of a <dl>: the label, the value in tabular figures, and an optional hint below. */
export function Figure({
  label,
  children,
  hint,
  look = "plain",
  className,
}: {
  label: string;
  children: ReactNode;
  hint?: string;
  look?: FigureLook;
  className?: string;
}) {
  return (
    <div
      className={cn(
        "flex flex-col gap-0.5",
        look === "ruled" && "border-l border-rule pl-3 first:border-l-0 first:pl-0",
        className,
      )}
    >
      <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">{label}</dt>
      <dd className={cn("figures leading-tight font-semibold text-ink", look === "ruled" ? "text-lg" : "text-base")}>
        {children}
      </dd>
      {hint && <dd className="text-2xs text-ink-muted">{hint}</dd>}
    </div>
  );
}
