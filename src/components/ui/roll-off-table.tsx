import { useId } from "react";
import type { RollOffDto } from "@shared/schemas/backtest";
import { EmptyState, Table, TableHead, Td, Tr } from "@/components/ui/table";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { cn } from "@/lib/cn";
import { formatBusinessDate, formatFactor } from "@/lib/format";
import { seriesOf } from "@/lib/pnl-series";

/**
 * When each exception inside the window leaves it, and where the count stands afterwards if no new
 * one arrives (Backtest and Capital). With `by`, the rows that have left by that date are marked.
 */
export function RollOffTable({
  rollOffs,
  regime,
  by,
  heading = "h3",
}: {
  rollOffs: readonly RollOffDto[];
  regime: string;
  /** A future date (the forecast's): says for each exception whether it is gone by then. */
  by?: string;
  heading?: "h2" | "h3";
}) {
  const titleId = useId();
  const Heading = heading;
  return (
    <section aria-labelledby={titleId} className="flex flex-col gap-2">
      <Heading id={titleId} className={heading === "h3" ? "text-sm font-semibold" : undefined}>
        Roll-off calendar
      </Heading>
      {rollOffs.length === 0 ? (
        <EmptyState title="No exception in the window, so nothing rolls off." />
      ) : (
        <>
          <p className="text-xs text-ink-muted">
            Dates projected on the entity's business-day calendar, assuming no new exception in between.
          </p>
          <Table caption="Roll-off calendar">
            <TableHead
              columns={[
                "Exception date",
                "Series",
                "Leaves the window on",
                ...(by ? [`By ${by}`] : []),
                { numeric: "Count after" },
                "Zone after",
                { numeric: "Plus factor after" },
              ]}
            />
            <tbody>
              {rollOffs.map((r) => {
                const gone = by !== undefined && r.leavesOn <= by;
                return (
                  <Tr key={r.date}>
                    <Td className="figures whitespace-nowrap">{formatBusinessDate(r.date)}</Td>
                    <Td>{seriesOf(r)}</Td>
                    <Td className="figures whitespace-nowrap">{formatBusinessDate(r.leavesOn)}</Td>
                    {by && <Td className={cn(!gone && "text-ink-muted")}>{gone ? "Gone" : "Still counted"}</Td>}
                    <Td numeric>{r.countAfter}</Td>
                    <Td>
                      <ZoneBadge zone={r.zoneAfter} regime={regime} />
                    </Td>
                    <Td numeric>{formatFactor(r.plusFactorAfter)}</Td>
                  </Tr>
                );
              })}
            </tbody>
          </Table>
        </>
      )}
    </section>
  );
}
