import type { OverviewItem } from "@shared/schemas/backtest";
import { Link } from "react-router-dom";
import { EmptyState, Table, TableHead, Td, Tr } from "@/components/ui/table";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { cn } from "@/lib/cn";
import { formatAmount, formatFactor } from "@/lib/format";
import { snapshotStatusLabels } from "@/lib/snapshot-status-labels";
import { inForceSince } from "@/lib/determination-words";
import { quarterLabel } from "@shared/backtest/quarters";

/**
 * One dense row per entity, in the order a reader asks: the multiplier in force (the last
 * determination's) first, then the indicative zone and count of the rolling count as if determined
 * today and what it would cost, then what rolls off next and what work is open. Every figure is the
 * server's.
 */
export function StandingTable({
  items,
  backtestHref,
  findingsHref,
  quarterHref,
}: {
  items: OverviewItem[];
  backtestHref: (portfolio: string) => string;
  findingsHref: (entity: string) => string;
  /** Where the quarter-close column links to; without it (a role that may not open Quarter close) it is plain text. */
  quarterHref?: (entity: string, snapshotId: number) => string;
}) {
  if (items.length === 0) {
    return (
      <EmptyState title="No legal entities are set up yet">
        An administrator adds the entities and their portfolios; they appear here as soon as they exist.
      </EmptyState>
    );
  }
  return (
    <Table caption="Where each entity stands">
      <TableHead
        columns={[
          "Entity",
          "Multiplier in force",
          "Zone if determined today",
          { numeric: "Counted exceptions" },
          { numeric: "Plus factor" },
          { numeric: "Indicative multiplier" },
          { numeric: "Indicative add-on" },
          "As of",
          "Next roll-off",
          { numeric: "Open reviews" },
          { numeric: "Open findings" },
          "Quarter close",
        ]}
      />
      <tbody>
        {items.map((e) => {
          const href = e.portfolio ? backtestHref(e.portfolio) : null;
          const noData = e.zone === null;
          return (
            <Tr key={e.entity} data-entity={e.entity}>
              <Td>
                {href ? (
                  <Link to={href} className="font-medium">
                    {e.entity}
                  </Link>
                ) : (
                  <span className="font-medium">{e.entity}</span>
                )}
                <span className="block text-xs text-ink-muted">{e.name}</span>
              </Td>
              {noData ? (
                <Td colSpan={8} className="text-sm text-ink-muted">
                  {e.portfolio ? "No daily data yet: an analyst uploads it under Data." : "No portfolio set up yet."}
                </Td>
              ) : (
                <>
                  <Td className="whitespace-nowrap">
                    {e.inForce ? (
                      <>
                        <span className="flex items-center gap-2">
                          <span className="figures font-medium">{formatFactor(e.inForce.multiplier)}</span>
                          <ZoneBadge zone={e.inForce.zone} regime={e.regime} />
                        </span>
                        <span className="block text-2xs text-ink-muted">{inForceSince(e.inForce)}</span>
                      </>
                    ) : (
                      <span className="text-xs text-ink-muted">No determination yet</span>
                    )}
                  </Td>
                  <Td>
                    <ZoneBadge zone={e.zone!} regime={e.regime} />
                  </Td>
                  <Td numeric>
                    {e.counted}
                    {!e.complete && <span className="block text-2xs text-ink-muted">provisional</span>}
                  </Td>
                  <Td numeric>{formatFactor(e.plusFactor)}</Td>
                  <Td numeric>{formatFactor(e.multiplier)}</Td>
                  <Td numeric className="whitespace-nowrap">
                    {e.addOn === null ? (
                      <span className="text-ink-muted" title="No capital input (VaR/sVaR or ES) in the data">
                        —
                      </span>
                    ) : (
                      formatAmount(e.addOn, e.currency)
                    )}
                  </Td>
                  <Td className="figures whitespace-nowrap">{e.asOf}</Td>
                  <Td className="whitespace-nowrap">
                    {e.nextRollOff ? (
                      <span className="flex items-center gap-2">
                        <span className="figures">{e.nextRollOff.leavesOn}</span>
                        <span className="text-xs text-ink-muted">then {e.nextRollOff.countAfter}</span>
                        <ZoneBadge zone={e.nextRollOff.zoneAfter} regime={e.regime} />
                      </span>
                    ) : (
                      <span className="text-ink-muted">None in the window</span>
                    )}
                  </Td>
                </>
              )}
              <Td numeric>
                {e.openReviews > 0 && href ? (
                  <Link
                    to={`${href}#exceptions`}
                    aria-label={`${e.openReviews} open reviews for ${e.entity}`}
                    className="font-medium"
                  >
                    {e.openReviews}
                  </Link>
                ) : (
                  <span className={cn(e.openReviews === 0 && "text-ink-muted")}>{e.openReviews}</span>
                )}
              </Td>
              <Td numeric>
                {e.openFindings > 0 ? (
                  <Link
                    to={findingsHref(e.entity)}
                    aria-label={`${e.openFindings} open findings for ${e.entity}`}
                    className="font-medium"
                  >
                    {e.openFindings}
                  </Link>
                ) : (
                  <span className="text-ink-muted">0</span>
                )}
              </Td>
              <Td className="whitespace-nowrap">
                {e.quarterClose ? (
                  <QuarterState entity={e.entity} state={e.quarterClose} href={quarterHref} />
                ) : (
                  <span className="text-ink-muted">No snapshot yet</span>
                )}
              </Td>
            </Tr>
          );
        })}
      </tbody>
    </Table>
  );
}

/** The newest snapshot's quarter and status in plain words, e.g. "Q3 2026 · Approved". */
function QuarterState({
  entity,
  state,
  href,
}: {
  entity: string;
  state: NonNullable<OverviewItem["quarterClose"]>;
  href?: (entity: string, snapshotId: number) => string;
}) {
  const text = `${quarterLabel(state.quarterEnd)} · ${snapshotStatusLabels[state.status]}`;
  return href ? (
    <Link to={href(entity, state.snapshotId)} aria-label={`Quarter close of ${entity}: ${text}`}>
      {text}
    </Link>
  ) : (
    <span>{text}</span>
  );
}
