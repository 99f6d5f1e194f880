import { cn } from "@/lib/cn";

/**
 * A long task's progress. With `value` it is determinate (0–100); without, the work is under way
 * but its size is unknown, and the bar says so by moving rather than filling.
 */
export function ProgressBar({
  label,
  value,
  text,
  className,
}: {
  label: string;
  value?: number;
  text?: string;
  className?: string;
}) {
  const known = value !== undefined;
  const pct = known ? Math.max(0, Math.min(100, value)) : 0;
  return (
    <div className={cn("flex flex-col gap-1", className)}>
      <div
        role="progressbar"
        aria-label={label}
        aria-valuemin={known ? 0 : undefined}
        aria-valuemax={known ? 100 : undefined}
        aria-valuenow={known ? Math.round(pct) : undefined}
        aria-valuetext={text}
        className="h-1.5 w-full overflow-hidden rounded-full bg-paper-sunk ring-1 ring-rule ring-inset"
      >
        {known ? (
          <div className="h-full bg-accent transition-[width] duration-150" style={{ width: `${pct}%` }} />
        ) : (
          <div
            className="h-full w-full animate-pulse bg-accent/70"
            style={{
              backgroundImage: "repeating-linear-gradient(135deg, transparent 0 6px, rgb(255 255 255 / 0.35) 6px 12px)",
            }}
          />
        )}
      </div>
      {text && (
        <p className="figures text-xs text-ink-soft" aria-hidden="true">
          {text}
        </p>
      )}
    </div>
  );
}
