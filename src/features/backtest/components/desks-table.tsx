import type { DeskResult } from "@shared/schemas/backtest";
import { Table, TableHead, Td, Tr } from "@/components/ui/table";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { cn } from "@/lib/cn";
import { Subsection } from "@/components/ui/page-title";

function Count({
  count,
  limit,
  fails,
  excludedDays,
}: {
  count: number;
  limit: number;
  fails: boolean;
  excludedDays?: number;
}) {
  return (
    <span className={cn(fails && "font-semibold text-danger")}>
      {count} <span className="text-ink-muted">/ {limit}</span>
      {excludedDays ? (
        <span className="block text-2xs font-normal text-ink-muted">{excludedDays} excluded by the supervisor</span>
      ) : null}
    </span>
  );
}

/** FRTB (MAR32): each trading desk's backtest at 99% and 97.5% and its P&L attribution test. */
export function DesksTable({ desks }: { desks: DeskResult[] }) {
  if (desks.length === 0) return null;
  return (
    <Subsection
      titleId="desks-title"
      title={<>Trading desks: backtesting and P&amp;L attribution</>}
      className="flex flex-col gap-2"
    >
      <p className="text-xs text-ink-muted">
        A desk fails backtesting above 12 exceptions at 99% or above 30 at 97.5% in 250 days. The P&amp;L attribution
        test compares hypothetical with risk-theoretical P&amp;L. Exceptions whose exclusion the supervisor approved are
        not counted; a day without P&amp;L or VaR always counts.
      </p>
      <Table caption="Trading desks">
        <TableHead
          columns={[
            "Desk",
            { numeric: "99% exceptions / limit" },
            { numeric: "97.5% exceptions / limit" },
            "Backtesting",
            { numeric: "PLA Spearman" },
            { numeric: "PLA KS" },
            "PLA zone",
          ]}
        />
        <tbody>
          {desks.map((d) => (
            <Tr key={d.portfolio}>
              <Td>
                <span className="font-medium">{d.name}</span>
                <span className="figures block text-2xs text-ink-muted">{d.portfolio}</span>
              </Td>
              <Td numeric>
                <Count {...d.backtest.at99} />
              </Td>
              <Td numeric>
                <Count {...d.backtest.at975} />
              </Td>
              <Td>{d.backtest.passes ? "Passes" : <span className="font-medium text-danger">Fails</span>}</Td>
              <Td numeric>{d.pla ? d.pla.spearman.toFixed(3) : "—"}</Td>
              <Td numeric>{d.pla ? d.pla.ks.toFixed(3) : "—"}</Td>
              <Td>
                {d.pla ? (
                  <ZoneBadge zone={d.pla.zone} regime="frtb" />
                ) : (
                  <span className="text-xs text-ink-muted">{d.plaUnavailable}</span>
                )}
              </Td>
            </Tr>
          ))}
        </tbody>
      </Table>
    </Subsection>
  );
}
