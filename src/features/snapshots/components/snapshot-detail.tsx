import type { ReactNode } from "react";
import { Link } from "react-router-dom";
import { quarterLabel, quarterStart } from "@shared/backtest/quarters";
import { type Snapshot } from "@shared/schemas/snapshot";
import type { Role } from "@shared/schemas/common";
import type { Filing } from "@shared/schemas/filing";
import type { DeterminationDto } from "@shared/schemas/determination";
import { Notice } from "@/components/ui/notice";
import { formatDateTime, plural } from "@/lib/format";
import { snapshotStatusLabels } from "@/lib/snapshot-status-labels";
import { SnapshotActions } from "./snapshot-actions";
import { SnapshotFigures } from "./snapshot-figures";
import { SnapshotFiling, type FilingLookup } from "./snapshot-filing";
import { SnapshotHistory, SnapshotRecord } from "./snapshot-record";
import { SnapshotReturn } from "./snapshot-return";
import { AmendmentChanges } from "./amendment-changes";
import { PersonName } from "@/lib/people";

/** A day inside the window changed after sign-off: the sealed figures stand, and the reader is told so. */
function RestatedWarning({
  restated,
  snapshotHref,
}: {
  restated: NonNullable<Snapshot["restatedAfterSignOff"]>;
  snapshotHref: (id: number) => string;
}) {
  const resolved = restated.resolvedBy;
  if (resolved)
    return (
      <Notice label="Restatement resolved">
        <strong className="font-semibold">Restatement resolved:</strong> the amendment{" "}
        <Link to={snapshotHref(resolved.snapshotId)}>#{resolved.snapshotId}</Link> corrects this quarter and was filed
        {resolved.filedAt ? ` on ${formatDateTime(resolved.filedAt)}` : ""}. These figures stay as they were filed.
        <span className="mt-0.5 block text-xs text-ink-muted">{restated.detail}</span>
      </Notice>
    );
  return (
    <div
      role="note"
      aria-label="Restated after sign-off"
      className="border-l-2 border-danger bg-danger-soft px-3 py-2 text-sm text-ink"
    >
      <p className="font-semibold">
        A day inside this quarter's window was restated after sign-off: figures stay as approved.
      </p>
      <p className="mt-0.5">{restated.detail}</p>
      <p className="mt-0.5 text-xs text-ink-muted">Restated {formatDateTime(restated.at)}.</p>
    </div>
  );
}

function OpenFindingsNotice({
  count,
  quarter,
  findingsHref,
}: {
  count: number;
  quarter: string;
  findingsHref: string;
}) {
  return (
    <Notice label="Open data-quality findings">
      <strong className="font-semibold">
        {plural(count, "open data-quality finding", "open data-quality findings")} inside {quarter}
      </strong>{" "}
      {count === 1 ? "holds" : "hold"} up its sign-off until each is resolved or explained.{" "}
      <Link to={findingsHref}>Open the findings on the Data screen</Link>
    </Notice>
  );
}

/** One quarter's snapshot: where it stands, the frozen figures, what this reader can do, its pack and filing, and its seal and history. */
export function SnapshotDetail({
  snapshot,
  role,
  userEmail,
  findingsHref,
  onPrepared,
  filing,
  filingHref,
  snapshotHref,
  filingDelivery,
  updating,
  recipients,
  determination,
}: {
  snapshot: Snapshot;
  /** The quarter's determination of the multiplier (its span in force and status). */
  determination?: DeterminationDto;
  role: Role;
  userEmail: string;
  findingsHref: string;
  onPrepared: (s: Snapshot) => void;
  /** A filed snapshot's filing, looked up by the screen. */
  filing: FilingLookup;
  filingHref: (id: number) => string;
  /** Where another snapshot of the entity opens (the one this amends, or its amendment). */
  snapshotHref: (id: number) => string;
  /** Where the filing stands for each recipient, with what the CRO can do about it (from the filings feature). */
  filingDelivery?: (filing: Filing) => ReactNode;
  updating?: boolean;
  /** The entity's supervisor contacts, shown in the filing confirmation before anything is sent. */
  recipients?: { name: string | null; emails: string[] };
}) {
  const quarter = quarterLabel(snapshot.quarterEnd);
  const open = snapshot.status === "draft" || snapshot.status === "submitted";
  return (
    <section aria-labelledby="snapshot-title" className="flex flex-col gap-5 border-t border-rule pt-4">
      <header className="flex flex-wrap items-baseline justify-between gap-3">
        <div className="flex flex-col gap-0.5">
          <h2 id="snapshot-title">
            {quarter} <span className="font-normal text-ink-muted">· {snapshot.entityName}</span>
          </h2>
          <p className="text-sm text-ink-soft">
            Quarter <span className="figures">{quarterStart(snapshot.quarterEnd)}</span> to{" "}
            <span className="figures">{snapshot.quarterEnd}</span> · prepared by{" "}
            <PersonName email={snapshot.preparedBy} /> on {formatDateTime(snapshot.preparedAt)}
            {updating && <span className="text-ink-muted"> · updating…</span>}
          </p>
          {(snapshot.amendment || snapshot.amendedBy !== null) && (
            <p className="text-sm font-medium" data-testid="amendment-links">
              {snapshot.amendment && (
                <>
                  <Link to={snapshotHref(snapshot.amendment.amends)}>Amends #{snapshot.amendment.amends}</Link>
                  {snapshot.amendment.original.filedAt && (
                    <> (filed {formatDateTime(snapshot.amendment.original.filedAt)})</>
                  )}
                </>
              )}
              {snapshot.amendment && snapshot.amendedBy !== null && " · "}
              {snapshot.amendedBy !== null && (
                <Link to={snapshotHref(snapshot.amendedBy)}>Amended by #{snapshot.amendedBy}</Link>
              )}
            </p>
          )}
        </div>
        <p className="text-sm">
          <span className="text-2xs font-semibold tracking-wide text-ink-muted uppercase">Status </span>
          <span className="font-semibold" data-testid="snapshot-status">
            {snapshotStatusLabels[snapshot.status]}
          </span>
        </p>
      </header>
      {snapshot.restatedAfterSignOff && (
        <RestatedWarning restated={snapshot.restatedAfterSignOff} snapshotHref={snapshotHref} />
      )}
      {open && snapshot.openFindings > 0 && (
        <OpenFindingsNotice count={snapshot.openFindings} quarter={quarter} findingsHref={findingsHref} />
      )}
      <SnapshotFigures snapshot={snapshot} determination={determination} />
      {snapshot.amendment && (
        <AmendmentChanges
          amendment={snapshot.amendment}
          currency={snapshot.figures.currency}
          regime={snapshot.figures.regime}
          snapshotHref={snapshotHref}
        />
      )}
      <SnapshotReturn snapshot={snapshot} role={role} />
      <SnapshotActions
        key={snapshot.id}
        snapshot={snapshot}
        role={role}
        userEmail={userEmail}
        findingsHref={findingsHref}
        onPrepared={onPrepared}
      />
      <SnapshotFiling
        key={`filing-${snapshot.id}`}
        snapshot={snapshot}
        role={role}
        lookup={filing}
        filingHref={filingHref}
        delivery={filingDelivery}
        recipients={recipients}
      />
      <div className="grid gap-6 xl:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
        <SnapshotRecord snapshot={snapshot} />
        <SnapshotHistory snapshot={snapshot} />
      </div>
    </section>
  );
}
