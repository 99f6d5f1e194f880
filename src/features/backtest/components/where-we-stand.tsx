import type { ReactNode } from "react";
import type { BacktestResponse } from "@shared/schemas/backtest";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { formatBusinessDate } from "@/lib/format";
import { basisLabels, formatFactor, formatPercent, plural, regimeLabels } from "../words";

function Figure({ label, children, hint }: { label: string; children: ReactNode; hint?: string }) {
  return (
    <div className="flex flex-col gap-0.5 border-l border-rule pl-3 first:border-l-0 first:pl-0">
      <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">{label}</dt>
      <dd className="figures text-lg leading-tight font-semibold text-ink">{children}</dd>
      {hint && <dd className="text-2xs text-ink-muted">{hint}</dd>}
    </div>
  );
}

/** The provisional banner: a short window or boundaries derived for a window other than 250 days. */
export function ProvisionalBanner({ bt }: { bt: BacktestResponse }) {
  if (bt.window.complete && !bt.provisionalBoundaries) return null;
  return (
    <p role="note" className="border-l-2 border-zone-yellow bg-zone-yellow-soft px-3 py-1.5 text-sm text-ink">
      <strong className="font-semibold">Provisional.</strong>{" "}
      {!bt.window.complete
        ? `The window holds ${plural(bt.window.observations, "observation", "observations")} of the 250 the rules ask for, so the count, zone and multiplier may still move as days are added.`
        : "The window is not the standard 250 days."}{" "}
      {bt.provisionalBoundaries && "Zone boundaries for this window length are derived by the binomial rule, not read from the published table."}
    </p>
  );
}

export function DataGaps({ gaps }: { gaps: string[] }) {
  if (gaps.length === 0) return null;
  return (
    <div role="note" className="border-l-2 border-danger bg-danger-soft px-3 py-1.5 text-sm text-ink">
      <p>
        <strong className="font-semibold">{plural(gaps.length, "day", "days")} in the window without P&amp;L or VaR.</strong> A data gap blocks
        sign-off until the missing values are uploaded under Data.
      </p>
      <ul className="figures mt-1 flex flex-wrap gap-x-4 gap-y-0.5 text-xs">
        {gaps.map((d) => (
          <li key={d}>{formatBusinessDate(d)}</li>
        ))}
      </ul>
    </div>
  );
}

/** "Where we stand": the window, the counts and what they mean for capital, all as the engine returned them. */
export function WhereWeStand({ bt }: { bt: BacktestResponse }) {
  const provisional = !bt.window.complete || bt.provisionalBoundaries;
  return (
    <section aria-labelledby="standing-title" className="flex flex-col gap-3">
      <h2 id="standing-title">Where we stand</h2>
      <p className="text-sm text-ink-soft">
        {regimeLabels[bt.regime]}; exceptions are counted on {basisLabels[bt.pnlBasis]}. Window{" "}
        <span className="figures font-medium text-ink" data-testid="window-dates">
          {bt.window.start ?? "—"} to {bt.window.end ?? "—"}
        </span>
        , {plural(bt.window.observations, "observation", "observations")}.
      </p>
      <dl className="grid grid-cols-2 gap-x-4 gap-y-3 border-y border-rule py-3 sm:grid-cols-4 lg:grid-cols-9">
        <Figure label="Traffic-light zone">
          <ZoneBadge zone={bt.zone} regime={bt.regime} provisional={provisional} className="text-sm" />
        </Figure>
        <Figure label="Counted exceptions" hint={provisional ? "provisional" : undefined}>
          <span data-testid="counted">{bt.exceptions.counted}</span>
        </Figure>
        <Figure label="Plus factor">
          <span data-testid="plus-factor">{formatFactor(bt.plusFactor)}</span>
        </Figure>
        <Figure label="Multiplier">
          <span data-testid="multiplier">{formatFactor(bt.multiplier)}</span>
        </Figure>
        <Figure label="Actual P&L exceptions">{bt.exceptions.actual}</Figure>
        <Figure label="Hypothetical P&L exceptions">{bt.exceptions.hypothetical}</Figure>
        <Figure label="Excluded" hint="approved by the supervisor">
          {bt.exceptions.excluded}
        </Figure>
        <Figure label="Expected if calibrated" hint="observations × 1%">
          {formatFactor(bt.expected)}
        </Figure>
        <Figure label="P(X ≤ count)" hint="cumulative binomial probability">
          {formatPercent(bt.tests.cumulativeProbability)}
        </Figure>
      </dl>
      <ProvisionalBanner bt={bt} />
      <DataGaps gaps={bt.dataGaps} />
    </section>
  );
}
