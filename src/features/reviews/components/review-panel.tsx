import { useId, useRef, useState, type FormEvent } from "react";
import type { QueryKey } from "@tanstack/react-query";
import {
  type ExclusionDecision,
  decisionBodySchema,
  exceptionCauseSchema,
  reviewBodySchema,
  type ExceptionCause,
  type Review,
} from "@shared/schemas/review";
import { type ExceptionDayDto } from "@shared/schemas/backtest";
import type { Role } from "@shared/schemas/common";
import { Button } from "@/components/ui/button";
import { FormMessage, SelectField, TextareaField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { errorMessage, fieldErrorsOf, isApiError } from "@/lib/api-client";
import { formatAmount, formatBusinessDate, formatBytes, formatDateTime } from "@/lib/format";
import { focusFirstInvalid, validate, type FieldErrors } from "@/lib/form";
import {
  currentReviewOf,
  EVIDENCE_ACCEPT,
  evidenceHref,
  useAddEvidence,
  useRecordDecision,
  useSaveReview,
} from "../api/review-queries";
import { seriesOf } from "@/lib/pnl-series";
import { PnlMakeUp } from "./pnl-make-up";
import { causeIds, causeLabels, exclusionStatusLabels } from "@/lib/review-labels";
import { PersonName } from "@/lib/people";

/** Every decision recorded, oldest first: a correction never replaces the record it supersedes. */
function DecisionHistory({ decisions }: { decisions: ExclusionDecision[] }) {
  return (
    <ol className="flex flex-col gap-1" aria-label="Decisions recorded">
      {decisions.map((d) => (
        <li key={d.id} className={d.superseded ? "text-ink-muted" : undefined}>
          {d.decision === "approved" ? "Approved" : "Refused"} ({d.reference}, {d.decidedOn}), recorded by{" "}
          {d.recordedBy ?? "—"} on {formatDateTime(d.recordedAt)}
          {d.correctionReason && <> — corrects the record before: “{d.correctionReason}”</>}
          {d.superseded && <> — superseded by a correction</>}
        </li>
      ))}
    </ol>
  );
}

/** A review as it stands: who explained it, why, and what the supervisor decided. */
export function ReviewRecord({ review }: { review: Review }) {
  return (
    <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm">
      <dt className="text-ink-muted">Cause</dt>
      <dd>{causeLabels[review.cause]}</dd>
      <dt className="text-ink-muted">Explanation</dt>
      <dd className="whitespace-pre-wrap">{review.narrative}</dd>
      <dt className="text-ink-muted">Exclusion</dt>
      <dd>
        {exclusionStatusLabels[review.exclusionStatus]}
        {review.exclusionStatus === "none" && " (no exclusion asked)"}
      </dd>
      {review.decisionReference && (
        <>
          <dt className="text-ink-muted">Supervisor's decision</dt>
          <dd>
            <span className="figures">{review.decisionReference}</span> of{" "}
            <span className="figures">{review.decisionDate ?? "—"}</span>
            {review.decidedBy && `, recorded by ${review.decidedBy}`}
          </dd>
        </>
      )}
      {(review.decisions?.length ?? 0) > 1 && (
        <>
          <dt className="text-ink-muted">Decisions recorded</dt>
          <dd>
            <DecisionHistory decisions={review.decisions!} />
          </dd>
        </>
      )}
      <dt className="text-ink-muted">Reviewed by</dt>
      <dd>
        <PersonName email={review.reviewedBy} />, {formatDateTime(review.reviewedAt)}{" "}
        <span className="text-ink-muted">· version {review.version}</span>
      </dd>
    </dl>
  );
}

/** Shown after a 409: someone else saved first; their review is what now stands. */
function SavedMeanwhile({ current, onTake, mine }: { current: Review; onTake?: () => void; mine: string }) {
  return (
    <Notice role="alert" className="py-2">
      <div className="flex flex-col gap-2">
        <p className="font-medium">
          {current.reviewedBy} saved this review while you were working on it (now version {current.version}). This is
          what stands:
        </p>
        <ReviewRecord review={current} />
        <p className="text-ink-soft">
          {mine} Save again to put yours in its place
          {onTake ? ", or start from theirs." : "."}
        </p>
        {onTake && (
          <div>
            <Button variant="secondary" size="sm" onClick={onTake}>
              Start from their review
            </Button>
          </div>
        )}
      </div>
    </Notice>
  );
}

function AnalystReviewForm({
  code,
  day,
  alsoInvalidate,
}: {
  code: string;
  day: ExceptionDayDto;
  alsoInvalidate: readonly QueryKey[];
}) {
  const review = day.review;
  const [cause, setCause] = useState<ExceptionCause | "">(review?.cause ?? "");
  const [narrative, setNarrative] = useState(review?.narrative ?? "");
  const [exclusion, setExclusion] = useState(review ? review.exclusionStatus !== "none" : false);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [conflict, setConflict] = useState<Review | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const formRef = useRef<HTMLFormElement>(null);
  const save = useSaveReview(code, day.date, alsoInvalidate);
  const version = conflict?.version ?? review?.version ?? 0;

  function submit(e: FormEvent) {
    e.preventDefault();
    setSaved(null);
    const checked = validate(reviewBodySchema, { cause: cause || undefined, narrative, exclusion, version });
    if (!checked.ok) {
      setErrors({ ...checked.errors, cause: checked.errors.cause ? "Choose the cause of the exception" : undefined });
      focusFirstInvalid(formRef.current);
      return;
    }
    setErrors({});
    save.mutate(checked.data, {
      onSuccess: (r) => {
        setConflict(null);
        setSaved(`Review saved (version ${r.version}).`);
      },
      onError: (err) => {
        const current = currentReviewOf(err);
        if (current) setConflict(current);
        const fields = fieldErrorsOf(err);
        if (Object.keys(fields).length) {
          setErrors(fields);
          focusFirstInvalid(formRef.current);
        }
      },
    });
  }

  function takeTheirs() {
    if (!conflict) return;
    setCause(conflict.cause);
    setNarrative(conflict.narrative);
    setExclusion(conflict.exclusionStatus !== "none");
  }

  const failed =
    save.error && !currentReviewOf(save.error) && Object.keys(fieldErrorsOf(save.error)).length === 0
      ? save.error
      : null;
  const decided = review && (review.exclusionStatus === "approved" || review.exclusionStatus === "rejected");
  return (
    <form
      ref={formRef}
      onSubmit={submit}
      noValidate
      aria-label={`Review of the exception of ${day.date}`}
      className="flex max-w-2xl flex-col gap-3"
    >
      {conflict && (
        <SavedMeanwhile current={conflict} onTake={takeTheirs} mine="Your text is kept in the form below." />
      )}
      <FormMessage>{errorMessage(failed, "The review could not be saved.")}</FormMessage>
      <FormMessage tone="done">{saved ?? undefined}</FormMessage>
      <SelectField
        label="Cause"
        value={cause}
        onChange={(e) => setCause(exceptionCauseSchema.safeParse(e.target.value).data ?? "")}
        error={errors.cause}
        className="max-w-xs"
      >
        <option value="">Choose…</option>
        {causeIds.map((c) => (
          <option key={c} value={c}>
            {causeLabels[c]}
          </option>
        ))}
      </SelectField>
      <TextareaField
        label="What happened"
        hint="Which positions lost, what moved, and whether the model could have seen it. 10 to 4,000 characters."
        value={narrative}
        onChange={(e) => setNarrative(e.target.value)}
        rows={4}
        maxLength={4000}
        error={errors.narrative}
      />
      <label className="flex items-start gap-2 text-sm">
        <input
          type="checkbox"
          checked={exclusion}
          onChange={(e) => setExclusion(e.target.checked)}
          disabled={Boolean(decided)}
          className="mt-0.5 size-4 accent-accent"
        />
        <span>
          Ask the supervisor to disregard this exception
          <span className="block text-xs text-ink-muted">
            {decided
              ? `The supervisor has decided (${exclusionStatusLabels[review!.exclusionStatus].toLowerCase()}); the request can no longer change.`
              : "For an exception that does not come from model weakness. It still counts until the CRO records the supervisor's approval."}
          </span>
        </span>
      </label>
      <div className="flex items-center gap-3">
        <Button type="submit" disabled={save.isPending}>
          {save.isPending ? "Saving…" : review || conflict ? "Save review" : "Save first review"}
        </Button>
        <span className="text-xs text-ink-muted">{version > 0 ? `Editing version ${version}` : "No review yet"}</span>
      </div>
    </form>
  );
}

function EvidencePanel({
  code,
  day,
  canUpload,
  alsoInvalidate,
}: {
  code: string;
  day: ExceptionDayDto;
  canUpload: boolean;
  alsoInvalidate: readonly QueryKey[];
}) {
  const review = day.review;
  const inputRef = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const add = useAddEvidence(code, day.date, alsoInvalidate);
  const inputId = useId();
  const files = review?.evidence ?? [];
  return (
    <section aria-labelledby={`${inputId}-title`} className="flex flex-col gap-2">
      <h4 id={`${inputId}-title`} className="text-xs font-semibold tracking-wide text-ink-muted uppercase">
        Evidence
      </h4>
      {files.length === 0 ? (
        <p className="text-sm text-ink-muted">No file attached{canUpload && review ? " yet." : "."}</p>
      ) : (
        <ul className="flex flex-col divide-y divide-rule border-y border-rule text-sm">
          {files.map((f) => (
            <li key={f.id} className="flex flex-wrap items-baseline gap-x-3 py-1">
              <a href={evidenceHref(f.id)} download={f.fileName} className="font-medium">
                {f.fileName}
              </a>
              <span className="figures text-xs text-ink-muted">
                {formatBytes(f.sizeBytes)} · <PersonName email={f.uploadedBy} />, {formatDateTime(f.uploadedAt)} ·
                sha256 {f.sha256.slice(0, 12)}
              </span>
            </li>
          ))}
        </ul>
      )}
      {canUpload &&
        (review ? (
          <form
            className="flex flex-wrap items-end gap-3"
            onSubmit={(e) => {
              e.preventDefault();
              if (!file) return;
              add.mutate(file, {
                onSuccess: () => {
                  setFile(null);
                  if (inputRef.current) inputRef.current.value = "";
                },
              });
            }}
          >
            <div className="flex flex-col gap-1">
              <label htmlFor={inputId} className="text-xs font-medium text-ink-soft">
                Attach a file
              </label>
              <input
                ref={inputRef}
                id={inputId}
                type="file"
                accept={EVIDENCE_ACCEPT}
                onChange={(e) => setFile(e.target.files?.[0] ?? null)}
                className="text-sm file:mr-2 file:rounded-sm file:border file:border-rule-strong file:bg-paper-raised file:px-2 file:py-1 file:text-sm"
              />
              <p className="text-2xs text-ink-muted">PDF, PNG, JPEG, or text (.txt, .csv, .eml); at most 10 MB.</p>
            </div>
            <Button type="submit" variant="secondary" size="sm" disabled={!file || add.isPending}>
              {add.isPending ? "Uploading…" : "Upload"}
            </Button>
            {add.error && (
              <div className="basis-full">
                <FormMessage>
                  {isApiError(add.error) ? add.error.message : "The file could not be uploaded."}
                </FormMessage>
              </div>
            )}
          </form>
        ) : (
          <p className="text-xs text-ink-muted">Save the review first; evidence files attach to it.</p>
        ))}
    </section>
  );
}

function CroDecisionForm({
  code,
  review,
  date,
  alsoInvalidate,
}: {
  code: string;
  review: Review;
  date: string;
  alsoInvalidate: readonly QueryKey[];
}) {
  const [decision, setDecision] = useState<"approved" | "rejected" | "">("");
  const [reference, setReference] = useState("");
  const [decidedOn, setDecidedOn] = useState("");
  const [correctionReason, setCorrectionReason] = useState("");
  // A decision already recorded is corrected by a new record that says why; the first stays visible.
  const correcting = review.exclusionStatus === "approved" || review.exclusionStatus === "rejected";
  const [errors, setErrors] = useState<FieldErrors>({});
  const [conflict, setConflict] = useState<Review | null>(null);
  const formRef = useRef<HTMLFormElement>(null);
  const record = useRecordDecision(code, date, alsoInvalidate);
  const version = conflict?.version ?? review.version;
  const groupId = useId();

  function submit(e: FormEvent) {
    e.preventDefault();
    const checked = validate(decisionBodySchema, {
      decision: decision || undefined,
      reference,
      decidedOn,
      version,
      correctionReason: correcting ? correctionReason : undefined,
    });
    if (!checked.ok) {
      setErrors({
        ...checked.errors,
        decision: checked.errors.decision ? "Choose what the supervisor decided" : undefined,
        decidedOn:
          checked.errors.decidedOn && decidedOn.trim() === ""
            ? "Give the date of the supervisor's decision"
            : checked.errors.decidedOn,
      });
      focusFirstInvalid(formRef.current);
      return;
    }
    setErrors({});
    record.mutate(checked.data, {
      onSuccess: () => {
        setConflict(null);
        setDecision("");
        setReference("");
        setDecidedOn("");
        setCorrectionReason("");
      },
      onError: (err) => {
        const current = currentReviewOf(err);
        if (current) setConflict(current);
        const fields = fieldErrorsOf(err);
        if (Object.keys(fields).length) setErrors(fields);
      },
    });
  }

  const failed =
    record.error && !currentReviewOf(record.error) && Object.keys(fieldErrorsOf(record.error)).length === 0
      ? record.error
      : null;
  return (
    <form
      ref={formRef}
      onSubmit={submit}
      noValidate
      aria-label="Supervisor's decision on the exclusion"
      className="flex max-w-2xl flex-col gap-3"
    >
      <h4 className="text-sm font-semibold">
        {correcting ? "Correct the recorded decision" : "Record the supervisor's decision"}
      </h4>
      <p className="text-xs text-ink-muted">
        {correcting
          ? "A recorded decision is never edited: the correction is a new record that supersedes it, with your reason, and both stay visible."
          : "The analyst asked the supervisor to disregard this exception. An approval takes it out of the counted figure where the rule set allows it."}
      </p>
      {conflict && (
        <SavedMeanwhile
          current={conflict}
          mine="The review changed since you opened it; check it before you record the decision again."
        />
      )}
      <FormMessage>{errorMessage(failed, "The decision could not be recorded.")}</FormMessage>
      <fieldset aria-describedby={errors.decision ? `${groupId}-err` : undefined} className="flex flex-col gap-1">
        <legend className="text-xs font-medium text-ink-soft">Decision</legend>
        <div className="flex gap-5 text-sm">
          {(["approved", "rejected"] as const).map((d) => (
            <label key={d} className="flex items-center gap-1.5">
              <input
                type="radio"
                name={`${groupId}-decision`}
                value={d}
                checked={decision === d}
                onChange={() => setDecision(d)}
                aria-invalid={errors.decision ? true : undefined}
                className="accent-accent"
              />
              {d === "approved" ? "Approved: disregard the exception" : "Refused: the exception counts"}
            </label>
          ))}
        </div>
        {errors.decision && (
          <p id={`${groupId}-err`} className="text-xs text-danger">
            {errors.decision}
          </p>
        )}
      </fieldset>
      <div className="flex flex-wrap gap-4">
        <TextField
          label="Supervisor's reference"
          value={reference}
          onChange={(e) => setReference(e.target.value)}
          error={errors.reference}
          className="w-64"
        />
        <TextField
          label="Decided on"
          placeholder="YYYY-MM-DD"
          inputMode="numeric"
          value={decidedOn}
          onChange={(e) => setDecidedOn(e.target.value)}
          error={errors.decidedOn}
          className="w-44"
        />
      </div>
      {correcting && (
        <TextareaField
          label="Why the recorded decision is corrected"
          rows={2}
          maxLength={500}
          value={correctionReason}
          onChange={(e) => setCorrectionReason(e.target.value)}
          error={errors.correctionReason}
        />
      )}
      <div>
        <Button type="submit" disabled={record.isPending}>
          {record.isPending ? "Recording…" : correcting ? "Record the correction" : "Record decision"}
        </Button>
      </div>
    </form>
  );
}

/** Everything about one exception: the figures of the day, its review, evidence and the decision, for the role at hand. */
export function ReviewPanel({
  code,
  day,
  role,
  currency,
  alsoInvalidate = [],
}: {
  code: string;
  day: ExceptionDayDto;
  role: Role;
  currency: string;
  alsoInvalidate?: readonly QueryKey[];
}) {
  const review = day.review;
  return (
    <section aria-labelledby="review-title" className="flex flex-col gap-4 border-t-2 border-ink pt-3">
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h3 id="review-title" className="text-base font-semibold">
          Exception of {formatBusinessDate(day.date)}
        </h3>
        <p className="figures text-sm text-ink-soft">
          {seriesOf(day)} P&amp;L · loss beyond VaR{" "}
          {day.actual && <>actual {formatAmount(day.excessActual, currency)}</>}
          {day.actual && day.hypothetical && " · "}
          {day.hypothetical && <>hypothetical {formatAmount(day.excessHypothetical, currency)}</>}
          {day.excluded && " · excluded from the count"}
        </p>
      </div>
      <PnlMakeUp day={day} currency={currency} />
      <div className="grid gap-6 lg:grid-cols-2">
        <div className="flex flex-col gap-4">
          {role === "analyst" ? (
            <AnalystReviewForm key={day.date} code={code} day={day} alsoInvalidate={alsoInvalidate} />
          ) : review ? (
            <ReviewRecord review={review} />
          ) : (
            <p className="text-sm text-ink-muted">
              Not reviewed yet. An analyst explains the exception here and may ask the supervisor to disregard it.
            </p>
          )}
          {role === "analyst" && review && review.exclusionStatus !== "none" && (
            <p className="max-w-2xl border-l-2 border-rule-strong pl-3 text-sm text-ink-soft">
              {exclusionStatusLabels[review.exclusionStatus]}
              {review.exclusionStatus === "requested"
                ? ": the CRO records the supervisor's decision here once it arrives."
                : ` (${review.decisionReference ?? "no reference"}, ${review.decisionDate ?? "—"}${review.decidedBy ? `, recorded by ${review.decidedBy}` : ""}).`}
            </p>
          )}
          {role === "analyst" && (review?.decisions?.length ?? 0) > 1 && (
            <div className="max-w-2xl text-sm text-ink-soft">
              <DecisionHistory decisions={review!.decisions!} />
            </div>
          )}
        </div>
        <div className="flex flex-col gap-5 lg:border-l lg:border-rule lg:pl-6">
          <EvidencePanel code={code} day={day} canUpload={role === "analyst"} alsoInvalidate={alsoInvalidate} />
          {role === "cro" && review && review.exclusionStatus !== "none" && (
            <CroDecisionForm
              key={day.date}
              code={code}
              review={review}
              date={day.date}
              alsoInvalidate={alsoInvalidate}
            />
          )}
        </div>
      </div>
    </section>
  );
}
