import type { SettingsRecord } from "@shared/schemas/determination";
import { settingsOn } from "@shared/backtest/determination";
import { pnlBasisLabels } from "@/lib/regime-labels";
import { formatFactor } from "@/lib/format";

export const statusLabels: Record<SettingsRecord["status"], string> = {
  proposed: "Proposed",
  approved: "Approved",
  rejected: "Rejected",
};

export const frequencyLabels = { quarterly: "Quarterly", monthly: "Monthly" } as const;

type Values = Pick<
  SettingsRecord,
  "pnlBasis" | "qualitativeAddend" | "qualitativeAddendSvar" | "multiplierFloor" | "determinationFrequency"
>;

const floorWords = (v: number | null) => (v === null ? "no floor" : `a floor of ${formatFactor(v)}`);
const svarWords = (v: number | null) => (v === null ? "the VaR addend" : formatFactor(v));

/** A record's values in one line: "Actual P&L · addend 0.50 · no floor · quarterly". */
export function settingsSummary(v: Values): string {
  return [
    pnlBasisLabels[v.pnlBasis],
    `addend ${formatFactor(v.qualitativeAddend)}`,
    ...(v.qualitativeAddendSvar === null ? [] : [`stressed VaR addend ${formatFactor(v.qualitativeAddendSvar)}`]),
    floorWords(v.multiplierFloor),
    frequencyLabels[v.determinationFrequency].toLowerCase(),
  ].join(" · ");
}

/** The approved record in force on a date among the entity's records (the one a proposal would follow). */
export function inForceOn(records: readonly SettingsRecord[], date: string): SettingsRecord | null {
  return settingsOn(
    records.filter((r) => r.status === "approved"),
    date,
  );
}

/**
 * What approving a proposal does, in the words of the consequence:
 * "From 2026-08-03 the multiplier of LKS-EU will include a qualitative addend of 0.50 instead of 0.00."
 */
export function consequenceOf(record: SettingsRecord, before: Values | null, entity: string): string {
  const changes: string[] = [];
  const b = before;
  if (!b || record.qualitativeAddend !== b.qualitativeAddend)
    changes.push(
      `include a qualitative addend of ${formatFactor(record.qualitativeAddend)}${b ? ` instead of ${formatFactor(b.qualitativeAddend)}` : ""}`,
    );
  if (b ? record.qualitativeAddendSvar !== b.qualitativeAddendSvar : record.qualitativeAddendSvar !== null)
    changes.push(
      `apply ${svarWords(record.qualitativeAddendSvar)} to stressed VaR${b ? ` instead of ${svarWords(b.qualitativeAddendSvar)}` : ""}`,
    );
  if (!b || record.multiplierFloor !== b.multiplierFloor)
    changes.push(
      record.multiplierFloor === null
        ? `have no floor${b ? ` instead of ${floorWords(b.multiplierFloor)}` : ""}`
        : `not go below ${formatFactor(record.multiplierFloor)}${b ? ` (now ${floorWords(b.multiplierFloor)})` : ""}`,
    );
  if (!b || record.pnlBasis !== b.pnlBasis)
    changes.push(
      `count exceptions on ${pnlBasisLabels[record.pnlBasis]}${b ? ` instead of ${pnlBasisLabels[b.pnlBasis]}` : ""}`,
    );
  if (!b || record.determinationFrequency !== b.determinationFrequency)
    changes.push(`be determined ${record.determinationFrequency}${b ? ` instead of ${b.determinationFrequency}` : ""}`);
  if (changes.length === 0) return `From ${record.effectiveFrom} the multiplier of ${entity} stays as it is.`;
  return `From ${record.effectiveFrom} the multiplier of ${entity} will ${changes.join("; ")}. Figures before that day do not change.`;
}
