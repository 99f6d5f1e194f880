import { useState } from "react";
import type { SettingsRecord } from "@shared/schemas/determination";
import type { SessionUser } from "@shared/schemas/auth";
import { Button } from "@/components/ui/button";
import { FormMessage, TextareaField } from "@/components/ui/field";
import { fieldErrorsOf, isApiError } from "@/lib/api-client";
import { useDecideSettings } from "../api/settings-queries";
import { consequenceOf, inForceOn, settingsSummary } from "../words";

// Stable, so the focus moves once, when the confirmation appears.
const focusWhenShown = (el: HTMLElement | null) => {
  el?.focus();
};

/**
 * One proposed change waiting for a chief risk officer: what it would do, and for a CRO other than
 * the proposer, approve or reject with an inline confirmation that states the consequence.
 */
export function SettingsDecision({
  record,
  records,
  entity,
  user,
  fallback,
}: {
  record: SettingsRecord;
  /** Every record of the entity: the one in force on the effective date is what the proposal changes. */
  records: SettingsRecord[];
  entity: string;
  user: SessionUser;
  /** The entity's own settings, which stand in before its first approved record. */
  fallback: Parameters<typeof consequenceOf>[1];
}) {
  const decide = useDecideSettings();
  const [asking, setAsking] = useState<"approve" | "reject" | null>(null);
  const [comment, setComment] = useState("");
  const [missing, setMissing] = useState<string>();
  const consequence = consequenceOf(record, inForceOn(records, record.effectiveFrom) ?? fallback, entity);
  const own = record.proposedBy === user.email;
  const serverFields = fieldErrorsOf(decide.error);
  const titleId = `proposal-${record.id}-title`;

  function confirm() {
    if (asking === "reject" && comment.trim() === "") {
      setMissing("Say why the change is rejected: the proposer and the audit log read it.");
      return;
    }
    setMissing(undefined);
    decide.mutate(
      { id: record.id, decision: asking!, comment: comment.trim() || undefined },
      { onSuccess: () => setAsking(null) },
    );
  }

  return (
    <section aria-labelledby={titleId} className="flex flex-col gap-2 border-l-2 border-notice pl-3">
      <h3 id={titleId} className="text-sm font-semibold">
        {record.reference}: from {record.effectiveFrom}
      </h3>
      <p className="text-sm text-ink-soft">
        {settingsSummary(record)} · proposed by {record.proposedByName ?? record.proposedBy ?? "—"}
      </p>
      <p className="text-sm" data-testid={`consequence-${record.id}`}>
        {consequence}
      </p>
      {user.role !== "cro" ? (
        <p className="text-sm text-ink-muted">Waiting for a chief risk officer to approve or reject it.</p>
      ) : own ? (
        <p className="text-sm text-ink-muted" data-testid={`own-proposal-${record.id}`}>
          You proposed this change, so another person with the chief risk officer role must approve it (four eyes).
        </p>
      ) : asking ? (
        <div
          role="group"
          aria-label={asking === "approve" ? "Confirm the approval" : "Confirm the rejection"}
          className="flex flex-col gap-2 border-l-2 border-accent pl-3"
        >
          <p className="text-sm font-medium">
            {asking === "approve"
              ? `${consequence} Approve it?`
              : `Reject it? Nothing changes: the multiplier of ${entity} keeps the settings in force.`}
          </p>
          <TextareaField
            label={asking === "approve" ? "Comment (optional)" : "Why it is rejected"}
            value={comment}
            onChange={(e) => {
              setComment(e.target.value);
              setMissing(undefined);
            }}
            error={missing ?? serverFields.comment}
            rows={2}
            className="max-w-xl"
          />
          <FormMessage>
            {isApiError(decide.error) && !serverFields.comment ? decide.error.message : undefined}
          </FormMessage>
          <div className="flex items-center gap-3">
            <Button
              variant={asking === "approve" ? "primary" : "danger"}
              size="sm"
              ref={focusWhenShown}
              disabled={decide.isPending}
              onClick={confirm}
            >
              {decide.isPending ? "Recording…" : asking === "approve" ? "Approve the change" : "Reject the change"}
            </Button>
            <Button
              variant="quiet"
              size="sm"
              disabled={decide.isPending}
              onClick={() => {
                setAsking(null);
                decide.reset();
              }}
            >
              Cancel
            </Button>
          </div>
        </div>
      ) : (
        <div className="flex items-center gap-3">
          <Button size="sm" onClick={() => setAsking("approve")}>
            Approve…
          </Button>
          <Button size="sm" variant="secondary" onClick={() => setAsking("reject")}>
            Reject…
          </Button>
        </div>
      )}
    </section>
  );
}
