import { CartesianGrid, Line, LineChart, ReferenceArea, ReferenceLine, Tooltip, XAxis, YAxis } from "recharts";
import type { RollingRowDto } from "@shared/schemas/backtest";
import type { RegimeId } from "@shared/schemas/common";
import { zoneBoundariesFor } from "@shared/backtest/regimes";
import { ChartFigure, chartLook } from "@/components/ui/chart-frame";
import { DatedFiguresDisclosure } from "@/components/ui/figures-disclosure";
import { Td } from "@/components/ui/table";
import { zoneName } from "@/components/ui/zone-badge";
import { chartColours } from "@/styles/palette";

const { ink, label: muted, zone: bands } = chartColours;

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
  const b = zoneBoundariesFor(regime);
  const top = Math.max(b.redFrom + 3, ...rows.map((r) => r.counted + 1));
  const current = rows.find((r) => r.date === asOf);
  const provisionalUntil = rows.filter((r) => !r.complete).at(-1)?.date;
  const band = (zone: "green" | "yellow" | "red") => `${zoneName(zone, regime)} zone`;
  // Each zone's band of counts, from the boundary below it to the one above, half a count either side.
  const zoneBands = [
    { zone: "green", y1: 0, y2: b.yellowFrom - 0.5, opacity: 0.09 },
    { zone: "yellow", y1: b.yellowFrom - 0.5, y2: b.redFrom - 0.5, opacity: 0.1 },
    { zone: "red", y1: b.redFrom - 0.5, y2: top, opacity: 0.08 },
  ] as const;

  return (
    <ChartFigure
      caption={
        <>
          Counted exceptions in the trailing window, over the whole history
          <span className="ml-2 text-xs font-normal text-ink-muted">dashed line: as of {asOf}</span>
        </>
      }
      summary={
        <>
          {rows.length} dates from {rows[0]?.date ?? "—"} to {rows.at(-1)?.date ?? "—"}. {band("green")} below{" "}
          {b.yellowFrom}, {band("yellow")} from {b.yellowFrom}, {band("red")} from {b.redFrom} exceptions.
          {current ? ` On ${asOf}: ${current.counted} counted, ${zoneName(current.zone, regime)} zone.` : ""}
        </>
      }
      height={220}
      width={width}
      chart={
        <LineChart data={rows} margin={{ top: 22, right: 16, bottom: 18, left: 8 }}>
          {zoneBands.map(({ zone, y1, y2, opacity }) => (
            <ReferenceArea
              key={zone}
              y1={y1}
              y2={y2}
              fill={bands[zone]}
              fillOpacity={opacity}
              stroke="none"
              ifOverflow="hidden"
              label={{ value: band(zone), position: "insideTopRight", fill: bands[zone], fontSize: 11 }}
            />
          ))}
          <CartesianGrid {...chartLook.grid} />
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
          <XAxis dataKey="date" {...chartLook.xAxis("As-of date")} minTickGap={56} />
          <YAxis domain={[0, top]} allowDecimals={false} {...chartLook.yAxis("Exceptions", 56)} />
          <ReferenceLine x={asOf} stroke={ink} strokeDasharray="3 3" />
          <Tooltip formatter={(value) => [String(value), "Counted exceptions"]} {...chartLook.tooltip} />
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
      }
    >
      <DatedFiguresDisclosure
        label="Counted exceptions on each date"
        caption="Counted exceptions in the trailing window on each as-of date, oldest first"
        columns={[
          "As-of date",
          { numeric: "Actual P&L exceptions" },
          { numeric: "Hypothetical P&L exceptions" },
          { numeric: "Counted" },
          "Zone",
        ]}
        rows={rows}
        cells={(r) => (
          <>
            <Td numeric>{r.actual}</Td>
            <Td numeric>{r.hypothetical}</Td>
            <Td numeric>{r.counted}</Td>
            <Td>
              {zoneName(r.zone, regime)}
              {!r.complete && " (provisional: short window)"}
            </Td>
          </>
        )}
      />
    </ChartFigure>
  );
}
