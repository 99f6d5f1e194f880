import { lazy, Suspense, useState, type FormEvent } from "react";
import { forecastQuerySchema, type ForecastResponse } from "@shared/schemas/capital";
import { zoneFor } from "@shared/backtest/regimes";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Figure } from "@/components/ui/figure";
import { Table, TableHead, Td, Tr } from "@/components/ui/table";
import { ZoneBadge, zoneName } from "@/components/ui/zone-badge";
import { validate } from "@/lib/form";
import { formatAmount, formatChance, formatFactor, plural } from "@/lib/format";
import { NO_CAPITAL_INPUTS, SHOWN_FROM } from "../words";
import { bitesFromWords } from "@/lib/determination-words";
import type { DistributionRow } from "./distribution-chart";

const DistributionChart = lazy(() => import("./charts").then((m) => ({ default: m.DistributionChart })));

/** "Of today's 6 exceptions, 4 are still in the window on 2026-12-31; 22 new business days could add more." */
export function remainingInWords(f: Pick<ForecastResponse, "today" | "knownRemaining" | "newDays" | "date">): string {
  const more =
    f.newDays === 0
      ? "no new business day comes before then."
      : `${plural(f.newDays, "new business day", "new business days")} could add more.`;
  if (f.today.counted === 0) return `No exception is in the window today; ${more}`;
  return `Of today's ${plural(f.today.counted, "exception", "exceptions")}, ${f.knownRemaining} ${f.knownRemaining === 1 ? "is" : "are"} still in the window on ${f.date}; ${more}`;
}

/** The forecast date: a text field so it reads YYYY-MM-DD whatever the browser's locale; submitting puts it in the address. */
function ForecastDateForm({
  shown,
  isDefault,
  error,
  pending,
  onDate,
}: {
  shown: string | undefined;
  isDefault: boolean;
  error?: string;
  pending: boolean;
  onDate: (date: string | undefined) => void;
}) {
  const [value, setValue] = useState(shown ?? "");
  const [was, setWas] = useState(shown);
  const [invalid, setInvalid] = useState<string>();
  if (was !== shown) {
    setWas(shown);
    if (shown !== undefined) setValue(shown);
  }
  function submit(e: FormEvent) {
    e.preventDefault();
    const r = validate(forecastQuerySchema, { date: value });
    if (!r.ok) return setInvalid(r.errors.date ?? "A date as YYYY-MM-DD");
    setInvalid(undefined);
    onDate(r.data.date);
  }
  return (
    <form
      onSubmit={submit}
      noValidate
      aria-label="Choose the forecast date"
      className="flex flex-wrap items-start gap-2"
    >
      <TextField
        label="Forecast date"
        name="date"
        inputMode="numeric"
        placeholder="YYYY-MM-DD"
        value={value}
        onChange={(e) => {
          setValue(e.target.value.trim());
          setInvalid(undefined);
        }}
        error={invalid ?? error}
        hint={isDefault ? "The end of the current quarter" : "YYYY-MM-DD"}
        className="w-44"
      />
      <Button type="submit" variant="secondary" size="sm" className="mt-5.5" disabled={pending}>
        {pending ? "Forecasting…" : "Forecast"}
      </Button>
      {!isDefault && (
        <Button variant="quiet" size="sm" className="mt-5.5" onClick={() => onDate(undefined)}>
          Back to the quarter end
        </Button>
      )}
    </form>
  );
}

function ZoneChances({ forecast }: { forecast: ForecastResponse }) {
  return (
    <dl
      className="grid grid-cols-3 gap-x-4 border-y border-rule py-3 sm:max-w-xl"
      aria-label={`Chance of each zone on ${forecast.date}`}
    >
      {(["green", "yellow", "red"] as const).map((z) => (
        <Figure key={z} look="ruled" label={`${zoneName(z, forecast.regime)} zone`}>
          <span data-testid={`chance-${z}`}>{formatChance(forecast.zones[z])}</span>
        </Figure>
      ))}
    </dl>
  );
}

function DistributionTable({
  rows,
  left,
  regime,
  date,
}: {
  rows: DistributionRow[];
  left: number;
  regime: string;
  date: string;
}) {
  return (
    <div className="flex flex-col gap-1">
      <Table caption={`Chance of each count of exceptions on ${date}`}>
        <TableHead columns={[{ numeric: "Counted exceptions" }, "Zone", { numeric: "Probability" }]} />
        <tbody>
          {rows.map((r) => (
            <Tr key={r.exceptions}>
              <Td numeric>{r.exceptions}</Td>
              <Td>
                <ZoneBadge zone={r.zone} regime={regime} />
              </Td>
              <Td numeric>{formatChance(r.probability)}</Td>
            </Tr>
          ))}
        </tbody>
      </Table>
      {left > 0 && (
        <p className="text-2xs text-ink-muted">
          Higher counts, each with a chance below 0.01%, are left out (together {formatChance(left)}).
        </p>
      )}
    </div>
  );
}

