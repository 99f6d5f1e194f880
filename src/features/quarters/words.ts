import type { SnapshotEvent, SnapshotStatus } from "@shared/schemas/snapshot";
import { formatDecimal } from "@/lib/format";

/** Where a snapshot stands, in our own words. */
export const snapshotStatusLabels: Record<SnapshotStatus, string> = {
  draft: "Draft",
  submitted: "Submitted for sign-off",
  approved: "Approved",
  returned: "Returned",
  filed: "Filed",
};

/** What happened to a snapshot, for its history. */
export const snapshotEventLabels: Record<SnapshotEvent["action"], string> = {
  prepared: "Prepared",
  recomputed: "Prepared again",
  submitted: "Submitted for sign-off",
  approved: "Approved",
  returned: "Returned",
  filed: "Filed with the supervisor",
  restated: "Input day restated",
};

/** An amount in whole currency units with thousands separators, e.g. "−1,204,330 EUR". */
export function formatAmount(value: number | null | undefined, currency?: string): string {
  if (value === null || value === undefined) return "—";
  const digits = Math.abs(value).toLocaleString("en-GB", { maximumFractionDigits: 0 });
  const sign = Math.round(value) < 0 ? "−" : "";
  return currency ? `${sign}${digits} ${currency}` : `${sign}${digits}`;
}

/** Plus factor, addend and multiplier as the rules print them: two places. */
export function formatFactor(value: number): string {
  return formatDecimal(value, 2);
}

/** A probability as a percentage with two places: 0.99237 → "99.24%". */
export function formatPercent(p: number): string {
  return `${formatDecimal(p * 100, 2)}%`;
}

/** The first twelve hex digits: enough to tell two hashes apart at a glance (the whole one is in the title). */
export function shortHash(hash: string): string {
  return hash.length > 12 ? `${hash.slice(0, 12)}…` : hash;
}

export function plural(n: number, one: string, many: string): string {
  return `${n.toLocaleString("en-GB")} ${n === 1 ? one : many}`;
}
