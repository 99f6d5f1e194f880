import type { ExceptionDayDto } from "@shared/schemas/backtest";
import { formatAmount } from "@/lib/format";

/**
 * How the exception's actual P&L was made up under the entity's rule set (docs/rules.md#pnl-definition):
 * the file's actual P&L, each part it gave and whether the rule set takes it out, and what was compared
 * with VaR. A file without the parts is said to be used as supplied.
 */
export function PnlMakeUp({ day, currency }: { day: ExceptionDayDto; currency: string }) {
  const makeUp = day.actualMakeUp;
  if (!makeUp)
    return (
      <p className="text-sm text-ink-muted">
        Actual P&amp;L as supplied: the file gave no parts of it (fees, reserves, net interest income, intraday or new
        trades), so no rule-set adjustment was made.
      </p>
    );
  return (
    <table className="figures w-full max-w-xl text-sm">
      <caption className="pb-1 text-left font-sans font-medium">How the actual P&amp;L was made up</caption>
      <thead className="sr-only">
        <tr>
          <th scope="col">Line</th>
          <th scope="col">Amount</th>
          <th scope="col">Treatment</th>
        </tr>
      </thead>
      <tbody>
        <tr className="border-b border-rule">
          <th scope="row" className="py-0.5 text-left font-sans font-normal">
            Actual P&amp;L in the file
          </th>
          <td className="text-right">{formatAmount(makeUp.supplied, currency)}</td>
          <td />
        </tr>
        {makeUp.lines.map((l) => (
          <tr key={l.component}>
            <th scope="row" className="py-0.5 pl-3 text-left font-sans font-normal text-ink-soft">
              {l.label}
            </th>
            <td className="text-right">{l.amount === null ? "not given" : formatAmount(l.amount, currency)}</td>
            <td className="pl-3 font-sans text-ink-soft">
              {l.removed ? (l.amount === null ? "none to take out" : "taken out") : "kept in"}
            </td>
          </tr>
        ))}
        <tr className="border-t-2 border-ink font-medium">
          <th scope="row" className="py-0.5 text-left font-sans">
            Backtested against VaR
          </th>
          <td className="text-right">{formatAmount(makeUp.backtesting, currency)}</td>
          <td />
        </tr>
      </tbody>
      <tfoot>
        <tr>
          <td colSpan={3} className="pt-1 font-sans text-xs text-ink-muted">
            {makeUp.source}.
          </td>
        </tr>
      </tfoot>
    </table>
  );
}
