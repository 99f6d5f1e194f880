import { useState } from "react";
import type { Role } from "@shared/schemas/common";
import { noticeSchema, type Notice } from "@shared/schemas/notice";
import { Button } from "@/components/ui/button";
import { Confirmation, useConfirmStep } from "@/components/ui/confirmation";
import { DownloadButton } from "@/components/ui/download-button";
import { FormMessage, TextareaField } from "@/components/ui/field";
import { LateBadge } from "@/components/ui/late-badge";
import { Notice as NoteBox } from "@/components/ui/notice";
import { fieldErrorsOf, isApiError, staleCurrent } from "@/lib/api-client";
import { formatBusinessDate, formatDateTime, formatDecimal } from "@/lib/format";
import { focusWhenShown } from "@/lib/focus";
import { useDraftNotice, useSendNotice } from "../api/notice-queries";
import { seriesWords, standingOf } from "../words";

/**
 * One overshooting notice: where it stands (due, drafted, sent, late), the figures of the day, the
 * cause so far (an analyst writes it while the notice is open), and for the chief risk officer the
 * send, after a confirmation that lists the supervisor contacts it goes to.
 */
export function NoticeDetail({
  notice,
  role,
  recipients,
  supervisorName,
}: {
  notice: Notice;
  role: Role;
  /** The entity's supervisor contacts now: where a send would go. */
  recipients: string[];
  supervisorName: string | null;
}) {
  const money = (v: number | null) => (v === null ? "—" : `${formatDecimal(v)} ${notice.currency}`);
  const titleId = `notice-${notice.id}-title`;
  return (
    <section aria-labelledby={titleId} className="flex flex-col gap-3 border-t border-rule pt-4">
      <div className="flex flex-wrap items-baseline gap-3">
        <h2 id={titleId}>
          Overshooting of {notice.portfolio} on {notice.date}
        </h2>
        {notice.late && (
          <LateBadge title={notice.status === "sent" ? "Sent after its due day" : "Not sent by its due day"} />
        )}
      </div>
      <p className="text-sm font-medium" data-testid="notice-standing">
        {standingOf(notice)}
        {notice.late && notice.status === "open" && ` — late: it was due on ${formatBusinessDate(notice.dueOn)}`}
        {notice.late && notice.status === "sent" && ` — after its due day, ${formatBusinessDate(notice.dueOn)}`}.
      </p>
      {notice.note && <NoteBox>{notice.note}</NoteBox>}
      <dl className="grid max-w-2xl grid-cols-[max-content_1fr] gap-x-6 gap-y-1 text-sm">
        <dt className="text-ink-muted">Actual P&amp;L</dt>
        <dd className="figures">{money(notice.actualPnl)}</dd>
        <dt className="text-ink-muted">Hypothetical P&amp;L</dt>
        <dd className="figures">{money(notice.hypotheticalPnl)}</dd>
        <dt className="text-ink-muted">VaR (99%, one day)</dt>
        <dd className="figures">{money(notice.var99)}</dd>
        <dt className="text-ink-muted">Loss beyond VaR</dt>
        <dd className="figures">
          {money(notice.excess)} on {seriesWords[notice.series]}
        </dd>
        <dt className="text-ink-muted">Revealed by the upload of</dt>
        <dd className="figures">{formatBusinessDate(notice.revealedOn)}</dd>
        <dt className="text-ink-muted">Due by (five working days)</dt>
        <dd className="figures">{formatBusinessDate(notice.dueOn)}</dd>
        {notice.draftedBy && (
          <>
            <dt className="text-ink-muted">Drafted</dt>
            <dd>
              {notice.draftedBy}, {formatDateTime(notice.draftedAt)}
            </dd>
          </>
        )}
        {notice.status === "sent" && (
          <>
            <dt className="text-ink-muted">Sent to</dt>
            <dd>{notice.recipients.join(", ")}</dd>
          </>
        )}
      </dl>
      {notice.status === "sent" && (
        <DownloadButton href={`/api/notices/${notice.id}/notice.pdf`} fallbackName="overshooting-notice.pdf">
          Download the notice as sent (PDF)
        </DownloadButton>
      )}
      {role === "analyst" && notice.status === "open" ? (
        <DraftForm notice={notice} />
      ) : (
        <div className="flex flex-col gap-1">
          <h3 className="text-sm font-semibold">Cause so far</h3>
          <p className="max-w-3xl text-sm whitespace-pre-wrap" data-testid="notice-cause">
            {notice.cause || "Not drafted yet: an analyst writes what is known of the cause."}
          </p>
        </div>
      )}
      {role === "cro" && notice.status !== "withdrawn" && (
        <SendNotice notice={notice} recipients={recipients} supervisorName={supervisorName} />
      )}
    </section>
  );
}

