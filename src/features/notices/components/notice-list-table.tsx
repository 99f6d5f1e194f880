import { Link } from "react-router-dom";
import type { Notice } from "@shared/schemas/notice";
import { EmptyState, SelectableTr, Table, TableHead, Td } from "@/components/ui/table";
import { LateBadge } from "@/components/ui/late-badge";
import { formatDecimal } from "@/lib/format";
import { standingOf } from "../words";

/** An entity's notices, newest overshooting first; a row opens the notice below the table. */
export function NoticeListTable({
  notices,
  selectedId,
  noticeHref,
  onOpen,
}: {
  notices: Notice[];
  selectedId?: number;
  noticeHref: (id: number) => string;
  onOpen: (id: number) => void;
}) {
  if (notices.length === 0)
    return (
      <EmptyState title="No overshooting notices">
        A notice opens when a committed upload reveals an overshooting of the entity's top-of-house book.
      </EmptyState>
    );
  return (
    <Table caption="Overshooting notices">
      <TableHead
        columns={["Overshooting day", "Portfolio", { numeric: "Loss beyond VaR" }, "Due", "Where it stands"]}
      />
      <tbody>
        {notices.map((n) => (
          <SelectableTr key={n.id} selected={n.id === selectedId} onOpen={() => onOpen(n.id)}>
            <Td className="figures">
              <Link to={noticeHref(n.id)} preventScrollReset>
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
          </SelectableTr>
        ))}
      </tbody>
    </Table>
  );
}
