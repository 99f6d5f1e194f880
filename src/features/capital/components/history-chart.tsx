import { Bar, CartesianGrid, Cell, ComposedChart, Line, Tooltip, XAxis, YAxis } from "recharts";
import { ChartFigure, ChartKey, KeyItem, chartLook } from "@/components/ui/chart-frame";
import { compactAmount, formatAmount, formatFactor, plural } from "@/lib/format";
import type { HistoryPoint } from "./history-points";
import { chartColours } from "@/styles/palette";

const { ink, accent, paper } = chartColours;

/** A quarter's multiplier: a filled dot when signed off, a hollow one when not; a dagger above when restated after sign-off. */
function QuarterDot({ cx, cy, payload }: { cx?: number; cy?: number; payload?: HistoryPoint }) {
  if (cx == null || cy == null || !payload) return null;
  return (
    <g>
      <circle cx={cx} cy={cy} r={3.5} fill={payload.signedOff ? ink : paper} stroke={ink} strokeWidth={1.5} />
      {payload.restatedAfterSignOff && (
        <text x={cx} y={cy - 9} textAnchor="middle" fontSize={12} fontWeight={600} fill={ink}>
          †
        </text>
      )}
    </g>
  );
}

/**
 * Multiplier (step line, left axis) and capital add-on (bars, right axis) at each quarter end, as
 * the snapshots hold them. Signed-off quarters are drawn solid; the others hollow and dashed.
 */
export function HistoryChart({
  points,
  currency,
  width,
}: {
  points: HistoryPoint[];
  currency: string;
  width?: number;
}) {
  const multipliers = points.map((p) => p.multiplier);
  const low = Math.max(0, Math.floor(Math.min(...multipliers) * 4) / 4 - 0.25);
  const high = Math.ceil(Math.max(...multipliers) * 4) / 4 + 0.25;
  // With every add-on at zero the axis would invent a 0–4 scale; it shows 0 alone instead.
  const noAddOn = points.every((p) => !p.addOn);
  const open = points.filter((p) => !p.signedOff).length;
  const restated = points.filter((p) => p.restatedAfterSignOff).length;
  const latest = points.at(-1);

  return (
    <ChartFigure
      caption={`Multiplier and capital add-on at each quarter end, ${currency}`}
      summary={
        <>
          {plural(points.length, "quarter", "quarters")} from {points[0]?.label ?? "—"} to {latest?.label ?? "—"}
          {latest &&
            `; at ${latest.label} the multiplier is ${formatFactor(latest.multiplier)} and the add-on ${formatAmount(latest.addOn, currency)}`}
          {open > 0 ? `; ${plural(open, "quarter is", "quarters are")} not signed off and drawn hollow` : ""}
          {restated > 0 ? `; ${plural(restated, "quarter was", "quarters were")} restated after sign-off` : ""}. The
          table below holds the same figures.
        </>
      }
      height={260}
      width={width}
      chart={
        <ComposedChart data={points} margin={{ top: 18, right: 8, bottom: 18, left: 8 }}>
          <CartesianGrid {...chartLook.grid} />
          <XAxis dataKey="label" {...chartLook.xAxis("Quarter end")} />
          <YAxis
            yAxisId="multiplier"
            domain={[low, high]}
            tickFormatter={(v: number) => formatFactor(v)}
            {...chartLook.yAxis("Multiplier", 56)}
          />
          <YAxis
            yAxisId="addOn"
            orientation="right"
            domain={noAddOn ? [0, 1] : [0, "auto"]}
            ticks={noAddOn ? [0] : undefined}
            tickFormatter={compactAmount}
            {...chartLook.yAxis(`Add-on, ${currency}`, 64, "right")}
          />
          <Tooltip
            formatter={(value, name) => [
              name === "Multiplier"
                ? formatFactor(typeof value === "number" ? value : null)
                : formatAmount(typeof value === "number" ? value : null, currency),
              name,
            ]}
            {...chartLook.tooltip}
          />
          <Bar yAxisId="addOn" dataKey="addOn" name="Capital add-on" barSize={28} isAnimationActive={false}>
            {points.map((p) => (
              <Cell
                key={p.snapshotId}
                fill={p.signedOff ? accent : paper}
                fillOpacity={p.signedOff ? 0.55 : 1}
                stroke={accent}
                strokeDasharray={p.signedOff ? undefined : "3 2"}
              />
            ))}
          </Bar>
          <Line
            yAxisId="multiplier"
            type="stepAfter"
            dataKey="multiplier"
            name="Multiplier"
            stroke={ink}
            strokeWidth={1.5}
            dot={<QuarterDot />}
            activeDot={false}
            isAnimationActive={false}
          />
        </ComposedChart>
      }
    >
      <ChartKey>
        <KeyItem sample={<span aria-hidden="true" className="inline-block h-0.5 w-4 bg-ink" />}>
          Multiplier (left axis)
        </KeyItem>
        <KeyItem
          sample={<span aria-hidden="true" className="inline-block h-2.5 w-3 border border-accent bg-accent/55" />}
        >
          Capital add-on (right axis)
        </KeyItem>
        <KeyItem sample={<span aria-hidden="true" className="inline-block size-2 rounded-full bg-ink" />}>
          Signed off (approved or filed)
        </KeyItem>
        {open > 0 && (
          <KeyItem
            sample={
              <>
                <span aria-hidden="true" className="inline-block size-2 rounded-full border-[1.5px] border-ink" />
                <span aria-hidden="true" className="inline-block h-2.5 w-3 border border-dashed border-accent" />
              </>
            }
          >
            Not signed off
          </KeyItem>
        )}
        {restated > 0 && (
          <KeyItem
            sample={
              <span aria-hidden="true" className="font-semibold text-ink">
                †
              </span>
            }
          >
            Restated after sign-off (figures stay as approved)
          </KeyItem>
        )}
      </ChartKey>
    </ChartFigure>
  );
}
