import { lazy, Suspense } from "react";
import type { CapitalHistoryItem } from "@shared/schemas/capital";
import { EmptyState } from "@/components/ui/table";
import { plural } from "@/lib/format";
import { historyPoints } from "./history-points";
import { HistoryTable } from "./history-table";

const HistoryChart = lazy(() => import("./charts").then((m) => ({ default: m.HistoryChart })));

/** "Why": how the multiplier and the add-on got here, quarter by quarter, as the snapshots hold them. */
export function CapitalHistory({
  items,
  currency,
  regime,
  empty,
}: {
  items: readonly CapitalHistoryItem[];
  currency: string;
  regime: string;
  empty: { title: string; next: string };
}) {
  const points = historyPoints(items);
  const open = points.filter((p) => !p.signedOff).length;
  return (
    <section aria-labelledby="history-title" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h2 id="history-title">Why: the multiplier and add-on by quarter</h2>
        <p className="figures text-sm text-ink-muted">
          {plural(points.length, "quarter", "quarters")}
          {open > 0 && ` · ${plural(open, "not signed off", "not signed off")}`}
        </p>
      </div>
      {points.length === 0 ? (
        <EmptyState title={empty.title}>{empty.next}</EmptyState>
      ) : (
        <>
          <Suspense
            fallback={
              <div
                style={{ height: 260 }}
                className="flex items-center justify-center border border-dashed border-rule text-xs text-ink-muted"
              >
                Drawing the chart…
              </div>
            }
          >
            <HistoryChart points={points} currency={currency} />
          </Suspense>
          <HistoryTable points={points} currency={currency} regime={regime} />
        </>
      )}
    </section>
  );
}
