import type { ForecastResponse } from "@shared/schemas/capital";
import { Figure } from "@/components/ui/figure";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { formatAmount, formatBusinessDate, formatFactor } from "@/lib/format";
import { NO_CAPITAL_INPUTS } from "../words";

/** "Where we stand" today on the entity's top-of-house portfolio, and what one more exception would cost. */
export function CapitalStanding({ forecast }: { forecast: ForecastResponse }) {
  const { today, nextExceptionCost, currency, regime } = forecast;
  return (
    <section aria-labelledby="capital-standing-title" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h2 id="capital-standing-title">Where we stand</h2>
        <p className="text-sm text-ink-soft">
          {forecast.portfolio} · last day with data <span className="figures">{formatBusinessDate(forecast.asOf)}</span>
        </p>
      </div>
      <dl className="grid grid-cols-2 gap-x-4 gap-y-3 border-y border-rule py-3 sm:grid-cols-5">
        <Figure look="ruled" label="Counted exceptions">
          <span data-testid="today-counted">{today.counted}</span>
        </Figure>
        <Figure look="ruled" label="Traffic-light zone">
          <ZoneBadge zone={today.zone} regime={regime} provisional={!today.windowComplete} className="text-sm" />
        </Figure>
        <Figure look="ruled" label="Plus factor">
          <span data-testid="today-plus-factor">{formatFactor(today.plusFactor)}</span>
        </Figure>
        <Figure look="ruled" label="Multiplier">
          <span data-testid="today-multiplier">{formatFactor(today.multiplier)}</span>
        </Figure>
        <Figure
          look="ruled"
          label="Next exception would cost"
          hint={nextExceptionCost === null ? undefined : "more capital requirement, at today's VaR"}
        >
          <span data-testid="next-exception-cost">
            {nextExceptionCost === null ? (
              <span className="text-sm font-normal text-ink-soft">{NO_CAPITAL_INPUTS}</span>
            ) : (
              formatAmount(nextExceptionCost, currency)
            )}
          </span>
        </Figure>
      </dl>
      <p className="text-sm text-ink-soft">
        {nextExceptionCost === null
          ? `${NO_CAPITAL_INPUTS}: the data holds no ${regime === "frtb" ? "expected shortfall (ES)" : "VaR"} to compute the capital requirement from, so no exception can be priced.`
          : nextExceptionCost === 0
            ? `One more exception today would not change the capital requirement: the plus factor stays at ${formatFactor(today.plusFactor)}.`
            : `One more exception today would raise the capital requirement by ${formatAmount(nextExceptionCost, currency)}.`}
      </p>
    </section>
  );
}