/** Where the zone may stand on a future date: the chance of each zone, the count's distribution, and the add-on to expect. */
export function ZoneForecast({
  forecast,
  requested,
  isDefault,
  dateError,
  pending,
  onDate,
}: {
  /** Undefined while the first answer is read or when the chosen date was refused. */
  forecast: ForecastResponse | undefined;
  /** The date in the address, shown in the field even when the server refused it. */
  requested?: string;
  isDefault: boolean;
  dateError?: string;
  pending: boolean;
  onDate: (date: string | undefined) => void;
}) {
  const all = forecast?.distribution ?? [];
  // The engine's zone table names each count's zone (the same one the forecast summed over).
  const rows: DistributionRow[] = forecast
    ? all
        .filter((d) => d.probability >= SHOWN_FROM)
        .map((d) => ({ ...d, zone: zoneFor(d.exceptions, forecast.regime) }))
    : [];
  const left = all.filter((d) => d.probability < SHOWN_FROM).reduce((s, d) => s + d.probability, 0);
  const currency = forecast?.currency;
  return (
    <section aria-labelledby="forecast-title" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-start justify-between gap-4">
        <div className="flex flex-col gap-1">
          <h2 id="forecast-title">Zone forecast{forecast ? ` for ${forecast.date}` : ""}</h2>
          {forecast && <p className="text-sm text-ink-soft">{remainingInWords(forecast)}</p>}
          {forecast && (
            <p className="text-sm text-ink-soft" data-testid="forecast-bites-from">
              The count on {forecast.date} sets the multiplier in force {bitesFromWords(forecast.bitesFrom)}.
            </p>
          )}
        </div>
        <ForecastDateForm
          shown={forecast?.date ?? requested}
          isDefault={isDefault}
          error={dateError}
          pending={pending}
          onDate={onDate}
        />
      </div>
      {forecast && (
        <>
          <ZoneChances forecast={forecast} />
          <div className="grid gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
            <Suspense fallback={<div style={{ height: 200 }} className="border border-dashed border-rule" />}>
              <DistributionChart rows={rows} date={forecast.date} regime={forecast.regime} />
            </Suspense>
            <DistributionTable rows={rows} left={left} regime={forecast.regime} date={forecast.date} />
          </div>
          <div className="flex flex-col gap-2">
            <h3 id="quiet-title" className="text-sm font-semibold">
              If no new exception arrives by {forecast.date}
            </h3>
            <dl
              aria-labelledby="quiet-title"
              className="grid grid-cols-2 gap-x-6 gap-y-3 border-y border-rule py-3 sm:grid-cols-5"
            >
              <Figure label="Counted exceptions">
                <span data-testid="quiet-counted">{forecast.ifNoNewException.counted}</span>
              </Figure>
              <Figure label="Zone">
                <ZoneBadge zone={forecast.ifNoNewException.zone} regime={forecast.regime} className="text-sm" />
              </Figure>
              <Figure label="Plus factor">{formatFactor(forecast.ifNoNewException.plusFactor)}</Figure>
              <Figure label="Capital add-on">
                {forecast.ifNoNewException.addOn === null ? (
                  <span className="text-sm font-normal text-ink-soft">{NO_CAPITAL_INPUTS}</span>
                ) : (
                  formatAmount(forecast.ifNoNewException.addOn, currency)
                )}
              </Figure>
              <Figure
                label="Expected add-on, all outcomes"
                hint={
                  forecast.expectedAddOn === null ? undefined : "weighted by the chance of each count, at today's VaR"
                }
              >
                <span data-testid="expected-add-on">
                  {forecast.expectedAddOn === null ? (
                    <span className="text-sm font-normal text-ink-soft">{NO_CAPITAL_INPUTS}</span>
                  ) : (
                    formatAmount(forecast.expectedAddOn, currency)
                  )}
                </span>
              </Figure>
            </dl>
          </div>
          <p className="text-2xs text-ink-muted">
            Each new business day is taken as an exception with a 1% chance (a calibrated 99% VaR); counts follow the
            entity's P&amp;L basis.
          </p>
        </>
      )}
    </section>
  );
}
