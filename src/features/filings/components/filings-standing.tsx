import type { Filing } from "@shared/schemas/filing";
import type { Role } from "@shared/schemas/common";
import { quarterLabel } from "@shared/backtest/quarters";
import { formatDateTime, plural } from "@/lib/format";

/**
 * Where the filings stand: how many, how many wait for acknowledgement, the latest one sent, how
 * many reached only some recipients, and how many still wait for the mail server. A pending pack
 * has reached nobody, so it neither waits for an acknowledgement nor counts as sent (a regulator
 * never receives one; analysts and the CRO do); a partly delivered one reached the supervisor.
 */
export function FilingsStanding({ filings, role }: { filings: Filing[]; role: Role }) {
  const sent = filings.filter((f) => f.delivery !== "pending");
  const pending = filings.length - sent.length;
  const partial = filings.filter((f) => f.delivery === "partial").length;
  const waiting = sent.filter((f) => f.acknowledgedAt === null).length;
  // The newest by the time the mail server took it: a pack that waited goes out after later ones.
  const latest = sent.reduce<Filing | undefined>(
    (a, f) => (!a || (f.sentAt ?? "") > (a.sentAt ?? "") ? f : a),
    undefined,
  );
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
        <dd data-testid="filings-latest-sent">
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
      {partial > 0 && role !== "regulator" && (
        <div>
          <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">Partly delivered</dt>
          <dd className="figures font-medium" data-testid="filings-partial">
            {plural(partial, "pack", "packs")} not yet with every recipient
          </dd>
        </div>
      )}
      {pending > 0 && (
        <div>
          <dt className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">Not sent yet</dt>
          <dd className="figures font-medium" data-testid="filings-pending">
            {pending} waiting for the mail server
          </dd>
        </div>
      )}
    </dl>
  );
}
