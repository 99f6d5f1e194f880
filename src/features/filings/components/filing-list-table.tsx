import type { ReactNode } from "react";
import type { Filing } from "@shared/schemas/filing";
import { ListCell, RecordTable, Td, type RowOpening } from "@/components/ui/table";
import { QuarterLinkCell } from "@/components/ui/quarter-figure-cells";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { formatDateTime, formatFactor } from "@/lib/format";
import { PersonName } from "@/lib/people";

/** The packs sent, newest first, with the figures each one carried; a row opens its filing. */
export function FilingListTable({
  filings,
  hrefOf,
  regimeOf,
  empty,
  ...opening
}: RowOpening<number> & {
  filings: Filing[];
  /** The entity's rule set, so an FRTB zone reads amber. */
  regimeOf: (entity: string) => string | undefined;
  empty: { title: string; next: ReactNode };
}) {
  return (
    <RecordTable
      caption="Filed packs, newest first"
      columns={[
        "Entity",
        "Quarter",
        "Zone",
        { numeric: "Counted exceptions" },
        { numeric: "Multiplier" },
        "Sent",
        "Recipients",
        "Acknowledged",
      ]}
      records={filings}
      empty={empty}
      {...opening}
    >
      {(f) => (
        <>
          <Td className="whitespace-nowrap">
            <span className="figures font-medium">{f.entity}</span>
            <span className="block text-2xs text-ink-muted">{f.entityName}</span>
          </Td>
          <QuarterLinkCell
            quarterEnd={f.quarterEnd}
            href={hrefOf(f.id)}
            openLabel={(quarter) => `Open ${f.entity} ${quarter}`}
          >
            {f.amends !== null && <span className="block text-2xs font-medium">Amendment of snapshot #{f.amends}</span>}
            {f.amendedBy !== null && (
              <span className="block text-2xs font-medium">Amended by snapshot #{f.amendedBy}</span>
            )}
          </QuarterLinkCell>
          <Td>
            <ZoneBadge zone={f.zone} regime={regimeOf(f.entity)} />
          </Td>
          <Td numeric>{f.counted}</Td>
          <Td numeric>{formatFactor(f.multiplier)}</Td>
          <Td className="whitespace-nowrap">
            {f.sentAt ? (
              <span className="figures">{formatDateTime(f.sentAt)}</span>
            ) : (
              <span className="font-medium">Waiting for the mail server</span>
            )}
            <span className="block text-2xs text-ink-muted">
              <PersonName email={f.sentBy} />
            </span>
          </Td>
          <ListCell items={f.recipients} />
          <Td className="whitespace-nowrap">
            {f.acknowledgedAt ? (
              <>
                <span className="figures">{formatDateTime(f.acknowledgedAt)}</span>
                <span className="block text-2xs text-ink-muted">{f.acknowledgedBy}</span>
              </>
            ) : (
              <span className="font-medium">Waiting</span>
            )}
          </Td>
        </>
      )}
    </RecordTable>
  );
}
