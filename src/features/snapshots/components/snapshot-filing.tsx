import { useRef, useState, type ReactNode } from "react";
import { flushSync } from "react-dom";
import { Link } from "react-router-dom";
import type { Filing } from "@shared/schemas/filing";
import type { Role } from "@shared/schemas/common";
import { quarterLabel } from "@shared/backtest/quarters";
import { SIGNED_OFF, type Snapshot } from "@shared/schemas/snapshot";
import { Button } from "@/components/ui/button";
import { DownloadButton } from "@/components/ui/download-button";
import { FormMessage } from "@/components/ui/field";
import { FullHash } from "@/components/ui/hash";
import { FilingPendingNotice } from "@/components/ui/notice";
import { formLevelMessage } from "@/lib/form";
import { isApiError } from "@/lib/api-client";
import { cancelOnEscape, focusWhenShown } from "@/lib/focus";
import { formatDateTime } from "@/lib/format";
import { existingFilingOf, snapshotPackHref, useFileSnapshot } from "../api/snapshot-queries";
import { Subsection } from "@/components/ui/page-title";

/** The filed snapshot's filing as the screen found it in the filings list. */
export type FilingLookup = { filing?: Filing; reading: boolean; error: unknown };

/** A refusal because the quarter already has a filing: its message, and the filing it names. */
type AlreadyFiled = { message: string; filingId: number };

const NOTHING_SENT = "Nothing was sent and nothing was recorded; try again.";

/** Why the filing did not happen, by the server's code, with what to do about it. */
function filingRefusal(error: unknown, entity: string): string | undefined {
  if (!isApiError(error)) return error ? "The pack could not be filed; try again." : undefined;
  if (error.code === "no_supervisor_contacts")
    return `${entity} has no supervisor contacts, so there is nobody to send the pack to. An administrator adds them under Admin › Entities; then file it again.`;
  if (error.code === "mail_not_sent")
    return error.message.includes("Nothing was sent")
      ? error.message
      : `The mail server did not take the message. ${NOTHING_SENT}`;
  if (error.status === 409) return `${error.message} The snapshot is read again as it now stands.`;
  return formLevelMessage(error) ?? error.message;
}

/** What happened to the pack just filed, recipient by recipient, in the server's words. */
function filedInWords(quarter: string, filing: Filing): string {
  if (filing.delivery === "sent")
    return `${quarter} is filed with the supervisor: the pack went by e-mail to ${filing.recipients.join(", ")}.`;
  if (filing.delivery === "partial")
    return `${quarter} is filed, but not every recipient has the pack. ${filing.summary} Send it to the rest below.`;
  return `${quarter}'s pack is kept; the mail server did not take it yet — it is sent automatically as soon as the server answers, and the quarter becomes filed then.`;
}

type Recipients = { name: string | null; emails: string[] };

/** Who the pack goes to, said before it is sent. */
function recipientsInWords(entity: string, r: Recipients | undefined): string {
  if (!r) return `${entity}'s supervisor contacts`;
  if (r.emails.length === 0) return `${entity}'s supervisor contacts (none are set up: an administrator adds them)`;
  return `${r.name ? `${r.name}: ` : ""}${r.emails.join(", ")}`;
}

function FileWithSupervisor({
  snapshot,
  recipients,
  onFiled,
  onAlreadyFiled,
}: {
  snapshot: Snapshot;
  recipients?: Recipients;
  onFiled: (filing: Filing) => void;
  onAlreadyFiled: (refusal: AlreadyFiled) => void;
}) {
  const file = useFileSnapshot(snapshot.id);
  const [confirming, setConfirming] = useState(false);
  const sendButton = useRef<HTMLButtonElement>(null);
  const fileButton = useRef<HTMLButtonElement>(null);
  const quarter = quarterLabel(snapshot.quarterEnd);
  // "Already filed" is said above, with the filing, by the section that outlives this button.
  const refusal = existingFilingOf(file.error) === undefined ? filingRefusal(file.error, snapshot.entity) : undefined;

  // The confirmation replaces the button pressed: focus moves into it, and back when it is cancelled
  // (Cancel or Escape).
  function confirm() {
    file.reset();
    flushSync(() => setConfirming(true));
    sendButton.current?.focus();
  }
  function cancel() {
    flushSync(() => setConfirming(false));
    fileButton.current?.focus();
  }

  function send() {
    file.mutate(undefined, {
      onSuccess: onFiled,
      onError: (error) => {
        const filingId = existingFilingOf(error);
        if (filingId !== undefined) onAlreadyFiled({ message: error.message, filingId });
      },
      onSettled: () => setConfirming(false),
    });
  }

  return (
    <div role="group" aria-label="File with the supervisor" className="flex flex-col gap-2">
      {refusal && <FormMessage ref={focusWhenShown}>{refusal}</FormMessage>}
      {confirming ? (
        <div
          className="flex flex-wrap items-center gap-3 border-l-2 border-accent pl-3"
          onKeyDown={cancelOnEscape(() => !file.isPending && cancel())}
        >
          <p className="text-sm" data-testid="filing-confirmation">
            The pack goes by e-mail to {recipientsInWords(snapshot.entity, recipients)} and is kept as sent; {quarter}{" "}
            becomes filed. A filing cannot be taken back.
          </p>
          <Button ref={sendButton} onClick={send} disabled={file.isPending}>
            {file.isPending ? "Sending the pack…" : "Send the pack"}
          </Button>
          <Button variant="quiet" onClick={cancel} disabled={file.isPending}>
            Cancel
          </Button>
        </div>
      ) : (
        <div>
          <Button ref={fileButton} onClick={confirm}>
            File with the supervisor
          </Button>
        </div>
      )}
    </div>
  );
}

