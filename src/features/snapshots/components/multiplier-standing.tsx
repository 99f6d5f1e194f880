import type { CapitalOnDate, DeterminationDto } from "@shared/schemas/determination";
import { MultiplierInForce } from "@/components/ui/multiplier-in-force";
import { inForceSince, periodLabel } from "@/lib/determination-words";

const today = () => new Date().toISOString().slice(0, 10);

/**
 * The entity's multiplier in force today beside the indicative one (the reporting office and the
 * CRO), or for treasury, which reads signed-off figures only, the latest signed-off determination
 * and whether it is still the one in force.
 */
export function MultiplierStanding({
  regime,
  capital,
  signedOff,
}: {
  regime: string;
  /** Capital today (analyst, CRO). */
  capital?: CapitalOnDate;
  /** The signed-off determinations, oldest first (treasury). */
  signedOff?: DeterminationDto[];
}) {
  if (capital) {
    return (
      <MultiplierInForce
        inForce={capital.inForce}
        indicative={capital.indicative}
        indicativeOn="today"
        regime={regime}
        look="plain"
        testId="quarters-multiplier"
      />
    );
  }
  if (!signedOff) return null;
  const last = signedOff[signedOff.length - 1];
  if (!last)
    return (
      <p className="text-sm text-ink-muted">No determination is signed off yet, so no multiplier in force is shown.</p>
    );
  const stillInForce = last.effectiveTo === null || last.effectiveTo >= today();
  if (stillInForce)
    return (
      <MultiplierInForce
        inForce={last}
        indicativeOn="today"
        regime={regime}
        look="plain"
        testId="quarters-multiplier"
      />
    );
  return (
    <p className="text-sm text-ink-soft" data-testid="quarters-multiplier-in-force">
      The latest signed-off determination ({periodLabel(last.quarterEnd)}, multiplier {last.multiplier.toFixed(2)}) was{" "}
      {inForceSince(last)} until {last.effectiveTo}; the one in force now is not signed off yet.
    </p>
  );
}

/** "In force from 2026-10-01 until the next determination (Q3 2026, approved)": a quarter's own determination. */
export function determinationSpan(d: DeterminationDto): string {
  const until = d.effectiveTo ? `to ${d.effectiveTo}` : "until the next determination";
  return `in force from ${d.effectiveFrom} ${until} (${periodLabel(d.quarterEnd)}, ${d.status})`;
}
