import { useId } from "react";
import {
  CartesianGrid,
  Line,
  LineChart,
  ReferenceArea,
  ReferenceLine,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import type { RollingRowDto } from "@shared/schemas/backtest";
import type { RegimeId } from "@shared/schemas/common";
import { zoneBoundariesFor } from "@shared/backtest/regimes";
import { zoneName } from "@/components/ui/zone-badge";
import { chartColours } from "@/styles/palette";

const { ink, label: muted, grid: rule, zone: bands } = chartColours;

/**
 * Counted exceptions in the trailing window on every date of the history, drawn over the zone
 * bands of the rule set (boundaries from the engine's table for a full 250-day window).
 */
export function RollingChart({
  rows,
  regime,
  asOf,
  width,
}: {
  rows: RollingRowDto[];
  regime: RegimeId;
  asOf: string;
  width?: number;
}) {
  const titleId = useId();
  const summaryId = useId();
  const b = zoneBoundariesFor(regime);
  const top = Math.max(b.redFrom + 3, ...rows.map((r) => r.counted + 1));
  const current = rows.find((r) => r.date === asOf);
  const provisionalUntil = rows.filter((r) => !r.complete).at(-1)?.date;
  const band = (zone: "green" | "yellow" | "red") => `${zoneName(zone, regime)} zone`;

  return (
    <figure aria-labelledby={titleId} aria-describedby={summaryId} className="flex flex-col gap-2">
      <figcaption id={titleId} className="text-sm font-medium text-ink">
        Counted exceptions in the trailing window, over the whole history
        <span className="ml-2 text-xs font-normal text-ink-muted">dashed line: as of {asOf}</span>
      </figcaption>
      <p id={summaryId} className="sr-only">
        {rows.length} dates from {rows[0]?.date ?? "—"} to {rows.at(-1)?.date ?? "—"}. {band("green")} below{" "}
        {b.yellowFrom}, {band("yellow")} from {b.yellowFrom}, {band("red")} from {b.redFrom} exceptions.
        {current ? ` On ${asOf}: ${current.counted} counted, ${zoneName(current.zone, regime)} zone.` : ""}
      </p>
      <div style={{ height: 220 }} className="w-full">
        <ResponsiveContainer
          width={width ?? "100%"}
          height={220}
          initialDimension={{ width: width ?? 960, height: 220 }}
        >
          <LineChart data={rows} margin={{ top: 22, right: 16, bottom: 18, left: 8 }}>
            <ReferenceArea
              y1={0}
              y2={b.yellowFrom - 0.5}
              fill={bands.green}
              fillOpacity={0.09}
              stroke="none"
              ifOverflow="hidden"
              label={{ value: band("green"), position: "insideTopRight", fill: bands.green, fontSize: 11 }}
            />
            <ReferenceArea
              y1={b.yellowFrom - 0.5}
              y2={b.redFrom - 0.5}
              fill={bands.yellow}
              fillOpacity={0.1}
              stroke="none"
              ifOverflow="hidden"
              label={{ value: band("yellow"), position: "insideTopRight", fill: bands.yellow, fontSize: 11 }}
            />
            <ReferenceArea
              y1={b.redFrom - 0.5}
              y2={top}
              fill={bands.red}
              fillOpacity={0.08}
              stroke="none"
              ifOverflow="hidden"
              label={{ value: band("red"), position: "insideTopRight", fill: bands.red, fontSize: 11 }}
            />
            <CartesianGrid stroke={rule} strokeDasharray="2 3" vertical={false} />
            {provisionalUntil && (
              <ReferenceArea
                x1={rows[0]?.date}
                x2={provisionalUntil}
                fill={muted}
                fillOpacity={0.08}
                stroke="none"
                label={{ value: "Short window (provisional)", position: "insideBottomLeft", fill: muted, fontSize: 11 }}
              />
            )}
            <XAxis
              dataKey="date"
              tick={{ fill: muted, fontSize: 11 }}
              tickLine={false}
              axisLine={{ stroke: rule }}
              minTickGap={56}
              label={{ value: "As-of date", position: "insideBottom", offset: -10, fill: muted, fontSize: 11 }}
            />
            <YAxis
              domain={[0, top]}
              allowDecimals={false}
              tick={{ fill: muted, fontSize: 11 }}
              tickLine={false}
              axisLine={false}
              width={56}
              label={{ value: "Exceptions", angle: -90, position: "insideLeft", fill: muted, fontSize: 11 }}
            />
            <ReferenceLine x={asOf} stroke={ink} strokeDasharray="3 3" />
            <Tooltip
              formatter={(value) => [String(value), "Counted exceptions"]}
              labelStyle={{ color: ink, fontWeight: 600 }}
              contentStyle={{ fontSize: 12, borderColor: rule, borderRadius: 2 }}
            />
            <Line
              type="stepAfter"
              dataKey="counted"
              name="Counted exceptions"
              stroke={ink}
              strokeWidth={1.5}
              dot={false}
              isAnimationActive={false}
            />
          </LineChart>
        </ResponsiveContainer>
      </div>
    </figure>
  );
}