function DraftForm({ notice }: { notice: Notice }) {
  const draft = useDraftNotice(notice.entity, notice.id);
  const [cause, setCause] = useState(notice.cause);
  const [saved, setSaved] = useState(false);
  const current = staleCurrent(draft.error, noticeSchema);
  const fields = fieldErrorsOf(draft.error);
  return (
    <form
      className="flex max-w-3xl flex-col gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        setSaved(false);
        draft.mutate({ cause, version: current?.version ?? notice.version }, { onSuccess: () => setSaved(true) });
      }}
    >
      <TextareaField
        label="Cause so far"
        hint="What is known of the cause: the market move, a model limitation, a data issue. The supervisor reads it."
        value={cause}
        onChange={(e) => {
          setCause(e.target.value);
          setSaved(false);
        }}
        error={fields.cause}
        rows={4}
      />
      {current ? (
        <FormMessage>
          Someone saved this notice after you opened it. Their text: “{current.cause || "—"}”. Saving again replaces it
          with yours.
        </FormMessage>
      ) : (
        <FormMessage>{isApiError(draft.error) && !fields.cause ? draft.error.message : undefined}</FormMessage>
      )}
      {saved && <FormMessage tone="done">Draft saved. The chief risk officer can now send it.</FormMessage>}
      <div>
        <Button type="submit" size="sm" disabled={draft.isPending}>
          {draft.isPending ? "Saving…" : notice.draftedAt ? "Save the draft again" : "Save the draft"}
        </Button>
      </div>
    </form>
  );
}

function SendNotice({
  notice,
  recipients,
  supervisorName,
}: {
  notice: Notice;
  recipients: string[];
  supervisorName: string | null;
}) {
  const send = useSendNotice(notice.entity, notice.id);
  const { confirming: asking, setConfirming: setAsking, opener, cancel } = useConfirmStep();
  const [outcome, setOutcome] = useState<string>();
  // Once sent, the send is gone: what it did takes its place (and the focus).
  if (notice.status !== "open")
    return outcome ? (
      <FormMessage tone="done" ref={focusWhenShown}>
        {outcome}
      </FormMessage>
    ) : null;
  if (!notice.draftedAt)
    return <p className="text-sm text-ink-muted">An analyst drafts the cause first; then you send it.</p>;
  if (recipients.length === 0)
    return (
      <FormMessage>
        {notice.entity} has no supervisor e-mail address. An administrator adds one under Admin › Entities before the
        notice can be sent.
      </FormMessage>
    );
  return (
    <div className="flex flex-col gap-2">
      {asking ? (
        <Confirmation
          label="Confirm sending the notice"
          text={
            <>
              <p>
                This sends the overshooting notice of {notice.date} as a PDF by e-mail to{" "}
                {supervisorName ? `${supervisorName}: ` : ""}
              </p>
              <ul className="my-1 list-disc pl-5" aria-label="Recipients">
                {recipients.map((r) => (
                  <li key={r}>{r}</li>
                ))}
              </ul>
              <p>It cannot be taken back: the supervisor receives it as sent.</p>
            </>
          }
          confirm={send.isPending ? "Sending…" : "Send the notice"}
          busy={send.isPending}
          onConfirm={async () => {
            try {
              const sent = await send.mutateAsync({ version: notice.version });
              setOutcome(`Sent to ${sent.recipients.join(", ")}.`);
            } catch {
              // The refusal shows below.
            }
            setAsking(false);
          }}
          onCancel={cancel}
        />
      ) : (
        <div>
          <Button ref={opener.ref} size="sm" onClick={() => setAsking(true)}>
            Send to the supervisor…
          </Button>
        </div>
      )}
      {outcome && (
        <FormMessage tone="done" ref={focusWhenShown}>
          {outcome}
        </FormMessage>
      )}
      {isApiError(send.error) && <FormMessage ref={focusWhenShown}>{send.error.message}</FormMessage>}
    </div>
  );
}
