import { Link } from "react-router-dom";
import type { Filing } from "@shared/schemas/filing";
import type { Role } from "@shared/schemas/common";
import { quarterLabel, quarterStart } from "@shared/backtest/quarters";
import { DownloadButton } from "@/components/ui/download-button";
import { Figure } from "@/components/ui/figure";
import { FullHash } from "@/components/ui/hash";
import { Notice } from "@/components/ui/notice";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { formatDateTime, formatFactor } from "@/lib/format";
import { filingPackHref } from "../api/filing-queries";
import { AcknowledgeReceipt } from "./acknowledge-receipt";
import { FilingDelivery } from "./filing-delivery";
import { HeldFileCheck } from "./held-file-check";
import { ServerCopyCheck } from "./server-copy-check";
import { PersonName } from "@/lib/people";

/**
 * The original and its amendment, linked both ways with both snapshots' hashes (docs/api.md#amendments).
 * `other` is the linked filing when the reader's list holds it (an amendment not yet filed has none).
 */
function AmendmentLink({
  filing,
  other,
  filingHref,
}: {
  filing: Filing;
  other?: Filing;
  filingHref: (id: number) => string;
}) {
  const amends = filing.amends !== null;
  const otherSnapshot = amends ? filing.amends : filing.amendedBy;
  return (
    <section aria-label={amends ? "Amendment of an earlier filing" : "Amended"} className="flex flex-col gap-2">
      <Notice>
        {amends ? (
          <>
            <strong className="font-semibold">Amendment.</strong> This pack amends the filing of snapshot #
            {otherSnapshot}
            {other && (
              <>
                {" "}
                (<Link to={filingHref(other.id)}>filing #{other.id}</Link>
                {other.sentAt ? `, sent ${formatDateTime(other.sentAt)}` : ""})
              </>
            )}
            , after data inside the quarter was restated. The original stands unchanged.
          </>
        ) : (
          <>
            <strong className="font-semibold">Amended.</strong> Snapshot #{otherSnapshot} amends this filing
            {other ? (
              <>
                {": "}
                <Link to={filingHref(other.id)}>filing #{other.id}</Link>
                {other.sentAt ? `, sent ${formatDateTime(other.sentAt)}` : ""}.
              </>
            ) : (
              "; it is not filed yet."
            )}{" "}
            This pack stands as it was sent.
          </>
        )}
      </Notice>
      <dl className="grid gap-3 sm:grid-cols-2">
        <Figure label={amends ? "This amendment's snapshot hash" : "This filing's snapshot hash"}>
          {filing.snapshotHash ? <FullHash value={filing.snapshotHash} /> : "—"}
        </Figure>
        <Figure label={amends ? "Original snapshot hash" : "The amendment's snapshot hash"}>
          {other?.snapshotHash ? <FullHash value={other.snapshotHash} /> : "Not filed yet"}
        </Figure>
      </dl>
    </section>
  );
}

/** One filing: what was sent to whom, the pack and its SHA-256, the checks, and the receipt. */
export function FilingDetail({
  filing,
  role,
  regime,
  related,
  filingHref,
}: {
  filing: Filing;
  role: Role;
  regime?: string;
  /** The filing this one amends, or the one that amends it, when the list holds it. */
  related?: Filing;
  filingHref?: (id: number) => string;
}) {
  const quarter = quarterLabel(filing.quarterEnd);
  return (
    <section aria-labelledby="filing-title" className="flex flex-col gap-5 border-t border-rule pt-4">
      <header className="flex flex-col gap-0.5">
        <h2 id="filing-title">
          {filing.entity} {quarter} <span className="font-normal text-ink-muted">· {filing.entityName}</span>
        </h2>
        <p className="text-sm text-ink-soft">
          Quarter <span className="figures">{quarterStart(filing.quarterEnd)}</span> to{" "}
          <span className="figures">{filing.quarterEnd}</span> · sent by <PersonName email={filing.sentBy} />{" "}
          {filing.sentAt ? (
            <>
              on <span className="figures">{formatDateTime(filing.sentAt)}</span>
            </>
          ) : (
            "(waiting for the mail server)"
          )}{" "}
          to {filing.recipients.join(", ")}
        </p>
      </header>
      {filingHref && (filing.amends !== null || filing.amendedBy !== null) && (
        <AmendmentLink filing={filing} other={related} filingHref={filingHref} />
      )}
      <dl className="grid grid-cols-2 gap-x-6 gap-y-3 border-y border-rule py-3 sm:grid-cols-4">
        <Figure label="Traffic-light zone">
          <ZoneBadge zone={filing.zone} regime={regime} className="text-sm" />
        </Figure>
        <Figure label="Counted exceptions">{filing.counted}</Figure>
        <Figure label="Multiplier">{formatFactor(filing.multiplier)}</Figure>
        {/* Written out in full: a supervisor compares it character by character with the file they hold. */}
        <Figure label="Pack SHA-256" hint="of the PDF exactly as sent" className="col-span-2 sm:col-span-4">
          <span data-testid="filing-sha256">
            <FullHash value={filing.sha256} />
          </span>
        </Figure>
      </dl>
      {(role === "analyst" || role === "cro") && <FilingDelivery filing={filing} role={role} />}
      <DownloadButton
        href={filingPackHref(filing.id)}
        fallbackName={filing.fileName}
        note={<span className="figures text-xs text-ink-muted">{filing.fileName}, byte for byte as it was sent</span>}
      >
        Download the pack (PDF)
      </DownloadButton>
      <div className="grid gap-6 lg:grid-cols-3">
        <AcknowledgeReceipt filing={filing} role={role} />
        <ServerCopyCheck key={`server-${filing.id}`} filing={filing} />
        <HeldFileCheck key={`held-${filing.id}`} filing={filing} />
      </div>
    </section>
  );
}
