import { Link } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import { paths } from "@/config/paths";
import { LateBadge } from "@/components/ui/late-badge";
import { Notice } from "@/components/ui/notice";
import { plural } from "@/lib/format";
import { noticeQueries } from "../api/notice-queries";

/**
 * The entity's overshooting notices in one line, for the screens of its top-of-house book: how many
 * wait to be sent, how many of them are late, and where they are done. Nothing when none waits.
 */
export function NoticesStanding({ entity }: { entity: string }) {
  const { data } = useQuery(noticeQueries.list(entity));
  const open = (data ?? []).filter((n) => n.status === "open");
  if (open.length === 0) return null;
  const late = open.filter((n) => n.late).length;
  const soonest = open.map((n) => n.dueOn).sort()[0];
  return (
    <Notice label="Overshooting notices" testId="notices-standing-line">
      <span className="flex flex-wrap items-baseline gap-2">
        {late > 0 && <LateBadge title="Not sent by its due day" />}
        <span>
          {plural(open.length, "overshooting notice waits", "overshooting notices wait")} to be sent to the supervisor
          {late > 0 ? ` (${late} late)` : `, the first due on ${soonest}`}.{" "}
          <Link to={paths.notices.href({ entity, notice: open.length === 1 ? open[0].id : undefined })}>
            Open the notices
          </Link>
        </span>
      </span>
    </Notice>
  );
}
