import type { BacktestResponse } from "@shared/schemas/backtest";
import { Table, Td, Th, Tr } from "@/components/ui/table";
import { formatPValue, formatStatistic } from "../words";
import { Subsection } from "@/components/ui/page-title";

type SeriesTests = BacktestResponse["testsBySeries"]["actual"];

const tests: { key: keyof SeriesTests; name: string; asks: string; df: string }[] = [
  {
    key: "kupiec",
    name: "Kupiec proportion of failures",
    asks: "Is the exception rate the 1% a 99% VaR promises?",
    df: "χ²(1)",
  },
  {
    key: "independence",
    name: "Christoffersen independence",
    asks: "Do exceptions arrive independently, rather than in clusters?",
    df: "χ²(1)",
  },
  {
    key: "conditionalCoverage",
    name: "Conditional coverage",
    asks: "Both at once: the right rate and no clustering.",
    df: "χ²(2)",
  },
];

function SeriesTable({ caption, results }: { caption: string; results: SeriesTests }) {
  return (
    <Table caption={caption}>
      <thead>
        <tr>
          <Th>Test</Th>
          <Th numeric className="whitespace-nowrap">
            Statistic
          </Th>
          <Th numeric className="whitespace-nowrap">
            p-value
          </Th>
          <Th>At 5% significance</Th>
        </tr>
      </thead>
      <tbody>
        {tests.map((t) => {
          const r = results[t.key];
          return (
            <Tr key={t.key}>
              <Td className="w-80">
                <span className="font-medium">{t.name}</span>
                <span className="block text-xs text-ink-muted">{t.asks}</span>
              </Td>
              <Td numeric className="whitespace-nowrap">
                {formatStatistic(r.statistic)} <span className="text-2xs text-ink-muted">{t.df}</span>
              </Td>
              <Td numeric>{formatPValue(r.pValue)}</Td>
              <Td>
                <span className={r.reject ? "font-medium text-danger" : "text-ink"}>
                  {r.reject ? "Rejected. " : "Not rejected. "}
                </span>
                {r.verdict}
              </Td>
            </Tr>
          );
        })}
      </tbody>
    </Table>
  );
}

/** The statistical tests in plain words, on each series the count looks at (both when the basis is the higher of the two). */
export function TestsPanel({ bt }: { bt: BacktestResponse }) {
  const both = bt.pnlBasis === "max";
  return (
    <Subsection titleId="tests-title" title="What the statistics say about the model">
      {both ? (
        <div className="flex flex-col gap-4">
          <div className="flex flex-col gap-1">
            <h4 className="text-xs font-semibold text-ink-soft">On actual P&amp;L</h4>
            <SeriesTable caption="Statistical tests on actual P&L" results={bt.testsBySeries.actual} />
          </div>
          <div className="flex flex-col gap-1">
            <h4 className="text-xs font-semibold text-ink-soft">On hypothetical P&amp;L</h4>
            <SeriesTable caption="Statistical tests on hypothetical P&L" results={bt.testsBySeries.hypothetical} />
          </div>
        </div>
      ) : (
        <div className="flex flex-col gap-1">
          <h4 className="text-xs font-semibold text-ink-soft">
            On {bt.testedSeries === "actual" ? "actual" : "hypothetical"} P&amp;L
          </h4>
          <SeriesTable caption={`Statistical tests on ${bt.testedSeries} P&L`} results={bt.tests} />
        </div>
      )}
    </Subsection>
  );
}
