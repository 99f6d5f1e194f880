import { Table, TableHead, Td, Tr } from "@/components/ui/table";
import { QuarterFigureCells, quarterFigureColumns } from "@/components/ui/quarter-figure-cells";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { cn } from "@/lib/cn";
import { snapshotStatusLabels } from "@/lib/snapshot-status-labels";
import { NO_CAPITAL_INPUTS } from "../words";
import type { HistoryPoint } from "./history-points";

/** The chart's figures as a table, oldest quarter first: the accessible way to read them, and the exact amounts. */
export function HistoryTable({
  points,
  currency,
  regime,
}: {
  points: HistoryPoint[];
  currency: string;
  regime: string;
}) {
  return (
    <Table caption="Capital history by quarter end, oldest first">
      <TableHead columns={["Quarter", "Status", "Zone", ...quarterFigureColumns, "Note"]} />
      <tbody>
        {points.map((p) => (
          <Tr key={p.snapshotId}>
            <Td className="whitespace-nowrap">
              <span className="font-medium">{p.label}</span>
              <span className="figures block text-2xs text-ink-muted">{p.quarterEnd}</span>
            </Td>
            <Td className={cn("whitespace-nowrap", !p.signedOff && "font-medium")}>
              {snapshotStatusLabels[p.status]}
              {!p.signedOff && <span className="block text-2xs font-normal text-ink-muted">not signed off</span>}
            </Td>
            <Td>
              <ZoneBadge zone={p.zone} regime={regime} provisional={!p.windowComplete} />
            </Td>
            <QuarterFigureCells quarter={p} currency={currency} />
            <Td className="text-xs">
              {p.restatedAfterSignOff && (
                <span>
                  <span aria-hidden="true" className="font-semibold">
                    †{" "}
                  </span>
                  Restated after sign-off; the figures stay as approved
                </span>
              )}
              {p.capital === null && <span className={cn(p.restatedAfterSignOff && "block")}>{NO_CAPITAL_INPUTS}</span>}
            </Td>
          </Tr>
        ))}
      </tbody>
    </Table>
  );
}
