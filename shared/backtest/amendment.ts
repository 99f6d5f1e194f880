import type { AmendmentChange, AmendmentException, SnapshotException, SnapshotFigures } from "../schemas/snapshot";
import { returnData } from "./return-data";

/**
 * What an amendment changes (docs/rules.md#amendments): the filed snapshot's frozen figures against
 * the figures recomputed on the current data, field by field. Only what differs is listed; the
 * capital impact is the requirement after minus before. Pure: the server freezes the result with
 * the amendment when it is prepared, and every reader reads what was frozen.
 */

type Value = number | string | null;

/** Amounts are compared to the cent, factors and counts exactly. */
const same = (a: Value, b: Value) =>
  typeof a === "number" && typeof b === "number" ? Math.round(a * 100) === Math.round(b * 100) : a === b;

const HEADLINE: {
  key: string;
  label: string;
  unit: AmendmentChange["unit"];
  of: (f: SnapshotFigures) => Value;
}[] = [
  { key: "asOf", label: "Determined on", unit: "text", of: (f) => f.asOf },
  { key: "observations", label: "Observations in the window", unit: "count", of: (f) => f.window.observations },
  { key: "actual", label: "Exceptions on actual P&L", unit: "count", of: (f) => f.exceptions.actual },
  { key: "hypothetical", label: "Exceptions on hypothetical P&L", unit: "count", of: (f) => f.exceptions.hypothetical },
  { key: "excluded", label: "Exceptions disregarded", unit: "count", of: (f) => f.exceptions.excluded },
  { key: "counted", label: "Counted exceptions", unit: "count", of: (f) => f.exceptions.counted },
  { key: "zone", label: "Traffic-light zone", unit: "text", of: (f) => f.zone },
  { key: "plusFactor", label: "Plus factor", unit: "factor", of: (f) => f.plusFactor },
  { key: "multiplier", label: "Multiplier m_c", unit: "factor", of: (f) => f.multiplier },
  { key: "multiplierSvar", label: "Stressed multiplier m_s", unit: "factor", of: (f) => f.multiplierSvar ?? null },
  { key: "capital", label: "Capital requirement", unit: "amount", of: (f) => f.capital },
  { key: "addOn", label: "Of which the plus factor adds", unit: "amount", of: (f) => f.addOn },
];

export function headlineChanges(before: SnapshotFigures, after: SnapshotFigures): AmendmentChange[] {
  return HEADLINE.filter((h) => !same(h.of(before), h.of(after))).map((h) => ({
    key: h.key,
    label: h.label,
    group: "headline" as const,
    unit: h.unit,
    before: h.of(before),
    after: h.of(after),
  }));
}

/** The return-data fields whose value differs (a field present on one side only counts as changed). */
export function returnChanges(before: SnapshotFigures, after: SnapshotFigures, quarterEnd: string): AmendmentChange[] {
  const was = new Map(returnData(before, quarterEnd).fields.map((f) => [f.key, f]));
  const now = returnData(after, quarterEnd).fields;
  const keys = [...now.map((f) => f.key), ...[...was.keys()].filter((k) => !now.some((f) => f.key === k))];
  return keys.flatMap((key) => {
    const b = was.get(key);
    const a = now.find((f) => f.key === key);
    const field = (a ?? b)!;
    const bv = b?.value ?? null;
    const av = a?.value ?? null;
    if (same(bv, av)) return [];
    return [
      {
        key,
        label: field.label,
        group: "return" as const,
        ...(field.templateRow ? { templateRow: field.templateRow } : {}),
        unit: field.unit,
        before: bv,
        after: av,
      },
    ];
  });
}

const money = (v: number | null) =>
  v === null ? "none" : v.toLocaleString("en-GB", { minimumFractionDigits: 0, maximumFractionDigits: 2 });

/** One exception in words: its amounts and on which P&L it counts. */
function onWhat(e: SnapshotException): string {
  const on = [e.actual ? "actual" : null, e.hypothetical ? "hypothetical" : null].filter(Boolean).join(" and ");
  return `on ${on} P&L${e.excluded ? " (excluded)" : ""}`;
}

/** The exceptions of the window the amendment added, removed or changed, by date. */
export function exceptionChanges(before: SnapshotFigures, after: SnapshotFigures): AmendmentException[] {
  const detailOf = (f: SnapshotFigures): Map<string, SnapshotException | null> =>
    new Map(
      f.exceptionDetail
        ? f.exceptionDetail.map((e) => [e.date, e])
        : f.exceptionDates.map((d): [string, SnapshotException | null] => [d, null]),
    );
  const was = detailOf(before);
  const now = detailOf(after);
  const dates = [...new Set([...was.keys(), ...now.keys()])].sort();
  const out: AmendmentException[] = [];
  for (const date of dates) {
    const b = was.get(date);
    const a = now.get(date);
    if (b === undefined && a !== undefined) {
      out.push({
        date,
        change: "added",
        detail: a
          ? `New exception ${onWhat(a)}: actual P&L ${money(a.actualPnl)}, hypothetical ${money(a.hypotheticalPnl)}, VaR ${money(a.var99)}.`
          : "New exception.",
      });
    } else if (b !== undefined && a === undefined) {
      out.push({ date, change: "removed", detail: "No longer an exception after the restatement." });
    } else if (a && b) {
      const parts: string[] = [];
      const amounts: [string, number | null, number | null][] = [
        ["actual P&L", b.actualPnl, a.actualPnl],
        ["hypothetical P&L", b.hypotheticalPnl, a.hypotheticalPnl],
        ["VaR", b.var99, a.var99],
      ];
      for (const [label, x, y] of amounts) if (!same(x, y)) parts.push(`${label} ${money(x)} → ${money(y)}`);
      if (onWhat(a) !== onWhat(b)) parts.push(`counted ${onWhat(b)} → ${onWhat(a)}`);
      if (parts.length) out.push({ date, change: "changed", detail: `${parts.join("; ")}.` });
    }
  }
  return out;
}

/** Everything an amendment changes, and its capital impact (after − before). */
export function amendmentChanges(before: SnapshotFigures, after: SnapshotFigures, quarterEnd: string) {
  const change = before.capital !== null && after.capital !== null ? after.capital - before.capital : null;
  return {
    changes: [...headlineChanges(before, after), ...returnChanges(before, after, quarterEnd)],
    exceptions: exceptionChanges(before, after),
    capitalImpact: {
      before: before.capital,
      after: after.capital,
      change: change === null ? null : Math.round(change * 100) / 100,
      currency: after.currency,
    },
  };
}
