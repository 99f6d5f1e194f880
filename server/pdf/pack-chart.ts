import type { SnapshotDay, SnapshotException } from "../../shared/schemas/snapshot";
import { ACCENT, INK, MUTED, RULE, WARN, amount, type PackLayout } from "./pack-layout";

/** Round steps for an axis: 1, 2 or 5 times a power of ten, about `count` of them over the range. */
function ticks(min: number, max: number, count = 5): number[] {
  const span = max - min || 1;
  const raw = span / count;
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * power).find((s) => s >= raw)!;
  const out: number[] = [];
  for (let v = Math.ceil(min / step) * step; v <= max + step * 1e-9; v += step) out.push(Math.round(v / step) * step);
  return out;
}

/**
 * The window's daily P&L against the negative of VaR, drawn as vectors: a P&L below the VaR line
 * is a loss beyond VaR. Actual P&L as dots, hypothetical as small squares, VaR as a line, exception
 * days ringed. The key figures go in a line under the title.
 */
export function drawPnlVarChart(
  layout: PackLayout,
  days: readonly SnapshotDay[],
  exceptions: readonly SnapshotException[],
  currency: string,
) {
  const { doc, left, width } = layout;
  const plotted = days.filter((d) => d.var99 !== null || d.actual !== null || d.hypothetical !== null);
  if (plotted.length < 2) {
    layout.paragraph("Fewer than two days with data in the window: no chart.", { colour: MUTED });
    return;
  }
  const height = 190;
  layout.room(height + 70);
  const values = plotted.flatMap((d) => [d.actual, d.hypothetical, d.var99 === null ? null : -d.var99]);
  const present = values.filter((v): v is number => v !== null);
  const lo = Math.min(0, ...present);
  const hi = Math.max(0, ...present);
  // Room below the lowest point and above the highest, so no mark sits on the frame or the dates.
  const pad = (hi - lo || 1) * 0.08;
  const yTicks = ticks(lo - pad, hi + pad);
  const yMin = Math.min(lo - pad, yTicks[0]);
  const yMax = Math.max(hi + pad, yTicks[yTicks.length - 1]);
  const axisWidth = 52;
  const x0 = left + axisWidth;
  const plotWidth = width - axisWidth - 4;
  const top = doc.y + 4;
  const y = (v: number) => top + ((yMax - v) / (yMax - yMin || 1)) * height;
  const x = (i: number) => x0 + (i / (plotted.length - 1)) * plotWidth;

  // Grid and the value axis.
  doc.lineWidth(0.4).strokeColor(RULE);
  for (const t of yTicks) {
    doc
      .moveTo(x0, y(t))
      .lineTo(x0 + plotWidth, y(t))
      .stroke();
    doc
      .font("regular")
      .fontSize(7)
      .fillColor(MUTED)
      .text(amount(t), left, y(t) - 3.5, { width: axisWidth - 6, align: "right", lineBreak: false });
  }
  doc
    .lineWidth(0.8)
    .strokeColor(INK)
    .moveTo(x0, y(0))
    .lineTo(x0 + plotWidth, y(0))
    .stroke();

  // −VaR as a line (a gap where VaR is missing).
  doc.lineWidth(1.1).strokeColor(WARN);
  let drawing = false;
  plotted.forEach((d, i) => {
    if (d.var99 === null) {
      drawing = false;
      return;
    }
    if (drawing) doc.lineTo(x(i), y(-d.var99));
    else doc.moveTo(x(i), y(-d.var99));
    drawing = true;
  });
  doc.stroke();

  // Hypothetical P&L as small squares, actual as dots.
  doc.fillColor(ACCENT).fillOpacity(0.55);
  plotted.forEach((d, i) => {
    if (d.hypothetical !== null) doc.rect(x(i) - 1.1, y(d.hypothetical) - 1.1, 2.2, 2.2);
  });
  doc.fill();
  doc.fillColor(INK).fillOpacity(0.85);
  plotted.forEach((d, i) => {
    if (d.actual !== null) doc.circle(x(i), y(d.actual), 1.2);
  });
  doc.fill();
  doc.fillOpacity(1);

  // Exception days ringed.
  const index = new Map(plotted.map((d, i) => [d.date, i]));
  doc.lineWidth(0.9).strokeColor(WARN);
  for (const e of exceptions) {
    const i = index.get(e.date);
    const worst = [e.actualPnl, e.hypotheticalPnl].filter((v): v is number => v !== null);
    if (i === undefined || worst.length === 0) continue;
    doc.circle(x(i), y(Math.min(...worst)), 4.2).stroke();
  }

  // Dates along the bottom: first, quarter points, last.
  doc.font("regular").fontSize(7).fillColor(MUTED);
  const marks = [0, 0.25, 0.5, 0.75, 1].map((f) => Math.round(f * (plotted.length - 1)));
  for (const i of marks) {
    doc.text(plotted[i].date, x(i) - 26, top + height + 4, { width: 52, align: "center", lineBreak: false });
  }

  // The key.
  const keyY = top + height + 18;
  let kx = x0;
  const key = (draw: () => void, label: string) => {
    draw();
    doc
      .font("regular")
      .fontSize(7.5)
      .fillColor(INK)
      .text(label, kx + 12, keyY - 3, { lineBreak: false });
    kx += 12 + doc.widthOfString(label) + 18;
  };
  key(
    () =>
      doc
        .lineWidth(1.1)
        .strokeColor(WARN)
        .moveTo(kx, keyY + 1)
        .lineTo(kx + 9, keyY + 1)
        .stroke(),
    "−VaR (one-day, 99%)",
  );
  key(
    () =>
      doc
        .fillColor(INK)
        .circle(kx + 4, keyY + 1, 1.6)
        .fill(),
    "Actual P&L",
  );
  key(
    () =>
      doc
        .fillColor(ACCENT)
        .rect(kx + 3, keyY, 2.6, 2.6)
        .fill(),
    "Hypothetical P&L",
  );
  key(
    () =>
      doc
        .lineWidth(0.9)
        .strokeColor(WARN)
        .circle(kx + 4, keyY + 1, 3.6)
        .stroke(),
    "Exception",
  );
  doc.x = left;
  doc.y = keyY + 12;
  doc
    .font("regular")
    .fontSize(8)
    .fillColor(MUTED)
    .text(
      `Amounts in ${currency}; ${plotted.length} business days from ${plotted[0].date} to ${plotted.at(-1)!.date}.`,
      left,
      doc.y,
      {
        width,
      },
    );
}
