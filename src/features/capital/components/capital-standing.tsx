import type { ForecastResponse } from "@shared/schemas/capital";
import { Figure } from "@/components/ui/figure";
import { MultiplierInForce } from "@/components/ui/multiplier-in-force";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { bitesFromWords, periodLabel } from "@/lib/determination-words";
import { formatAmount, formatBusinessDate, formatFactor } from "@/lib/format";
import { NO_CAPITAL_INPUTS } from "../words";

/** Where the figures start: the latest day with data, or (treasury) the latest signed-off determination. */
function startsFromWords(forecast: ForecastResponse): string {
  const s = forecast.startsFrom;
  if (s.kind === "approved" && s.quarterEnd)
    return `starts from the ${s.status ?? "approved"} ${periodLabel(s.quarterEnd)} determination, counted on ${formatBusinessDate(s.asOf)}`;
  return `last day with data ${formatBusinessDate(forecast.asOf)}`;
}

/**
 * "Where we stand" on the entity's top-of-house portfolio: the multiplier in force beside the
 * indicative one, and what one more exception would cost and from which determination on.
 */
export function CapitalStanding({ forecast }: { forecast: ForecastResponse }) {
  const { today, nextExceptionCost, currency, regime } = forecast;
  const approved = forecast.startsFrom.kind === "approved";
  const bites = bitesFromWords(forecast.nextExceptionBitesFrom);
  return (
    <section aria-labelledby="capital-standing-title" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h2 id="capital-standing-title">Where we stand</h2>
        <p className="text-sm text-ink-soft">
          {forecast.portfolio} · <span className="figures">{startsFromWords(forecast)}</span>
        </p>
      </div>
      <MultiplierInForce
        inForce={forecast.inForce}
        indicative={approved ? undefined : today}
        indicativeOn="today"
        regime={regime}
        testId="capital-multiplier"
      />
      <dl className="grid grid-cols-2 gap-x-4 gap-y-3 border-y border-rule py-3 sm:grid-cols-5">
        <Figure look="ruled" label={approved ? "Counted exceptions" : "Counted today"}>
          <span data-testid="today-counted">{today.counted}</span>
        </Figure>
        <Figure look="ruled" label={approved ? "Traffic-light zone" : "Zone if determined today"}>
          <ZoneBadge zone={today.zone} regime={regime} provisional={!today.windowComplete} className="text-sm" />
        </Figure>
        <Figure look="ruled" label="Plus factor">
          <span data-testid="today-plus-factor">{formatFactor(today.plusFactor)}</span>
        </Figure>
        <Figure look="ruled" label={approved ? "Multiplier" : "Indicative multiplier"}>
          <span data-testid="today-multiplier">{formatFactor(today.multiplier)}</span>
        </Figure>
        <Figure
          look="ruled"
          label="Next exception would cost"
          hint={nextExceptionCost === null ? undefined : `more capital requirement ${bites}`}
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
      <p className="text-sm text-ink-soft" data-testid="next-exception-words">
        {nextExceptionCost === null
          ? `${NO_CAPITAL_INPUTS}: the data holds no ${regime === "frtb" ? "expected shortfall (ES)" : "VaR"} to compute the capital requirement from, so no exception can be priced.`
          : nextExceptionCost === 0
            ? `One more exception would not change the capital requirement: the plus factor stays at ${formatFactor(today.plusFactor)}.`
            : `One more exception would raise the capital requirement by ${formatAmount(nextExceptionCost, currency)} ${bites}; until then the multiplier in force stays as it is.`}
      </p>
    </section>
  );
}
