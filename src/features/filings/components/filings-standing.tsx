import type { Filing } from "@shared/schemas/filing";
import type { Role } from "@shared/schemas/common";
import { quarterLabel } from "@shared/schemas/snapshot";
import { formatDateTime, plural } from "@/lib/format";

/** Where the filings stand: how many, how many wait for acknowledgement, and the latest one sent. */
export function FilingsStanding({ filings, role }: { filings: Filing[]; role: Role }) {
  const waiting = filings.filter((f) => f.acknowledgedAt === null).length;
  const latest = filings[0];
  return (
    <dl className="flex flex-wrap gap-x-10 gap-y-2 text-sm" aria-label="Where the filings stand">
      <div>
        <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">Filings</dt>
        <dd className="figures font-medium" data-testid="filings-count">
          {plural(filings.length, "pack", "packs")}
        </dd>
      </div>
      <div>
        <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">
          {role === "regulator" ? "Waiting for your acknowledgement" : "Waiting for acknowledgement"}
        </dt>
        <dd className="figures" data-testid="filings-waiting">
          {waiting > 0 ? <span className="font-medium">{plural(waiting, "pack", "packs")}</span> : "None"}
        </dd>
      </div>
      <div>
        <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">Latest sent</dt>
        <dd>
          {latest ? (
            <>
              <span className="font-medium">
                {latest.entity} {quarterLabel(latest.quarterEnd)}
              </span>{" "}
              · <span className="figures">{formatDateTime(latest.sentAt)}</span>
            </>
          ) : (
            <span className="text-ink-muted">None yet</span>
          )}
        </dd>
      </div>
    </dl>
  );
}
