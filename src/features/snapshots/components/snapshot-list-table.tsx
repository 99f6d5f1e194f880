import type { ReactNode } from "react";
import { type SnapshotListItem } from "@shared/schemas/snapshot";
import { RecordTable, Td, type RowOpening } from "@/components/ui/table";
import { QuarterFigureCells, QuarterLinkCell, quarterFigureColumns } from "@/components/ui/quarter-figure-cells";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { cn } from "@/lib/cn";
import { snapshotStatusLabels } from "@/lib/snapshot-status-labels";
import { PersonName } from "@/lib/people";

/** The entity's quarters, newest first, with the headline figures each one froze; a row opens its snapshot. */
export function SnapshotListTable({
  snapshots,
  hrefOf,
  empty,
  ...opening
}: RowOpening<number> & {
  snapshots: SnapshotListItem[];
  empty: { title: string; next: ReactNode };
}) {
  return (
    <RecordTable
      caption="Quarter snapshots, newest first"
      columns={["Quarter", "Status", "Zone", ...quarterFigureColumns, "Prepared by", "Approved by"]}
      records={snapshots}
      empty={empty}
      {...opening}
    >
      {(s) => (
        <>
          <QuarterLinkCell
            quarterEnd={s.quarterEnd}
            href={hrefOf(s.id)}
            openLabel={(quarter) => `Open ${quarter}, ${snapshotStatusLabels[s.status].toLowerCase()}`}
          >
            {s.amends !== null && <span className="block text-2xs font-medium">Amends #{s.amends}</span>}
            {s.amendedBy !== null && <span className="block text-2xs text-ink-muted">Amended by #{s.amendedBy}</span>}
          </QuarterLinkCell>
          <Td
            className={cn("whitespace-nowrap", (s.status === "submitted" || s.status === "returned") && "font-medium")}
          >
            {snapshotStatusLabels[s.status]}
          </Td>
          <Td>
            {/* A window short of 250 observations gives a provisional zone (docs/rules.md#window), here as in the snapshot's figures. */}
            <ZoneBadge zone={s.zone} regime={s.figures.regime} provisional={!s.figures.window.complete} />
          </Td>
          <QuarterFigureCells quarter={s} currency={s.figures.currency} />
          <Td className="text-xs">
            <PersonName email={s.preparedBy} />
          </Td>
          <Td className="text-xs">
            {s.approvedBy ? <PersonName email={s.approvedBy} /> : <span className="text-ink-faint">—</span>}
          </Td>
        </>
      )}
    </RecordTable>
  );
}
