import { useRef, useState, type FormEvent, type ReactNode } from "react";
import { Link } from "react-router-dom";
import type { z } from "zod";
import { quarterLabel } from "@shared/backtest/quarters";
import { returnSnapshotSchema, snapshotActionSchema, type Snapshot } from "@shared/schemas/snapshot";
import type { Role } from "@shared/schemas/common";
import { Button } from "@/components/ui/button";
import { Confirmation, useConfirmStep } from "@/components/ui/confirmation";
import { zoneName } from "@/components/ui/zone-badge";
import { FormMessage, TextareaField } from "@/components/ui/field";
import { SubmitButton } from "@/components/ui/form-kit";
import { Notice } from "@/components/ui/notice";
import { fieldErrorsOf, isApiError } from "@/lib/api-client";
import { focusWhenShown } from "@/lib/focus";
import { formatDateTime, formatFactor, shortHash } from "@/lib/format";
import { focusFirstInvalid, formLevelMessage, validate, type FieldErrors } from "@/lib/form";
import {
  isChangedMeanwhile,
  useApproveSnapshot,
  usePrepareSnapshot,
  useReturnSnapshot,
  useSubmitSnapshot,
} from "../api/snapshot-queries";
import { PersonName } from "@/lib/people";
import { Subsection } from "@/components/ui/page-title";

const sameUser = (a: string | null, b: string) => a !== null && a.trim().toLowerCase() === b.trim().toLowerCase();

/** The server's refusal in its own words, with the way to the cause where the screen knows it. */
function Refusal({ error, findingsHref }: { error: unknown; findingsHref: string }) {
  const message = formLevelMessage(error);
  if (!message) return null;
  const code = isApiError(error) ? error.code : "";
  return (
    <FormMessage ref={focusWhenShown}>
      {message}
      {code === "open_findings" && (
        <>
          {" "}
          <Link to={findingsHref}>Open the findings on the Data screen</Link>
        </>
      )}
      {code === "inputs_changed" && " Return it, so that the analyst prepares it again on the current data."}
    </FormMessage>
  );
}

/** Optional comment only: empty text is left out of the body rather than sent as "". */
const commentOf = (text: string) => (text.trim() === "" ? undefined : text);

/** The comment, its field errors and the two ways a send can fail, shared by the submit and sign-off forms. */
function useCommentForm({ onDone, onChanged }: Pick<CommentFormProps, "onDone" | "onChanged">) {
  const formRef = useRef<HTMLFormElement>(null);
  const [comment, setComment] = useState("");
  const [errors, setErrors] = useState<FieldErrors>({});

  /** The body to send, or undefined with the errors beside the fields and the first one focused. */
  function checked<S extends z.ZodType>(schema: S, input: unknown): z.output<S> | undefined {
    const r = validate(schema, input);
    if (!r.ok) {
      setErrors(r.errors);
      focusFirstInvalid(formRef.current);
      return undefined;
    }
    setErrors({});
    return r.data;
  }

  const onError = (err: unknown) => {
    if (isChangedMeanwhile(err) && isApiError(err)) onChanged(err.message);
    setErrors(fieldErrorsOf(err));
  };

  /** Checks the input, sends it, and says what it did (`said`) with the snapshot as stored. */
  function send<S extends z.ZodType>(
    mutation: { mutateAsync: (body: z.output<S>) => Promise<Snapshot> },
    schema: S,
    input: unknown,
    said: (s: Snapshot) => string,
  ) {
    const body = checked(schema, input);
    if (!body) return;
    // The promise, not mutate's callbacks: storing the answer replaces this form (the snapshot has moved
    // on), and callbacks given to mutate() do not run once their component is gone.
    mutation.mutateAsync(body).then((s) => onDone(said(s)), onError);
  }

  /** The props of the comment's TextareaField. */
  const commentField = {
    value: comment,
    onChange: (e: { target: { value: string } }) => setComment(e.target.value),
    rows: 3,
    maxLength: 2000,
    error: errors.comment,
  };

  return { formRef, comment, commentField, send };
}

/** What every action below is given: the snapshot, where its findings are, and how to say what it did. */
type ActionProps = { snapshot: Snapshot; findingsHref: string; onDone: (message: string) => void };

type CommentFormProps = ActionProps & { onChanged: (message: string) => void };

