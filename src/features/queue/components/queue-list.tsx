import { Link } from "react-router-dom";
import type { QueueItem, QueueKind } from "@shared/schemas/queue";
import { EmptyState } from "@/components/ui/table";
import { formatBusinessDate, plural } from "@/lib/format";
import { LateBadge } from "@/components/ui/late-badge";

/** Today as the server counts due days (UTC). */
const todayIso = () => new Date().toISOString().slice(0, 10);

/** Each kind's heading, in the order the list shows them (the most pressing sign-off first). */
export const queueKindLabels: Record<QueueKind, string> = {
  snapshot_submitted: "Quarters to sign off",
  notice_to_send: "Overshooting notices to send",
  approved_not_filed: "Approved quarters to file",
  exclusion_request: "Exclusion requests to decide",
  settings_proposal: "Settings changes to decide",
  notice_to_draft: "Overshooting notices to draft",
  snapshot_returned: "Returned quarters to prepare again",
  amendment_to_prepare: "Filed quarters to amend",
  quarter_without_snapshot: "Ended quarters without a snapshot",
  unexplained_exception: "Exceptions to explain",
  open_finding: "Open data-quality findings",
  role_request: "Role changes to approve",
  filing_to_acknowledge: "Filed packs to acknowledge",
};

const ORDER = Object.keys(queueKindLabels) as QueueKind[];

/** The waiting items grouped by what has to be done, each linking to where it is done. */
export function QueueList({ items, empty }: { items: QueueItem[]; empty: string }) {
  if (items.length === 0) return <EmptyState title="Nothing is waiting for you">{empty}</EmptyState>;
  const groups = ORDER.map((kind) => ({ kind, items: items.filter((i) => i.kind === kind) })).filter(
    (g) => g.items.length > 0,
  );
  return (
    <div className="flex flex-col gap-5">
      {groups.map((g) => (
        <section key={g.kind} aria-labelledby={`queue-${g.kind}`} className="flex flex-col gap-1.5">
          <h2 className="flex items-baseline gap-2">
            <span id={`queue-${g.kind}`}>{queueKindLabels[g.kind]}</span>{" "}
            <span className="figures text-sm font-normal text-ink-muted">
              {plural(g.items.length, "item", "items")}
            </span>
          </h2>
          <ul className="flex flex-col divide-y divide-rule border-y border-rule">
            {g.items.map((item) => (
              <li key={`${item.href}|${item.title}`} className="flex items-baseline justify-between gap-4 px-2 py-1.5">
                <Link to={item.href} className="text-sm">
                  {item.title}
                </Link>
                {item.due && (
                  <span className="figures flex items-baseline gap-2 text-sm whitespace-nowrap text-ink-muted">
                    {item.due < todayIso() && <LateBadge title="Not sent by its due day" />}
                    due {formatBusinessDate(item.due)}
                  </span>
                )}
              </li>
            ))}
          </ul>
        </section>
      ))}
    </div>
  );
}