/** What was sent, to whom, with which SHA-256, and whether the supervisor acknowledged it. */
function FilingRecord({
  filing,
  filingHref,
  delivery,
}: {
  filing: Filing;
  filingHref: string;
  delivery?: (filing: Filing) => ReactNode;
}) {
  return (
    <div className="flex flex-col gap-2" data-testid="snapshot-filing">
      {!delivery && filing.delivery === "pending" && <FilingPendingNotice filing={filing} />}
      <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="text-ink-muted">Sent</dt>
        <dd>
          {filing.sentAt ? (
            <>
              <span className="figures">{formatDateTime(filing.sentAt)}</span> by {filing.sentBy}
            </>
          ) : (
            "Not yet: waiting for the mail server"
          )}
        </dd>
        <dt className="text-ink-muted">To</dt>
        <dd data-testid="filing-recipients">{filing.recipients.join(", ")}</dd>
        <dt className="text-ink-muted">Pack SHA-256</dt>
        <dd data-testid="filing-sha256">
          <FullHash value={filing.sha256} />
        </dd>
        <dt className="text-ink-muted">Acknowledged</dt>
        <dd data-testid="filing-acknowledged">
          {filing.acknowledgedAt ? (
            <>
              <span className="figures">{formatDateTime(filing.acknowledgedAt)}</span> by {filing.acknowledgedBy ?? "—"}
            </>
          ) : (
            <span className="font-medium">Not yet: waiting for the supervisor to acknowledge receipt</span>
          )}
        </dd>
      </dl>
      {delivery?.(filing)}
      <p className="text-sm">
        <Link to={filingHref}>Open the filing on the Filings screen</Link>
      </p>
    </div>
  );
}

/** The quarter's pack for the reporting office, and its filing with the supervisor. Treasury sees neither. */
export function SnapshotFiling({
  snapshot,
  role,
  lookup,
  filingHref,
  delivery,
  recipients,
}: {
  snapshot: Snapshot;
  role: Role;
  lookup: FilingLookup;
  filingHref: (id: number) => string;
  delivery?: (filing: Filing) => ReactNode;
  recipients?: Recipients;
}) {
  const [justFiled, setJustFiled] = useState<Filing>();
  const [alreadyFiled, setAlreadyFiled] = useState<AlreadyFiled>();
  if (role !== "analyst" && role !== "cro") return null;
  const quarter = quarterLabel(snapshot.quarterEnd);
  // The list is read again while a pack waits for the mail server: its answer is the newer one.
  const filing = lookup.filing ?? justFiled;

  let filingPart = null;
  if (filing) filingPart = <FilingRecord filing={filing} filingHref={filingHref(filing.id)} delivery={delivery} />;
  else if (snapshot.status === "filed")
    filingPart = lookup.error ? (
      <FormMessage>{isApiError(lookup.error) ? lookup.error.message : "The filing could not be read."}</FormMessage>
    ) : lookup.reading ? (
      <p className="text-sm text-ink-muted">Reading the filing…</p>
    ) : (
      <p className="text-sm text-ink-muted">{quarter} is filed, but its filing is not in the list you can read.</p>
    );
  else if (snapshot.status === "approved")
    filingPart =
      role === "cro" ? (
        <FileWithSupervisor
          snapshot={snapshot}
          recipients={recipients}
          onFiled={setJustFiled}
          onAlreadyFiled={setAlreadyFiled}
        />
      ) : (
        <p className="text-sm text-ink-soft">
          A chief risk officer files {quarter} with the supervisor: the pack goes by e-mail to the entity's supervisor
          contacts.
        </p>
      );

  return (
    <Subsection titleId="pack-title" title="Pack and filing">
      <DownloadButton
        href={snapshotPackHref(snapshot.id)}
        fallbackName={`quartermark-${snapshot.entity.toLowerCase()}-${snapshot.quarterEnd}-pack.pdf`}
        note={
          <span className="text-xs text-ink-muted">
            {SIGNED_OFF.has(snapshot.status)
              ? "The frozen figures, the seal and the sign-off record, with the caution on every page."
              : `Not signed off: every page of ${quarter}'s pack says so.`}
          </span>
        }
      >
        Download the pack (PDF)
      </DownloadButton>
      {justFiled && (
        <FormMessage tone="done" ref={focusWhenShown}>
          {filedInWords(quarter, filing ?? justFiled)}
        </FormMessage>
      )}
      {alreadyFiled && (
        <FormMessage ref={focusWhenShown}>
          {alreadyFiled.message}{" "}
          <Link to={filingHref(alreadyFiled.filingId)}>Open filing #{alreadyFiled.filingId} on the Filings screen</Link>
        </FormMessage>
      )}
      {filingPart}
    </Subsection>
  );
}
