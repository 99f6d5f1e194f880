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

/** A decimal figure with a fixed number of places and thousands separators. */
export function formatDecimal(value: number, places = 2): string {
  return value.toLocaleString("en-GB", { minimumFractionDigits: places, maximumFractionDigits: places });
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
