import { useId } from "react";
import { Bar, BarChart, CartesianGrid, Cell, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { Zone } from "@shared/backtest/types";
import { zoneName } from "@/components/ui/zone-badge";
import { formatChance } from "@/lib/format";
import { chartColours } from "@/styles/palette";

const { ink, label: muted, grid: rule } = chartColours;
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
  const titleId = useId();
  const zones = [...new Set(rows.map((r) => r.zone))];
  const data = rows.map((r) => ({ ...r, percent: r.probability * 100 }));
  return (
    <figure aria-labelledby={titleId} className="flex flex-col gap-2">
      <figcaption id={titleId} className="text-sm font-medium text-ink">
        Chance of each count of exceptions on {date}
      </figcaption>
      <div style={{ height: 200 }} className="w-full">
        <ResponsiveContainer
          width={width ?? "100%"}
          height={200}
          initialDimension={{ width: width ?? 480, height: 200 }}
        >
          <BarChart data={data} margin={{ top: 8, right: 8, bottom: 18, left: 8 }}>
            <CartesianGrid stroke={rule} strokeDasharray="2 3" vertical={false} />
            <XAxis
              dataKey="exceptions"
              tick={{ fill: muted, fontSize: 11 }}
              tickLine={false}
              axisLine={{ stroke: rule }}
              label={{ value: "Counted exceptions", position: "insideBottom", offset: -10, fill: muted, fontSize: 11 }}
            />
            <YAxis
              tickFormatter={(v: number) => `${v}%`}
              tick={{ fill: muted, fontSize: 11 }}
              tickLine={false}
              axisLine={false}
              width={48}
              label={{ value: "Probability", angle: -90, position: "insideLeft", fill: muted, fontSize: 11 }}
            />
            <Tooltip
              formatter={(value) => [formatChance((typeof value === "number" ? value : 0) / 100), "Probability"]}
              labelFormatter={(k) => `${k} exceptions`}
              labelStyle={{ color: ink, fontWeight: 600 }}
              contentStyle={{ fontSize: 12, borderColor: rule, borderRadius: 2 }}
            />
            <Bar dataKey="percent" name="Probability" isAnimationActive={false}>
              {data.map((r) => (
                <Cell key={r.exceptions} fill={zoneFill[r.zone]} fillOpacity={0.75} />
              ))}
            </Bar>
          </BarChart>
        </ResponsiveContainer>
      </div>
      <ul className="flex flex-wrap gap-x-5 gap-y-1 text-xs text-ink-soft" aria-label="Chart key">
        {zones.map((z) => (
          <li key={z} className="flex items-center gap-1.5">
            <span
              aria-hidden="true"
              className="inline-block h-2.5 w-3"
              style={{ background: zoneFill[z], opacity: 0.75 }}
            />{" "}
            {zoneName(z, regime)} zone
          </li>
        ))}
      </ul>
    </figure>
  );
}