function SubmitForm({ snapshot, findingsHref, ...tell }: CommentFormProps) {
  const submit = useSubmitSnapshot(snapshot.id);
  const { formRef, comment, commentField, send } = useCommentForm(tell);

  function submitForSignOff(e: FormEvent) {
    e.preventDefault();
    submit.reset();
    send(
      submit,
      snapshotActionSchema,
      { comment: commentOf(comment), version: snapshot.version },
      (s) =>
        `${quarterLabel(s.quarterEnd)} is submitted for sign-off. A chief risk officer who did not prepare it approves or returns it.`,
    );
  }

  return (
    <form
      ref={formRef}
      onSubmit={submitForSignOff}
      noValidate
      aria-label="Submit for sign-off"
      className="flex max-w-2xl flex-col gap-3"
    >
      {!isChangedMeanwhile(submit.error) && <Refusal error={submit.error} findingsHref={findingsHref} />}
      <TextareaField
        label="Comment for the sign-off (optional)"
        hint="What the chief risk officer should know: exceptions explained, exclusions asked, anything unusual in the quarter."
        {...commentField}
      />
      <div>
        <SubmitButton pending={submit.isPending} busyLabel="Submitting…">
          Submit for sign-off
        </SubmitButton>
      </div>
    </form>
  );
}

function SignOffForm({ snapshot, userEmail, findingsHref, ...tell }: CommentFormProps & { userEmail: string }) {
  const approve = useApproveSnapshot(snapshot.id);
  const giveBack = useReturnSnapshot(snapshot.id);
  const { formRef, comment, commentField, send } = useCommentForm(tell);
  const { confirming, setConfirming, opener, cancel } = useConfirmStep();
  // Four eyes (docs/architecture.md#roles): whoever prepared or submitted it may not approve it.
  const ownWork = sameUser(snapshot.preparedBy, userEmail) || sameUser(snapshot.submittedBy, userEmail);

  function sendApprove() {
    giveBack.reset();
    approve.reset();
    setConfirming(false);
    send(
      approve,
      snapshotActionSchema,
      { comment: commentOf(comment), version: snapshot.version },
      (s) =>
        `${quarterLabel(s.quarterEnd)} is approved and sealed${s.hash ? ` with hash ${shortHash(s.hash)}` : ""}. Its figures no longer change.`,
    );
  }

  function sendReturn(e?: FormEvent) {
    e?.preventDefault();
    approve.reset();
    giveBack.reset();
    send(
      giveBack,
      returnSnapshotSchema,
      { comment, version: snapshot.version },
      (s) => `${quarterLabel(s.quarterEnd)} is returned to the analysts with your comment.`,
    );
  }

  const error = approve.error ?? giveBack.error;
  const busy = approve.isPending || giveBack.isPending;
  return (
    <form
      ref={formRef}
      onSubmit={sendReturn}
      noValidate
      aria-label="Sign-off"
      className="flex max-w-2xl flex-col gap-3"
    >
      {ownWork && (
        <Notice>
          <strong className="font-semibold">Four eyes.</strong> You{" "}
          {sameUser(snapshot.preparedBy, userEmail) ? "prepared" : "submitted"} this snapshot, so you cannot approve it:
          another chief risk officer signs it off. You may still return it with a comment.
        </Notice>
      )}
      {!isChangedMeanwhile(error) && <Refusal error={error} findingsHref={findingsHref} />}
      <TextareaField
        label={ownWork ? "Why does it go back?" : "Comment"}
        hint={
          ownWork
            ? "Required to return it; the analysts read it before they prepare it again."
            : "Optional to approve; required to return it, saying what to change."
        }
        {...commentField}
      />
      {confirming ? (
        <Confirmation
          label={`Approve and seal ${quarterLabel(snapshot.quarterEnd)}`}
          text={
            <>
              Approving seals {quarterLabel(snapshot.quarterEnd)} of {snapshot.entity}: its figures (
              {zoneName(snapshot.zone, snapshot.figures.regime)} zone, {snapshot.counted} counted exceptions, multiplier{" "}
              {formatFactor(snapshot.multiplier)}) are signed into the entity's chain and never change again. This
              cannot be undone: a later restatement is only recorded beside them, and the next step is filing the pack
              with the supervisor.
            </>
          }
          confirm={`Approve and seal ${quarterLabel(snapshot.quarterEnd)}`}
          busy={busy}
          onConfirm={sendApprove}
          onCancel={cancel}
        />
      ) : (
        <div className="flex flex-wrap items-center gap-3">
          {!ownWork && (
            <Button
              ref={opener.ref}
              onClick={() => {
                approve.reset();
                giveBack.reset();
                setConfirming(true);
              }}
              disabled={busy}
            >
              {approve.isPending ? "Approving…" : "Approve and seal"}
            </Button>
          )}
          <Button type="submit" variant={ownWork ? "primary" : "danger"} disabled={busy}>
            {giveBack.isPending ? "Returning…" : "Return to the analysts"}
          </Button>
        </div>
      )}
    </form>
  );
}

