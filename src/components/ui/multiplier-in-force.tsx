import type { Zone } from "@shared/backtest/types";
import { Figure, type FigureLook } from "./figure";
import { ZoneBadge } from "./zone-badge";
import { formatFactor, plural } from "@/lib/format";
import { inForceSince, type determinationStatusWords } from "@/lib/determination-words";

export interface InForceFigures {
  quarterEnd: string;
  effectiveFrom: string;
  counted: number;
  zone: Zone;
  plusFactor: number;
  multiplier: number;
  status: keyof typeof determinationStatusWords;
}

export interface IndicativeFigures {
  counted: number;
  zone: Zone;
  multiplier: number;
  windowComplete?: boolean;
}

/**
 * The two multipliers side by side, each saying which it is: the one in force (the last
 * determination's, "in force since DATE (Q3 2026, approved)") and the indicative one of the
 * rolling count, as if determined on `indicativeOn`. Zones always carry their name.
 */
export function MultiplierInForce({
  inForce,
  indicative,
  indicativeOn,
  regime,
  look = "ruled",
  testId = "multiplier",
}: {
  inForce: InForceFigures | null;
  /** Left out where the reader sees signed-off figures only. */
  indicative?: IndicativeFigures;
  /** "today" or a date: the indicative figures are as if determined then. */
  indicativeOn: string;
  regime: string;
  look?: FigureLook;
  testId?: string;
}) {
  return (
    <dl className="grid grid-cols-1 gap-x-6 gap-y-3 sm:grid-cols-2" data-testid={`${testId}-pair`}>
      <Figure
        look={look}
        label="Multiplier in force"
        hint={
          inForce
            ? `${inForceSince(inForce)}; ${plural(inForce.counted, "exception", "exceptions")} counted`
            : undefined
        }
      >
        {inForce ? (
          <span className="flex flex-wrap items-center gap-2">
            <span data-testid={`${testId}-in-force`}>{formatFactor(inForce.multiplier)}</span>
            <ZoneBadge zone={inForce.zone} regime={regime} />
          </span>
        ) : (
          <span className="text-sm font-normal text-ink-soft" data-testid={`${testId}-in-force`}>
            None yet: the first determination follows the first quarter end with data
          </span>
        )}
      </Figure>
      {indicative && (
        <Figure
          look={look}
          label={`Indicative if determined ${indicativeOn === "today" ? "today" : `on ${indicativeOn}`}`}
          hint={`from the rolling count: ${plural(indicative.counted, "exception", "exceptions")}`}
        >
          <span className="flex flex-wrap items-center gap-2">
            <span data-testid={`${testId}-indicative`}>{formatFactor(indicative.multiplier)}</span>
            <ZoneBadge zone={indicative.zone} regime={regime} provisional={indicative.windowComplete === false} />
          </span>
        </Figure>
      )}
    </dl>
  );
}
