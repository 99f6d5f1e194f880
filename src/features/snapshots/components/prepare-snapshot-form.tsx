import { useRef, useState, type FormEvent } from "react";
import { Link } from "react-router-dom";
import { createSnapshotSchema, type Snapshot, type SnapshotListItem } from "@shared/schemas/snapshot";
import { quarterLabel } from "@shared/backtest/quarters";
import { Button } from "@/components/ui/button";
import { FormMessage, SelectField } from "@/components/ui/field";
import { fieldErrorsOf, isApiError } from "@/lib/api-client";
import { focusWhenShown } from "@/lib/focus";
import { focusFirstInvalid, formLevelMessage, validate, type FieldErrors } from "@/lib/form";
import { blockingSnapshotOf, usePrepareSnapshot } from "../api/snapshot-queries";
import { snapshotStatusLabels } from "@/lib/snapshot-status-labels";

/** What preparing this quarter again would do, said before the button is pressed. */
function hintFor(quarterEnd: string, existing: SnapshotListItem | undefined): string {
  const label = quarterLabel(quarterEnd);
  if (!existing) return `Freezes ${label}'s figures as they stand on today's data, as a draft to check and submit.`;
  if (existing.status === "draft" || existing.status === "returned")
    return `${label} already has a ${snapshotStatusLabels[existing.status].toLowerCase()} snapshot: it is computed again from today's data and stays a draft.`;
  return `${label} is ${snapshotStatusLabels[existing.status].toLowerCase()}; its figures can no longer be prepared again.`;
}

/** The analyst's form: choose an ended quarter and freeze its figures as a draft. */
export function PrepareSnapshotForm({
  entity,
  quarterEnds,
  snapshots,
  snapshotHref,
  onPrepared,
}: {
  entity: string;
  /** Ended quarter ends, newest first; the first is the default. */
  quarterEnds: string[];
  snapshots: SnapshotListItem[];
  snapshotHref: (id: number) => string;
  onPrepared: (snapshot: Snapshot) => void;
}) {
  const prepare = usePrepareSnapshot();
  const formRef = useRef<HTMLFormElement>(null);
  // The quarter's original snapshot: an amendment of a filed quarter is prepared from that snapshot's view.
  const existingOf = (q: string) => snapshots.find((s) => s.quarterEnd === q && s.amends === null);
  const preparable = (q: string) => {
    const s = existingOf(q);
    return !s || s.status === "draft" || s.status === "returned";
  };
  // The newest quarter that can still be prepared; the newest one when all are signed off.
  const [quarterEnd, setQuarterEnd] = useState(quarterEnds.find(preparable) ?? quarterEnds[0] ?? "");
  const [errors, setErrors] = useState<FieldErrors>({});
  const [done, setDone] = useState<string>();
  const existing = existingOf(quarterEnd);

  function submit(e: FormEvent) {
    e.preventDefault();
    prepare.reset();
    setDone(undefined);
    const r = validate(createSnapshotSchema, { entity, quarterEnd });
    if (!r.ok) {
      setErrors(r.errors);
      return focusFirstInvalid(formRef.current);
    }
    setErrors({});
    prepare.mutate(r.data, {
      onSuccess: (s) => {
        const again = existing !== undefined;
        setDone(
          `${quarterLabel(s.quarterEnd)} for ${s.entity} ${again ? "was computed again" : "is prepared"} as a draft: check the figures below, then submit it for sign-off.`,
        );
        onPrepared(s);
      },
      onError: (err) => {
        const fields = fieldErrorsOf(err);
        if (Object.keys(fields).length) {
          setErrors(fields);
          focusFirstInvalid(formRef.current);
        }
      },
    });
  }

  const formError = formLevelMessage(prepare.error);
  const blocking =
    blockingSnapshotOf(prepare.error) ??
    (isApiError(prepare.error) && prepare.error.status === 409 ? existing?.id : undefined);
  return (
    <form ref={formRef} onSubmit={submit} noValidate aria-labelledby="prepare-title" className="flex flex-col gap-3">
      <h2 id="prepare-title">Prepare a snapshot</h2>
      {formError && (
        <FormMessage ref={focusWhenShown}>
          {formError}
          {blocking && (
            <>
              {" "}
              <Link to={snapshotHref(blocking)}>Open {quarterLabel(quarterEnd)}</Link>
            </>
          )}
        </FormMessage>
      )}
      <FormMessage tone="done" ref={focusWhenShown}>
        {done}
      </FormMessage>
      <div className="flex flex-wrap items-start gap-3">
        <SelectField
          label="Quarter end"
          value={quarterEnd}
          onChange={(e) => {
            setQuarterEnd(e.target.value);
            setDone(undefined);
            prepare.reset();
          }}
          error={errors.quarterEnd}
          hint={quarterEnd ? hintFor(quarterEnd, existing) : undefined}
          className="w-72"
        >
          {quarterEnds.map((q) => {
            const s = existingOf(q);
            return (
              <option key={q} value={q}>
                {`${quarterLabel(q)} · ${q}${s ? ` · ${snapshotStatusLabels[s.status]}` : ""}`}
              </option>
            );
          })}
        </SelectField>
        <Button type="submit" className="mt-5" disabled={prepare.isPending || !quarterEnd || !preparable(quarterEnd)}>
          {prepare.isPending ? "Computing the figures…" : "Prepare the snapshot"}
        </Button>
      </div>
      {errors.entity && <FormMessage>{errors.entity}</FormMessage>}
    </form>
  );
}
