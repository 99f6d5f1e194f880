import type { FormEvent } from "react";
import { proposeSettingsSchema } from "@shared/schemas/determination";
import type { RegimeId } from "@shared/schemas/common";
import { FormMessage, SelectField, TextField } from "@/components/ui/field";
import { SubmitButton, useFormKit } from "@/components/ui/form-kit";
import { fieldErrorsOf, isApiError } from "@/lib/api-client";
import type { FieldErrors } from "@/lib/form";
import { pnlBasisIds, pnlBasisLabels } from "@/lib/regime-labels";
import { useProposeSettings } from "../api/settings-queries";
import { frequencyLabels } from "../words";

type Values = {
  effectiveFrom: string;
  reference: string;
  qualitativeAddend: string;
  qualitativeAddendSvar: string;
  multiplierFloor: string;
  pnlBasis: string;
  determinationFrequency: string;
};

const blank: Values = {
  effectiveFrom: "",
  reference: "",
  qualitativeAddend: "",
  qualitativeAddendSvar: "",
  multiplierFloor: "",
  pnlBasis: "",
  determinationFrequency: "",
};

/** An empty field leaves the value as in force on the effective date; text that is no number is kept so the schema names it. */
const numberOrUnset = (text: string): number | string | undefined => {
  const t = text.trim();
  if (t === "") return undefined;
  const n = Number(t);
  return Number.isFinite(n) ? n : t;
};

/**
 * An administrator proposes a change of the supervisor's settings: the decision reference, the date
 * it takes effect, and only the values that change. Checked with the server's own schema before
 * anything is sent; nothing changes until a chief risk officer approves it.
 */
export function ProposeSettingsForm({ entity, regime }: { entity: string; regime: RegimeId }) {
  const propose = useProposeSettings(entity);
  const { formRef, values, setValues, errors, done, setDone, check, send, field } = useFormKit(blank, {
    clearOnEdit: true,
  });
  // The server's refusals of single fields stand beside them until the field is edited.
  const bound = (k: keyof Values) => ({ ...field(k), error: { ...fieldErrorsOf(propose.error), ...errors }[k] });

  function submit(e: FormEvent) {
    e.preventDefault();
    const input = {
      effectiveFrom: values.effectiveFrom.trim(),
      reference: values.reference,
      qualitativeAddend: numberOrUnset(values.qualitativeAddend),
      qualitativeAddendSvar: regime === "eu" ? numberOrUnset(values.qualitativeAddendSvar) : undefined,
      multiplierFloor: numberOrUnset(values.multiplierFloor),
      pnlBasis: values.pnlBasis || undefined,
      determinationFrequency: values.determinationFrequency || undefined,
    };
    const data = check(proposeSettingsSchema, input, (errors) => {
      const typed: FieldErrors = { ...errors };
      // A number field with letters in it reads "Expected number" from zod; say it plainly.
      for (const k of ["qualitativeAddend", "qualitativeAddendSvar", "multiplierFloor"] as const)
        if (typed[k] && typeof numberOrUnset(values[k]) === "string") typed[k] = "A number, such as 0.5";
      if (typed.effectiveFrom) typed.effectiveFrom = "A date as YYYY-MM-DD";
      return typed;
    });
    if (!data) return;
    send(propose, data, (record) => {
      setValues(blank);
      setDone(
        `Proposed: ${record.reference}, from ${record.effectiveFrom}. Nothing changes until a chief risk officer approves it.`,
      );
    });
  }

  return (
    <form
      ref={formRef}
      onSubmit={submit}
      noValidate
      aria-label="Propose a settings change"
      className="flex flex-col gap-3"
    >
      {/* The server's own refusals (a signed-off quarter, a change that changes nothing) explain themselves. */}
      <FormMessage>{isApiError(propose.error) ? propose.error.message : undefined}</FormMessage>
      <FormMessage tone="done">{done}</FormMessage>
      <div className="flex flex-wrap items-start gap-4">
        <TextField
          label="Effective from"
          inputMode="numeric"
          placeholder="YYYY-MM-DD"
          {...bound("effectiveFrom")}
          hint="The first day the change applies"
          className="w-44"
        />
        <TextField
          label="Supervisor's decision reference"
          {...bound("reference")}
          hint="As written on the supervisor's letter"
          className="w-72"
        />
      </div>
      <p className="text-xs text-ink-muted">Leave a value empty to keep the one in force on that date.</p>
      <div className="flex flex-wrap items-start gap-4">
        <TextField
          label="Qualitative addend"
          inputMode="decimal"
          {...bound("qualitativeAddend")}
          hint="0 to 3"
          className="w-40"
        />
        {regime === "eu" && (
          <TextField
            label="Stressed VaR addend"
            inputMode="decimal"
            {...bound("qualitativeAddendSvar")}
            hint="0 to 3 (CRR Art. 366)"
            className="w-44"
          />
        )}
        <TextField
          label="Multiplier floor"
          inputMode="decimal"
          {...bound("multiplierFloor")}
          hint="The lowest multiplier allowed"
          className="w-44"
        />
        <SelectField label="P&L basis" {...bound("pnlBasis")} className="w-60">
          <option value="">As in force</option>
          {pnlBasisIds.map((b) => (
            <option key={b} value={b}>
              {pnlBasisLabels[b]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Determination frequency" {...bound("determinationFrequency")} className="w-48">
          <option value="">As in force</option>
          {(Object.keys(frequencyLabels) as (keyof typeof frequencyLabels)[]).map((f) => (
            <option key={f} value={f}>
              {frequencyLabels[f]}
            </option>
          ))}
        </SelectField>
      </div>
      <div>
        <SubmitButton pending={propose.isPending} busyLabel="Proposing…">
          Propose the change
        </SubmitButton>
      </div>
    </form>
  );
}
