import { useState } from "react";
import { useQuery } from "@tanstack/react-query";
import type { SettingsRecord } from "@shared/schemas/determination";
import { Button } from "@/components/ui/button";
import { Confirmation, useConfirmStep } from "@/components/ui/confirmation";
import { FormMessage, TextareaField } from "@/components/ui/field";
import { formLevelMessage } from "@/lib/form";
import { formatDateTime, formatFactor } from "@/lib/format";
import { queueQueries, useDecideSettings } from "../api/queue-queries";

const basisWords: Record<SettingsRecord["pnlBasis"], string> = {
  actual: "actual P&L",
  hypothetical: "hypothetical P&L",
  max: "the larger count of actual and hypothetical P&L",
};

function Values({ r }: { r: SettingsRecord }) {
  const rows: [string, string][] = [
    ["Effective from", r.effectiveFrom],
    ["Reference", r.reference],
    ["Exceptions counted on", basisWords[r.pnlBasis]],
    ["Qualitative addend", formatFactor(r.qualitativeAddend)],
    ["Qualitative addend on sVaR", r.qualitativeAddendSvar === null ? "none" : formatFactor(r.qualitativeAddendSvar)],
    ["Multiplier floor", r.multiplierFloor === null ? "none" : formatFactor(r.multiplierFloor)],
    ["Determined", r.determinationFrequency],
    ["Proposed", `${r.proposedByName ?? r.proposedBy ?? "—"}, ${formatDateTime(r.proposedAt)}`],
  ];
  return (
    <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-0.5 text-sm">
      {rows.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className="text-ink-muted">{k}</dt>
          <dd className="figures">{v}</dd>
        </div>
      ))}
    </dl>
  );
}

/**
 * A proposed change of an entity's supervisory settings, with its values, for the CRO to approve
 * (after a confirmation that says what it changes) or reject with a reason. The anchor
 * `settings-<id>` is where "Waiting for me" links to.
 */
export function SettingsDecision({
  entity,
  id,
  onDone,
}: {
  entity: string;
  id: number;
  /** The outcome in words: the screen shows it, since the decided proposal leaves the list. */
  onDone: (message: string) => void;
}) {
  const records = useQuery(queueQueries.settings(entity));
  const decide = useDecideSettings(id);
  const { confirming, setConfirming, opener, cancel } = useConfirmStep();
  const [comment, setComment] = useState("");
  const [commentError, setCommentError] = useState<string>();
  const record = records.data?.find((r) => r.id === id);
  const heading = `Settings of ${entity}${record ? ` from ${record.effectiveFrom}` : ""}`;

  function send(decision: "approve" | "reject") {
    decide.reset();
    if (decision === "reject" && comment.trim().length === 0) {
      setCommentError("Say why it is rejected: the administrator reads it before proposing again");
      return;
    }
    setCommentError(undefined);
    decide
      .mutateAsync({ decision, comment: comment.trim() === "" ? undefined : comment.trim() })
      .then(
        (r) =>
          onDone(
            r.status === "approved"
              ? `Approved: the settings of ${entity} are in force from ${r.effectiveFrom}.`
              : `Rejected: the settings of ${entity} stay as they were.`,
          ),
        () => undefined,
      )
      .finally(() => setConfirming(false));
  }

  return (
    <section
      id={`settings-${id}`}
      aria-label={heading}
      className="flex scroll-mt-4 flex-col gap-2 border border-rule px-3 py-2"
    >
      <h3 className="text-sm font-semibold">{heading}</h3>
      <FormMessage>{formLevelMessage(decide.error)}</FormMessage>
      {records.isPending && <p className="text-sm text-ink-muted">Loading the proposal…</p>}
      {records.isError && <FormMessage>{formLevelMessage(records.error)}</FormMessage>}
      {record && <Values r={record} />}
      {record?.status === "proposed" && (
        <>
          <TextareaField
            label="Comment"
            hint="Optional to approve; required to reject."
            rows={2}
            maxLength={500}
            value={comment}
            onChange={(e) => setComment(e.target.value)}
            error={commentError}
          />
          {confirming ? (
            <Confirmation
              label={`Approve the settings of ${entity}`}
              text={`Approving puts these settings in force for ${entity} from ${record.effectiveFrom}: the multiplier determinations from that date on are computed again with them. An approval cannot be withdrawn; a later change needs a new proposal.`}
              confirm="Approve the settings"
              busy={decide.isPending}
              onConfirm={() => send("approve")}
              onCancel={cancel}
            />
          ) : (
            <div className="flex gap-3">
              <Button ref={opener.ref} size="sm" disabled={decide.isPending} onClick={() => setConfirming(true)}>
                Approve…
              </Button>
              <Button size="sm" variant="danger" disabled={decide.isPending} onClick={() => send("reject")}>
                {decide.isPending ? "Rejecting…" : "Reject"}
              </Button>
            </div>
          )}
        </>
      )}
    </section>
  );
}
