import type { BacktestResponse } from "@shared/schemas/backtest";
import type { CapitalOnDate } from "@shared/schemas/determination";
import { MultiplierInForce } from "@/components/ui/multiplier-in-force";
import { Figure } from "@/components/ui/figure";
import { Notice } from "@/components/ui/notice";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { formatBusinessDate, formatFactor, formatPercent, plural } from "@/lib/format";
import { basisLabels } from "../words";
import { regimeLabels } from "@/lib/regime-labels";

/** The provisional banner: a short window or boundaries derived for a window other than 250 days. */
export function ProvisionalBanner({ bt }: { bt: BacktestResponse }) {
  if (bt.window.complete && !bt.provisionalBoundaries) return null;
  return (
    <Notice>
      <strong className="font-semibold">Provisional.</strong>{" "}
      {!bt.window.complete
        ? `The window holds ${plural(bt.window.observations, "observation", "observations")} of the 250 the rules ask for, so the count, zone and multiplier may still move as days are added.`
        : "The window is not the standard 250 days."}{" "}
      {bt.provisionalBoundaries &&
        "Zone boundaries for this window length are derived by the binomial rule, not read from the published table."}
    </Notice>
  );
}

export function DataGaps({ gaps }: { gaps: string[] }) {
  if (gaps.length === 0) return null;
  return (
    <div role="note" className="border-l-2 border-danger bg-danger-soft px-3 py-1.5 text-sm text-ink">
      <p>
        <strong className="font-semibold">
          {plural(gaps.length, "day", "days")} in the window without P&amp;L or VaR.
        </strong>{" "}
        A data gap blocks sign-off until the missing values are uploaded under Data.
      </p>
      <ul className="figures mt-1 flex flex-wrap gap-x-4 gap-y-0.5 text-xs">
        {gaps.map((d) => (
          <li key={d}>{formatBusinessDate(d)}</li>
        ))}
      </ul>
    </div>
  );
}

/**
 * The entity's multiplier in force on the as-of date beside this book's indicative one. The
 * determination is the entity's, counted on its top-of-house portfolio.
 */
function InForcePair({ bt, capital, error }: { bt: BacktestResponse; capital?: CapitalOnDate; error?: string }) {
  const latest = bt.asOf === bt.latestDate;
  return (
    <div className="flex flex-col gap-1.5">
      {capital ? (
        <MultiplierInForce
          inForce={capital.inForce}
          indicative={{
            counted: bt.exceptions.counted,
            zone: bt.zone,
            multiplier: bt.multiplier,
            windowComplete: bt.window.complete,
          }}
          indicativeOn={latest ? "today" : bt.asOf}
          regime={bt.regime}
        />
      ) : (
        <p className="text-sm text-ink-muted">{error ?? "Reading the multiplier in force…"}</p>
      )}
      <p className="text-xs text-ink-muted">
        {bt.entity.code}'s multiplier is determined each quarter end on its top-of-house portfolio and stays in force
        until the next determination; the rolling count below says where the next one is heading.
      </p>
    </div>
  );
}

/** "Where we stand": the window, the counts and what they mean for capital, all as the engine returned them. */
export function WhereWeStand({
  bt,
  capital,
  capitalError,
}: {
  bt: BacktestResponse;
  /** The entity's capital on the as-of date: the multiplier in force (absent while it is read). */
  capital?: CapitalOnDate;
  capitalError?: string;
}) {
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
      <InForcePair bt={bt} capital={capital} error={capitalError} />
      <dl className="grid grid-cols-2 gap-x-4 gap-y-3 border-y border-rule py-3 sm:grid-cols-4 lg:grid-cols-9">
        <Figure look="ruled" label="Zone if determined now">
          <ZoneBadge zone={bt.zone} regime={bt.regime} provisional={provisional} className="text-sm" />
        </Figure>
        <Figure look="ruled" label="Counted exceptions" hint={provisional ? "provisional" : undefined}>
          <span data-testid="counted">{bt.exceptions.counted}</span>
        </Figure>
        <Figure look="ruled" label="Plus factor">
          <span data-testid="plus-factor">{formatFactor(bt.plusFactor)}</span>
        </Figure>
        <Figure look="ruled" label="Indicative multiplier">
          <span data-testid="multiplier">{formatFactor(bt.multiplier)}</span>
        </Figure>
        <Figure look="ruled" label="Actual P&L exceptions">
          {bt.exceptions.actual}
        </Figure>
        <Figure look="ruled" label="Hypothetical P&L exceptions">
          {bt.exceptions.hypothetical}
        </Figure>
        <Figure look="ruled" label="Excluded" hint="approved by the supervisor">
          {bt.exceptions.excluded}
        </Figure>
        <Figure look="ruled" label="Expected if calibrated" hint="observations × 1%">
          {formatFactor(bt.expected)}
        </Figure>
        <Figure look="ruled" label="P(X ≤ count)" hint="cumulative binomial probability">
          {formatPercent(bt.tests.cumulativeProbability)}
        </Figure>
      </dl>
      <ProvisionalBanner bt={bt} />
      <DataGaps gaps={bt.dataGaps} />
    </section>
  );
}
