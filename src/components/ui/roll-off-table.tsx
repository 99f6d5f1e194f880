import type { BacktestResponse } from "@shared/schemas/backtest";
import { EmptyState, Table, Td, Th, Tr } from "@/components/ui/table";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { formatBusinessDate, formatFactor } from "@/lib/format";
import { seriesOf } from "../words";

/** When each exception inside the window leaves it, and where the count stands afterwards if no new one arrives. */
export function RollOffTable({ bt }: { bt: BacktestResponse }) {
  return (
    <section aria-labelledby="rolloff-title" className="flex flex-col gap-2">
      <h3 id="rolloff-title" className="text-sm font-semibold">
        Roll-off calendar
      </h3>
      {bt.rollOffs.length === 0 ? (
        <EmptyState title="No exception in the window, so nothing rolls off." />
      ) : (
        <>
          <p className="text-xs text-ink-muted">Dates projected on the entity's business-day calendar, assuming no new exception in between.</p>
          <Table caption="Roll-off calendar">
            <thead>
              <tr>
                <Th>Exception date</Th>
                <Th>Series</Th>
                <Th>Leaves the window on</Th>
                <Th numeric>Count after</Th>
                <Th>Zone after</Th>
                <Th numeric>Plus factor after</Th>
              </tr>
            </thead>
            <tbody>
              {bt.rollOffs.map((r) => (
                <Tr key={r.date}>
                  <Td className="figures whitespace-nowrap">{formatBusinessDate(r.date)}</Td>
                  <Td>{seriesOf(r)}</Td>
                  <Td className="figures whitespace-nowrap">{formatBusinessDate(r.leavesOn)}</Td>
                  <Td numeric>{r.countAfter}</Td>
                  <Td>
                    <ZoneBadge zone={r.zoneAfter} regime={bt.regime} />
                  </Td>
                  <Td numeric>{formatFactor(r.plusFactorAfter)}</Td>
                </Tr>
              ))}
            </tbody>
          </Table>
        </>
      )}
    </section>
  );
}
