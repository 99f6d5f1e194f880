import { Bar, BarChart, CartesianGrid, Cell, Tooltip, XAxis, YAxis } from "recharts";
import type { Zone } from "@shared/backtest/types";
import { ChartFigure, ChartKey, KeyItem, chartLook } from "@/components/ui/chart-frame";
import { zoneName } from "@/components/ui/zone-badge";
import { formatChance } from "@/lib/format";
import { chartColours } from "@/styles/palette";

const zoneFill: Record<Zone, string> = chartColours.zone;

export type DistributionRow = { exceptions: number; probability: number; zone: Zone };

/** P(counted = k) at the forecast date, each bar in the colour of the zone that count falls in (named in the key and the table). */
export function DistributionChart({
  rows,
  date,
  regime,
  width,
}: {
  rows: DistributionRow[];
  date: string;
  regime: string;
  width?: number;
}) {
  // The count the engine gives the highest chance (the first, on a tie), named in the caption.
  const likeliest = rows.reduce<DistributionRow | undefined>(
    (a, r) => (a && a.probability >= r.probability ? a : r),
    undefined,
  );
  const zones = [...new Set(rows.map((r) => r.zone))];
  const data = rows.map((r) => ({ ...r, percent: r.probability * 100 }));
  return (
    <ChartFigure
      caption={`Chance of each count of exceptions on ${date}`}
      summary={
        <>
          {rows.length > 0 && `Counts ${rows[0].exceptions} to ${rows.at(-1)!.exceptions} are drawn`}
          {likeliest &&
            `; the likeliest is ${likeliest.exceptions} (${formatChance(likeliest.probability)}, ${zoneName(likeliest.zone, regime)} zone)`}
          . The table beside the chart gives every count's chance.
        </>
      }
      height={200}
      width={width}
      initialWidth={480}
      chart={
        <BarChart data={data} margin={{ top: 8, right: 8, bottom: 18, left: 8 }}>
          <CartesianGrid {...chartLook.grid} />
          <XAxis dataKey="exceptions" {...chartLook.xAxis("Counted exceptions")} />
          <YAxis tickFormatter={(v: number) => `${v}%`} {...chartLook.yAxis("Probability", 48)} />
          <Tooltip
            formatter={(value) => [formatChance((typeof value === "number" ? value : 0) / 100), "Probability"]}
            labelFormatter={(k) => `${k} exceptions`}
            {...chartLook.tooltip}
          />
          <Bar dataKey="percent" name="Probability" isAnimationActive={false}>
            {data.map((r) => (
              <Cell key={r.exceptions} fill={zoneFill[r.zone]} fillOpacity={0.75} />
            ))}
          </Bar>
        </BarChart>
      }
    >
      <ChartKey>
        {zones.map((z) => (
          <KeyItem
            key={z}
            sample={
              <span
                aria-hidden="true"
                className="inline-block h-2.5 w-3"
                style={{ background: zoneFill[z], opacity: 0.75 }}
              />
            }
          >
            {zoneName(z, regime)} zone
          </KeyItem>
        ))}
      </ChartKey>
    </ChartFigure>
  );
}