type PrepareProps = ActionProps & { onPrepared: (s: Snapshot) => void };

/**
 * Prepares the quarter on today's data as a new draft (`amends`: the filed snapshot it corrects). The
 * promise outlives the control, which the new draft replaces; a refusal shows through `prepare.error`.
 */
function usePrepareDraft({ snapshot, onDone, onPrepared }: PrepareProps) {
  const prepare = usePrepareSnapshot();
  function run(amends: number | null, said: (s: Snapshot) => string, onRefused: () => void) {
    const body = { entity: snapshot.entity, quarterEnd: snapshot.quarterEnd, ...(amends !== null ? { amends } : {}) };
    prepare.mutateAsync(body).then((s) => {
      onDone(said(s));
      onPrepared(s);
    }, onRefused);
  }
  return { prepare, run };
}

function PrepareAgain(props: PrepareProps) {
  const { prepare, run } = usePrepareDraft(props);
  // A returned amendment is prepared again as the amendment it is.
  const prepareAgain = () =>
    run(
      props.snapshot.amends,
      (s) =>
        `${quarterLabel(s.quarterEnd)} is computed again on today's data and is a draft: check it, then submit it.`,
      () => undefined,
    );
  return (
    <div className="flex flex-col gap-2">
      <Refusal error={prepare.error} findingsHref={props.findingsHref} />
      <div>
        <Button disabled={prepare.isPending} onClick={prepareAgain}>
          {prepare.isPending ? "Computing the figures…" : "Prepare again"}
        </Button>
      </div>
    </div>
  );
}

/**
 * A day inside a filed quarter was restated: the analyst prepares an amendment, after a confirmation
 * that says what will happen (a new draft, the same sign-off, the filed snapshot left as it is).
 */
function PrepareAmendment(props: PrepareProps) {
  const { snapshot } = props;
  const { prepare, run } = usePrepareDraft(props);
  const { confirming, setConfirming, opener, cancel } = useConfirmStep();
  const quarter = quarterLabel(snapshot.quarterEnd);
  return (
    <div className="flex flex-col gap-2">
      <Refusal error={prepare.error} findingsHref={props.findingsHref} />
      {confirming ? (
        <Confirmation
          label="Prepare an amendment"
          text={
            <>
              <p>
                An amendment of {quarter} is computed on today's data as a new draft that names snapshot #{snapshot.id}.
                It lists every figure that changed against the filed one and the capital impact.
              </p>
              <p className="mt-1">
                It then goes through the same sign-off: you submit it, a chief risk officer who did not prepare it
                approves it and files it with the supervisor. Snapshot #{snapshot.id}, its filing and its pack stay
                exactly as filed.
              </p>
            </>
          }
          confirm={prepare.isPending ? "Computing the figures…" : "Prepare the amendment"}
          busy={prepare.isPending}
          onConfirm={() =>
            run(
              snapshot.id,
              (s) =>
                `The amendment of ${quarter} (#${s.id}) is prepared as a draft: check what changed, then submit it for sign-off.`,
              () => setConfirming(false),
            )
          }
          onCancel={cancel}
        />
      ) : (
        <div>
          <Button
            ref={opener.ref}
            onClick={() => {
              prepare.reset();
              setConfirming(true);
            }}
          >
            Prepare amendment
          </Button>
        </div>
      )}
    </div>
  );
}

function lastComment(snapshot: Snapshot, action: Snapshot["history"][number]["action"]) {
  return [...snapshot.history].filter((h) => h.action === action).sort((a, b) => b.at.localeCompare(a.at))[0];
}

