import type { Snapshot } from "@shared/schemas/snapshot";
import type { DeterminationDto } from "@shared/schemas/determination";
import { determinationSpan } from "./multiplier-standing";
import { Figure } from "@/components/ui/figure";
import { Table, TableHead, Td, Tr } from "@/components/ui/table";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { formatAmount, formatFactor, formatPercent, plural } from "@/lib/format";

/** The figures the engine froze at the quarter end, exactly as stored: nothing here is computed again. */
export function SnapshotFigures({
  snapshot,
  determination,
}: {
  snapshot: Snapshot;
  /** The quarter's determination of the multiplier, when the entity's list holds it. */
  determination?: DeterminationDto;
}) {
  const f = snapshot.figures;
  const { window, exceptions } = f;
  return (
    <section aria-labelledby="figures-title" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h3 id="figures-title" className="text-sm font-semibold">
          Frozen figures
        </h3>
        <p className="text-sm text-ink-soft">
          {f.portfolio} · last day with data <span className="figures">{f.asOf}</span> · window{" "}
          <span className="figures font-medium text-ink" data-testid="snapshot-window">
            {window.start ?? "—"} to {window.end ?? "—"}
          </span>
          , {plural(window.observations, "observation", "observations")}
          {!window.complete && (
            <span className="font-medium text-notice" data-tone="notice">
              {" "}
              (short of the 250 the rules ask for)
            </span>
          )}
        </p>
      </div>
      <dl className="grid grid-cols-2 gap-x-6 gap-y-3 border-y border-rule py-3 sm:grid-cols-4 xl:grid-cols-7">
        <Figure label="Traffic-light zone">
          <ZoneBadge zone={f.zone} regime={f.regime} provisional={!window.complete} className="text-sm" />
        </Figure>
        <Figure label="Counted exceptions">
          <span data-testid="snapshot-counted">{exceptions.counted}</span>
        </Figure>
        <Figure label="Actual P&L exceptions">{exceptions.actual}</Figure>
        <Figure label="Hypothetical P&L exceptions">{exceptions.hypothetical}</Figure>
        <Figure label="Excluded" hint="approved by the supervisor">
          {exceptions.excluded}
        </Figure>
        <Figure label="Expected if calibrated" hint="observations × 1%">
          {formatFactor(f.expected)}
        </Figure>
        <Figure label="P(X ≤ count)" hint="cumulative binomial probability">
          {formatPercent(f.cumulativeProbability)}
        </Figure>
        <Figure label="Plus factor">
          <span data-testid="snapshot-plus-factor">{formatFactor(f.plusFactor)}</span>
        </Figure>
        <Figure label="Qualitative addend">{formatFactor(f.qualitativeAddend)}</Figure>
        <Figure label="Multiplier">
          <span data-testid="snapshot-multiplier">{formatFactor(f.multiplier)}</span>
        </Figure>
        <Figure label="Capital requirement">
          <span data-testid="snapshot-capital">{formatAmount(f.capital, f.currency)}</span>
        </Figure>
        <Figure label="Capital add-on" hint="the part the plus factor adds">
          <span data-testid="snapshot-add-on">{formatAmount(f.addOn, f.currency)}</span>
        </Figure>
      </dl>
      {determination && (
        <p className="text-sm text-ink-soft" data-testid="snapshot-in-force">
          This quarter's multiplier of {formatFactor(determination.multiplier)} is {determinationSpan(determination)}.
          {determination.status === "provisional" &&
            " It becomes official when the chief risk officer approves this snapshot."}
        </p>
      )}
      {f.capitalNote && <p className="text-sm text-ink-soft">{f.capitalNote}</p>}
      {f.exceptionDates.length > 0 && (
        <div className="text-sm">
          <p className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">Exception days in the window</p>
          {f.exceptionDetail ? (
            <ExceptionSeries snapshot={snapshot} />
          ) : (
            <ul className="figures mt-1 flex flex-wrap gap-x-4 gap-y-0.5 text-xs">
              {f.exceptionDates.map((d) => (
                <li key={d}>{d}</li>
              ))}
            </ul>
          )}
        </div>
      )}
      <DesksAtQuarterEnd snapshot={snapshot} />
    </section>
  );
}

type Series = "actual" | "hypothetical";
const seriesWords: Record<Series, string> = { actual: "actual P&L", hypothetical: "hypothetical P&L" };

/**
 * Each exception day with the P&L series its loss went beyond VaR on, and whether the count holds it: the count is on
 * one series (the basis, or under "the higher of the two" the series with more exceptions; docs/rules.md#pnl-basis).
 */
function ExceptionSeries({ snapshot }: { snapshot: Snapshot }) {
  const f = snapshot.figures;
  const counts: Series =
    f.pnlBasis === "max" ? (f.exceptions.actual >= f.exceptions.hypothetical ? "actual" : "hypothetical") : f.pnlBasis;
  return (
    <>
      <p className="mt-1 text-xs text-ink-muted">The count is on {seriesWords[counts]}.</p>
      <ul className="mt-1 flex flex-col gap-0.5 text-xs" aria-label="Exception days and their series">
        {(f.exceptionDetail ?? []).map((d) => {
          const on: Series[] = [
            ...(d.actual ? ["actual" as const] : []),
            ...(d.hypothetical ? ["hypothetical" as const] : []),
          ];
          const counted = on.includes(counts) && !d.excluded;
          return (
            <li key={d.date}>
              <span className="figures">{d.date}</span>: beyond VaR on{" "}
              {on.length === 2 ? "actual and hypothetical P&L" : on.map((x) => seriesWords[x]).join("")}
              {d.excluded
                ? " · excluded by the supervisor"
                : counted
                  ? ` · counts on ${seriesWords[counts]}`
                  : ` · not in the count (${seriesWords[counts]} stayed within VaR)`}
            </li>
          );
        })}
      </ul>
    </>
  );
}

function DesksAtQuarterEnd({ snapshot }: { snapshot: Snapshot }) {
  const desks = snapshot.figures.desks;
  if (desks.length === 0) return null;
  return (
    <section aria-labelledby="snapshot-desks-title" className="flex flex-col gap-2">
      <h4 id="snapshot-desks-title" className="text-xs font-semibold tracking-wide text-ink-muted uppercase">
        Trading desks at the quarter end
      </h4>
      <Table caption="Trading desks at the quarter end">
        <TableHead
          columns={[
            "Desk",
            { numeric: "Exceptions at 99%" },
            { numeric: "Exceptions at 97.5%" },
            "Backtesting",
            "P&L attribution zone",
          ]}
        />
        <tbody>
          {desks.map((d) => (
            <Tr key={d.portfolio}>
              <Td className="figures">{d.portfolio}</Td>
              <Td numeric>{d.exceptions99}</Td>
              <Td numeric>{d.exceptions975}</Td>
              <Td>{d.passes ? "Passes" : <span className="font-medium text-danger">Fails</span>}</Td>
              <Td>
                {d.plaZone ? (
                  <ZoneBadge zone={d.plaZone} regime="frtb" />
                ) : (
                  <span className="text-xs text-ink-muted">Not tested</span>
                )}
              </Td>
            </Tr>
          ))}
        </tbody>
      </Table>
    </section>
  );
}
