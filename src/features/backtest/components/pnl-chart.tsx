import { useMemo, useState } from "react";
import {
  CartesianGrid,
  ComposedChart,
  Line,
  ReferenceArea,
  Scatter,
  Tooltip,
  XAxis,
  YAxis,
  type TooltipContentProps,
} from "recharts";
import type { BacktestResponse } from "@shared/schemas/backtest";
import type { ObservationDto } from "@shared/schemas/observation";
import { ChartFigure, ChartKey, KeyItem, chartLook } from "@/components/ui/chart-frame";
import { DatedFiguresDisclosure } from "@/components/ui/figures-disclosure";
import { Td } from "@/components/ui/table";
import { cn } from "@/lib/cn";
import { compactAmount, formatAmount, plural } from "@/lib/format";
import { chartColours } from "@/styles/palette";

type Series = "actual" | "hypothetical";

const { ink, label: muted, accent, paper } = chartColours;
const loss = chartColours.zone.red;

type Point = {
  date: string;
  pnl: number | null;
  negVar: number | null;
  exception: number | null;
  excluded: number | null;
};

/** A hollow diamond: exception days are told apart by shape as well as colour. */
function Diamond({ cx, cy, fill }: { cx?: number; cy?: number; fill?: string }) {
  if (cx == null || cy == null) return null;
  return (
    <path
      d={`M${cx},${cy - 5}L${cx + 5},${cy}L${cx},${cy + 5}L${cx - 5},${cy}Z`}
      fill={paper}
      stroke={fill}
      strokeWidth={1.75}
    />
  );
}

function Cross({ cx, cy, fill }: { cx?: number; cy?: number; fill?: string }) {
  if (cx == null || cy == null) return null;
  return (
    <path
      d={`M${cx - 4},${cy - 4}L${cx + 4},${cy + 4}M${cx + 4},${cy - 4}L${cx - 4},${cy + 4}`}
      stroke={fill}
      strokeWidth={1.75}
    />
  );
}

/**
 * The hovered day: its date and only the figures it has (a day that is no exception has no exception line, and the
 * scatter series do not repeat the date), each once.
 */
export function PnlTooltip({ active, payload, label, currency }: Partial<TooltipContentProps> & { currency: string }) {
  if (!active || !payload?.length) return null;
  const lines = new Map<string, number>();
  for (const entry of payload) {
    const name = String(entry.name ?? "");
    if (typeof entry.value === "number" && name !== "" && name !== "date" && !lines.has(name))
      lines.set(name, entry.value);
  }
  return (
    <div className="rounded-xs border border-rule bg-paper-raised px-2 py-1.5 text-xs shadow-sm">
      <p className="font-semibold text-ink">{label}</p>
      {[...lines].map(([name, value]) => (
        <p key={name} className="text-ink-soft">
          {name}: <span className="figures text-ink">{formatAmount(value, currency)}</span>
        </p>
      ))}
    </div>
  );
}

/**
 * Daily P&L against −VaR, with the exception days (as the engine classified them) marked and the
 * backtesting window shaded. The series plotted are the stored values; nothing is computed here.
 */