/** Where the snapshot stands for this reader, in a sentence. */
function Standing({ snapshot, role }: { snapshot: Snapshot; role: Role }) {
  const label = quarterLabel(snapshot.quarterEnd);
  switch (snapshot.status) {
    case "draft":
      return role === "analyst" ? (
        <>
          Check the figures, then submit {label} for sign-off. A chief risk officer who did not prepare it approves it.
        </>
      ) : (
        <>{label} is still a draft with the analysts; it comes to you once they submit it.</>
      );
    case "submitted":
      return role === "cro" ? (
        <>
          Submitted by <PersonName email={snapshot.submittedBy} fallback="an analyst" /> on{" "}
          {formatDateTime(snapshot.submittedAt)}. Approve it to seal the figures, or return it saying what to change.
        </>
      ) : (
        <>
          Submitted by <PersonName email={snapshot.submittedBy} fallback="an analyst" /> on{" "}
          {formatDateTime(snapshot.submittedAt)}; waiting for a chief risk officer to approve or return it.
        </>
      );
    case "returned": {
      const returned = lastComment(snapshot, "returned");
      return (
        <>
          Returned{returned ? ` by ${returned.by} on ${formatDateTime(returned.at)}` : ""}
          {returned?.comment ? <>: “{returned.comment}”</> : "."}{" "}
          {role === "analyst"
            ? "Prepare it again on the current data, then submit it."
            : "The analysts prepare it again and submit it."}
        </>
      );
    }
    case "approved":
      return (
        <>
          Approved by <PersonName email={snapshot.approvedBy} /> on {formatDateTime(snapshot.approvedAt)}. The figures
          are sealed and no longer change.
          {role === "cro" && " Read the pack, then file it with the supervisor below."}
        </>
      );
    case "filed":
      return (
        <>
          Approved by <PersonName email={snapshot.approvedBy} /> and filed with the supervisor. The figures are sealed
          and no longer change.
          {snapshot.restatedAfterSignOff &&
            !snapshot.restatedAfterSignOff.resolvedBy &&
            (snapshot.amendedBy !== null
              ? ` Its amendment #${snapshot.amendedBy} is in sign-off.`
              : role === "analyst"
                ? " A day inside it was restated since: prepare an amendment to file the corrected figures."
                : " A day inside it was restated since: the analysts prepare an amendment to file the corrected figures.")}
        </>
      );
  }
}

/** What this reader can do next with the snapshot: only the actions their role and its status allow. */
export function SnapshotActions({
  snapshot,
  role,
  userEmail,
  findingsHref,
  onPrepared,
}: {
  snapshot: Snapshot;
  role: Role;
  userEmail: string;
  findingsHref: string;
  onPrepared: (s: Snapshot) => void;
}) {
  const [done, setDone] = useState<string>();
  const [changed, setChanged] = useState<string>();
  const onDone = (message: string) => {
    setChanged(undefined);
    setDone(message);
  };
  const onChanged = (message: string) => {
    setDone(undefined);
    setChanged(message);
  };

  // What each step of the sign-off is given.
  const step = { snapshot, findingsHref, onDone };
  let action: ReactNode = null;
  if (role === "analyst" && snapshot.status === "draft")
    action = <SubmitForm key={snapshot.version} {...step} onChanged={onChanged} />;
  else if (role === "analyst" && snapshot.status === "returned")
    action = <PrepareAgain {...step} onPrepared={onPrepared} />;
  else if (
    role === "analyst" &&
    snapshot.status === "filed" &&
    snapshot.restatedAfterSignOff &&
    !snapshot.restatedAfterSignOff.resolvedBy &&
    snapshot.amendedBy === null
  )
    action = <PrepareAmendment {...step} onPrepared={onPrepared} />;
  else if (role === "cro" && snapshot.status === "submitted")
    action = <SignOffForm key={snapshot.version} {...step} userEmail={userEmail} onChanged={onChanged} />;

  return (
    <Subsection titleId="next-title" title="What next">
      <FormMessage tone="done" ref={focusWhenShown}>
        {done}
      </FormMessage>
      {changed && <FormMessage ref={focusWhenShown}>{changed} The snapshot below is as it now stands.</FormMessage>}
      <p className="text-sm text-ink-soft">
        <Standing snapshot={snapshot} role={role} />
      </p>
      {action}
    </Subsection>
  );
}
