import type { ReactNode } from "react";

/** The browser tab's title; React 19 places <title> in the document head. */
export function PageTitle({ children }: { children: string }) {
  return <title>{`${children} · Quartermark`}</title>;
}

/**
 * A screen's heading (or a section's, `level` 2) with, on the right, how much it holds (`count`, in
 * tabular figures), followed by " · loading…" while it is read again.
 */
export function CountedHeading({
  level = 1,
  id,
  count,
  loading = false,
  countProps,
  children,
}: {
  level?: 1 | 2;
  id: string;
  count: ReactNode;
  loading?: boolean;
  countProps?: { "aria-live"?: "polite"; "data-testid"?: string };
  children: ReactNode;
}) {
  const Heading = level === 1 ? "h1" : "h2";
  return (
    <div className="flex items-baseline justify-between gap-4">
      <Heading id={id}>{children}</Heading>
      <p className="figures text-sm text-ink-muted" {...countProps}>
        {count}
        {loading && " · loading…"}
      </p>
    </div>
  );
}

/** A part of a screen named by its own small heading (an h3, `titleId`), e.g. a snapshot's return data. */
export function Subsection({
  titleId,
  title,
  className = "flex flex-col gap-3",
  children,
}: {
  titleId: string;
  title: ReactNode;
  className?: string;
  children: ReactNode;
}) {
  return (
    <section aria-labelledby={titleId} className={className}>
      <h3 id={titleId} className="text-sm font-semibold">
        {title}
      </h3>
      {children}
    </section>
  );
}
