import { Link } from "react-router-dom";
import type { Notice } from "@shared/schemas/notice";
import { RecordTable, Td, type RowOpening } from "@/components/ui/table";
import { LateBadge } from "@/components/ui/late-badge";
import { formatDecimal } from "@/lib/format";
import { standingOf } from "../words";

/** An entity's notices, newest overshooting first; a row opens the notice below the table. */
export function NoticeListTable({ notices, hrefOf, ...opening }: RowOpening<number> & { notices: Notice[] }) {
  return (
    <RecordTable
      caption="Overshooting notices"
      columns={["Overshooting day", "Portfolio", { numeric: "Loss beyond VaR" }, "Due", "Where it stands"]}
      records={notices}
      empty={{
        title: "No overshooting notices",
        next: "A notice opens when a committed upload reveals an overshooting of the entity's top-of-house book.",
      }}
      {...opening}
    >
      {(n) => (
        <>
          <Td className="figures">
            <Link to={hrefOf(n.id)} preventScrollReset>
              {n.date}
            </Link>
          </Td>
          <Td>{n.portfolio}</Td>
          <Td numeric>{n.excess === null ? "—" : `${formatDecimal(n.excess)} ${n.currency}`}</Td>
          <Td className="figures">{n.dueOn}</Td>
          <Td>
            <span className="flex flex-wrap items-baseline gap-2">
              {n.late && (
                <LateBadge title={n.status === "sent" ? "Sent after its due day" : "Not sent by its due day"} />
              )}
              <span data-testid={`notice-standing-${n.id}`}>{standingOf(n)}</span>
            </span>
          </Td>
        </>
      )}
    </RecordTable>
  );
}
