import { useId, type ReactElement, type ReactNode } from "react";
import { ResponsiveContainer } from "recharts";
import { chartColours } from "@/styles/palette";

const { ink, label: muted, grid: rule } = chartColours;
const tick = { fill: muted, fontSize: 11 };

/**
 * The house look of a chart's parts. SVG attributes take no classes, so each is spread into its
 * recharts element: `<CartesianGrid {...chartLook.grid} />`.
 */
export const chartLook = {
  /** Horizontal hairlines behind the drawing. */
  grid: { stroke: rule, strokeDasharray: "2 3", vertical: false },
  /** The horizontal axis, named below the drawing. */
  xAxis: (name: string) =>
    ({
      tick,
      tickLine: false,
      axisLine: { stroke: rule },
      label: { value: name, position: "insideBottom", offset: -10, fill: muted, fontSize: 11 },
    }) as const,
  /** A vertical axis `width` pixels wide, named along its side (the right one for a second axis). */
  yAxis: (name: string, width: number, side: "left" | "right" = "left") =>
    ({
      tick,
      tickLine: false,
      axisLine: false,
      width,
      label: {
        value: name,
        angle: side === "left" ? -90 : 90,
        position: side === "left" ? "insideLeft" : "insideRight",
        fill: muted,
        fontSize: 11,
      },
    }) as const,
  /** The hovered point's box. */
  tooltip: {
    labelStyle: { color: ink, fontWeight: 600 },
    contentStyle: { fontSize: 12, borderColor: rule, borderRadius: 2 },
  },
} as const;

/**
 * A chart as a figure: named by its caption (beside it `captionAside`, such as a switch of series),
 * described in words by `summary`, the drawing `height` pixels high across the width (`width` in
 * tests, which lay nothing out; `initialWidth` before the first measure). Its key and its figures as
 * a table follow as children.
 */
export function ChartFigure({
  caption,
  captionAside,
  summary,
  height,
  width,
  initialWidth = 960,
  chart,
  children,
}: {
  caption: ReactNode;
  captionAside?: ReactNode;
  summary: ReactNode;
  height: number;
  width?: number;
  initialWidth?: number;
  chart: ReactElement;
  children?: ReactNode;
}) {
  const titleId = useId();
  const summaryId = useId();
  const figcaption = (
    <figcaption id={titleId} className="text-sm font-medium text-ink">
      {caption}
    </figcaption>
  );
  return (
    <figure aria-labelledby={titleId} aria-describedby={summaryId} className="flex flex-col gap-2">
      {captionAside ? (
        <div className="flex flex-wrap items-baseline justify-between gap-3">
          {figcaption}
          {captionAside}
        </div>
      ) : (
        figcaption
      )}
      <p id={summaryId} className="text-xs text-ink-muted">
        {summary}
      </p>
      <div style={{ height }} className="w-full">
        <ResponsiveContainer
          width={width ?? "100%"}
          height={height}
          initialDimension={{ width: width ?? initialWidth, height }}
        >
          {chart}
        </ResponsiveContainer>
      </div>
      {children}
    </figure>
  );
}

/** The key to a chart's marks, in words beside a sample of each. */
export function ChartKey({ children }: { children: ReactNode }) {
  return (
    <ul className="flex flex-wrap gap-x-5 gap-y-1 text-xs text-ink-soft" aria-label="Chart key">
      {children}
    </ul>
  );
}

/** One entry of a chart's key: `sample` (marked aria-hidden by the caller) and what it stands for. */
export function KeyItem({ sample, children }: { sample: ReactNode; children: ReactNode }) {
  return (
    <li className="flex items-center gap-1.5">
      {sample} {children}
    </li>
  );
}
