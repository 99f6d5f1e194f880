import { cn } from "@/lib/cn";

export type Zone = "green" | "yellow" | "amber" | "red";

/** The zone's name as the rules write it: FRTB says amber where the others say yellow. */
export function zoneName(zone: Zone, regime?: string): string {
  if (zone === "green") return "Green";
  if (zone === "red") return "Red";
  return zone === "amber" || regime === "frtb" ? "Amber" : "Yellow";
}

const styles: Record<"green" | "yellow" | "red", { box: string; mark: string }> = {
  green: { box: "bg-zone-green-soft text-zone-green border-zone-green/40", mark: "rounded-full" },
  yellow: { box: "bg-zone-yellow-soft text-zone-yellow border-zone-yellow/40", mark: "rotate-45" },
  red: { box: "bg-zone-red-soft text-zone-red border-zone-red/40", mark: "" },
};

/**
 * A traffic-light zone, always written out: the name is the meaning, the colour only repeats it.
 * The marker shape differs per zone too (circle, diamond, square) for readers who cannot tell the colours apart.
 */
export function ZoneBadge({
  zone,
  regime,
  provisional,
  className,
}: {
  zone: Zone;
  regime?: string;
  provisional?: boolean;
  className?: string;
}) {
  const key = zone === "amber" ? "yellow" : zone;
  const s = styles[key];
  const name = zoneName(zone, regime);
  return (
    <span
      className={cn(
        "inline-flex items-center gap-1.5 rounded-sm border px-1.5 py-px text-xs font-medium",
        s.box,
        className,
      )}
      data-zone={key}
    >
      <span aria-hidden="true" className={cn("inline-block size-1.5 bg-current", s.mark)} />
      {name}
      {provisional && <span className="font-normal">(provisional)</span>}
    </span>
  );
}