export function PnlChart({
  bt,
  observations,
  width,
}: {
  bt: BacktestResponse;
  observations: ObservationDto[];
  width?: number;
}) {
  const [series, setSeries] = useState<Series>(bt.pnlBasis === "hypothetical" ? "hypothetical" : "actual");
  const days = useMemo(() => new Map(bt.exceptionDays.map((d) => [d.date, d])), [bt.exceptionDays]);
  const points = useMemo<Point[]>(
    () =>
      observations.map((o) => {
        // The actual P&L the rule set backtests (the file's figure less the parts it takes out, if any).
        const pnl = series === "actual" ? o.backtestActualPnl : o.hypotheticalPnl;
        const day = days.get(o.date);
        const hit = day ? day[series] : false;
        return {
          date: o.date,
          pnl,
          negVar: o.var99 === null ? null : -o.var99,
          exception: hit && !day?.excluded ? pnl : null,
          excluded: hit && day?.excluded ? pnl : null,
        };
      }),
    [observations, series, days],
  );
  const marked = bt.exceptionDays.filter((d) => d[series]).length;
  const label = series === "actual" ? "actual P&L" : "hypothetical P&L";
  const last = points.at(-1);

  return (
    <ChartFigure
      caption={`Daily ${label} against −VaR (99%, one day), ${bt.entity.currency}`}
      captionAside={
        <div role="group" aria-label="P&L series" className="inline-flex rounded-sm border border-rule-strong text-xs">
          {(["actual", "hypothetical"] as const).map((s) => (
            <button
              key={s}
              type="button"
              aria-pressed={series === s}
              onClick={() => setSeries(s)}
              className={cn(
                "px-2.5 py-1 first:border-r first:border-rule-strong",
                series === s ? "bg-ink text-paper-raised" : "text-ink-soft hover:text-ink",
              )}
            >
              {s === "actual" ? "Actual P&L" : "Hypothetical P&L"}
            </button>
          ))}
        </div>
      }
      summary={
        <>
          {plural(observations.length, "business day", "business days")} from {observations[0]?.date ?? "—"} to{" "}
          {last?.date ?? "—"}; the backtesting window {bt.window.start} to {bt.window.end} is shaded;{" "}
          {plural(marked, "exception", "exceptions")} on {label} in the window are marked.
          {last && (
            <>
              {" "}
              On {last.date}: {label} {formatAmount(last.pnl, bt.entity.currency)} against a VaR of{" "}
              {formatAmount(last.negVar === null ? null : -last.negVar, bt.entity.currency)}.
            </>
          )}
        </>
      }
      height={300}
      width={width}
      chart={
        <ComposedChart data={points} margin={{ top: 8, right: 12, bottom: 18, left: 8 }}>
          <CartesianGrid {...chartLook.grid} />
          {bt.window.start && bt.window.end && (
            <ReferenceArea
              x1={bt.window.start}
              x2={bt.window.end}
              fill={accent}
              fillOpacity={0.06}
              stroke="none"
              label={{ value: "Backtesting window", position: "insideTopLeft", fill: muted, fontSize: 11 }}
            />
          )}
          <XAxis dataKey="date" {...chartLook.xAxis("Business date")} minTickGap={48} />
          <YAxis tickFormatter={compactAmount} {...chartLook.yAxis(bt.entity.currency, 56)} />
          <Tooltip content={(props) => <PnlTooltip {...props} currency={bt.entity.currency} />} />
          <Line
            type="linear"
            dataKey="pnl"
            name={series === "actual" ? "Actual P&L" : "Hypothetical P&L"}
            stroke={ink}
            strokeWidth={1}
            dot={false}
            isAnimationActive={false}
            connectNulls={false}
          />
          <Line
            type="stepAfter"
            dataKey="negVar"
            name="−VaR 99%"
            stroke={accent}
            strokeWidth={1.25}
            dot={false}
            isAnimationActive={false}
          />
          <Scatter dataKey="exception" name="Exception" fill={loss} shape={<Diamond />} isAnimationActive={false} />
          <Scatter
            dataKey="excluded"
            name="Exception excluded by the supervisor"
            fill={muted}
            shape={<Cross />}
            isAnimationActive={false}
          />
        </ComposedChart>
      }
    >
      <ChartKey>
        <KeyItem sample={<span aria-hidden="true" className="inline-block h-px w-4 bg-ink" />}>
          {series === "actual" ? "Actual P&L" : "Hypothetical P&L"}
        </KeyItem>
        <KeyItem sample={<span aria-hidden="true" className="inline-block h-0.5 w-4 bg-accent" />}>−VaR 99%</KeyItem>
        <KeyItem
          sample={<span aria-hidden="true" className="inline-block size-2 rotate-45 border-[1.5px] border-zone-red" />}
        >
          Exception (loss beyond VaR)
        </KeyItem>
        <KeyItem
          sample={
            <span aria-hidden="true" className="font-semibold text-ink-muted">
              ×
            </span>
          }
        >
          Excluded by the supervisor
        </KeyItem>
        <KeyItem sample={<span aria-hidden="true" className="inline-block h-2.5 w-4 bg-accent/10" />}>
          Current backtesting window
        </KeyItem>
      </ChartKey>
      <DatedFiguresDisclosure
        label={`Daily ${label} and VaR, ${bt.entity.currency}`}
        caption={`Daily ${label} against VaR (99%, one day), ${bt.entity.currency}, oldest first`}
        columns={[
          "Business date",
          { numeric: series === "actual" ? "Actual P&L" : "Hypothetical P&L" },
          { numeric: "VaR 99%" },
          "Exception",
        ]}
        rows={points}
        cells={(p) => (
          <>
            <Td numeric>{formatAmount(p.pnl, bt.entity.currency)}</Td>
            <Td numeric>{formatAmount(p.negVar === null ? null : -p.negVar, bt.entity.currency)}</Td>
            <Td>{p.exception !== null ? "Exception" : p.excluded !== null ? "Excluded by the supervisor" : ""}</Td>
          </>
        )}
      />
    </ChartFigure>
  );
}
