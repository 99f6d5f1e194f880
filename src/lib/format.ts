const dateTime = new Intl.DateTimeFormat("en-GB", {
  year: "numeric",
  month: "short",
  day: "2-digit",
  hour: "2-digit",
  minute: "2-digit",
  timeZone: "UTC",
});

/** A timestamp as "05 Mar 2026, 14:07 UTC"; the office works across time zones, so UTC is stated. */
export function formatDateTime(iso: string | null | undefined): string {
  if (!iso) return "—";
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${dateTime.format(d)} UTC`;
}

const weekday = new Intl.DateTimeFormat("en-GB", { weekday: "short", timeZone: "UTC" });

/** A business date stays as ISO YYYY-MM-DD (the format of uploads and packs), with its weekday. */
export function formatBusinessDate(iso: string): string {
  const d = new Date(`${iso}T00:00:00Z`);
  if (Number.isNaN(d.getTime())) return iso;
  return `${iso} (${weekday.format(d)})`;
}

/** A decimal figure with a fixed number of places, thousands separators and a true minus sign: −1,250.50. */
export function formatDecimal(value: number, places = 2): string {
  return value
    .toLocaleString("en-GB", { minimumFractionDigits: places, maximumFractionDigits: places })
    .replace("-", "−");
}

/** A count with thousands separators: 12,480. */
export function formatCount(n: number): string {
  return n.toLocaleString("en-GB");
}

/** A file size in the unit people read it in: 812 bytes, 48.2 kB, 6.1 MB. */
export function formatBytes(bytes: number): string {
  if (bytes < 1000) return `${formatCount(bytes)} bytes`;
  if (bytes < 1_000_000) return `${(bytes / 1000).toLocaleString("en-GB", { maximumFractionDigits: 1 })} kB`;
  return `${(bytes / 1_000_000).toLocaleString("en-GB", { minimumFractionDigits: 1, maximumFractionDigits: 1 })} MB`;
}

/** A count and its noun: "1 observation", "250 observations". */
export function plural(n: number, one: string, many: string): string {
  return `${formatCount(n)} ${n === 1 ? one : many}`;
}

/** An amount in whole currency units with thousands separators, e.g. "−1,204,330 EUR". */
export function formatAmount(value: number | null | undefined, currency?: string): string {
  if (value === null || value === undefined) return "—";
  const digits = Math.abs(value).toLocaleString("en-GB", { maximumFractionDigits: 0 });
  const sign = Math.round(value) < 0 ? "−" : "";
  return currency ? `${sign}${digits} ${currency}` : `${sign}${digits}`;
}

/** Axis ticks in thousands or millions so the axis stays narrow: 1.2m, −350k. */
export function compactAmount(v: number): string {
  const a = Math.abs(v);
  const sign = v < 0 ? "−" : "";
  if (a >= 1_000_000) return `${sign}${(a / 1_000_000).toLocaleString("en-GB", { maximumFractionDigits: 1 })}m`;
  if (a >= 1_000) return `${sign}${(a / 1_000).toLocaleString("en-GB", { maximumFractionDigits: 0 })}k`;
  return `${sign}${a.toLocaleString("en-GB", { maximumFractionDigits: 0 })}`;
}

/** Plus factor, qualitative addend and multiplier as the rules print them: two places. */
export function formatFactor(value: number | null | undefined): string {
  if (value === null || value === undefined) return "—";
  return formatDecimal(value, 2);
}

/** A probability as a percentage with two places: 0.99237 → "99.24%". */
export function formatPercent(p: number): string {
  return `${formatDecimal(p * 100, 2)}%`;
}

/**
 * A chance as a percentage, never rounded to a certainty it is not: strictly between 0 and 0.01%
 * reads "< 0.01%", strictly between 99.99% and 100% reads "> 99.99%"; 0 and 1 stay 0.00% and 100.00%.
 */
export function formatChance(p: number): string {
  if (p > 0 && p < 0.0001) return "< 0.01%";
  if (p > 0.9999 && p < 1) return "> 99.99%";
  return formatPercent(p);
}

/** A change with its sign written out: "+0.35", "−12,400 EUR"; what rounds to nothing stays unsigned ("0.00"). */
export function formatChange(value: number, format: (v: number) => string): string {
  const text = format(Math.abs(value));
  if (/^[0.,]+(\s|$)/.test(text)) return text;
  return `${value < 0 ? "−" : "+"}${text}`;
}

/** Compact JSON for audit before/after values. */
export function compactJson(value: unknown): string {
  if (value === null || value === undefined) return "—";
  try {
    return JSON.stringify(value);
  } catch {
    return String(value);
  }
}

/** The first twelve hex digits: enough to tell two hashes apart at a glance (show the whole one on hover). */
export function shortHash(hash: string): string {
  return hash.length > 12 ? `${hash.slice(0, 12)}…` : hash;
}
