import { useState, type FormEvent } from "react";
import {
  CALENDAR_COUNTRIES,
  createEntityBodySchema,
  defaultCountryOf,
  updateEntityBodySchema,
  type CalendarCountry,
  type Entity,
} from "@shared/schemas/entity";
import type { PnlBasis, RegimeId } from "@shared/schemas/common";
import { FormMessage, SelectField, TextField } from "@/components/ui/field";
import { SubmitButton, useFormKit } from "@/components/ui/form-kit";
import { formLevelMessage, splitList, validate } from "@/lib/form";
import { useCreateEntity, useUpdateEntity } from "../api/entity-queries";
import { defaultPnlBasis, pnlBasisIds, pnlBasisLabels, regimeIds, regimeLabels } from "@/lib/regime-labels";

type Values = {
  code: string;
  name: string;
  regime: RegimeId;
  pnlBasis: PnlBasis;
  currency: string;
  /** "" = not chosen: the server takes the currency's country (none for EUR). */
  country: string;
  qualitativeAddend: string;
  supervisorName: string;
  supervisorEmails: string;
};

const blank: Values = {
  code: "",
  name: "",
  regime: "eu",
  pnlBasis: defaultPnlBasis.eu,
  currency: "",
  country: "",
  qualitativeAddend: "0",
  supervisorName: "",
  supervisorEmails: "",
};

function valuesOf(e: Entity): Values {
  return {
    code: e.code,
    name: e.name,
    regime: e.regime,
    pnlBasis: e.pnlBasis,
    currency: e.currency,
    country: e.country ?? "",
    qualitativeAddend: String(e.qualitativeAddend),
    supervisorName: e.supervisorName ?? "",
    supervisorEmails: e.supervisorEmails.join(", "),
  };
}

/** Form text → API body; `undefined` addend means "not a number" and is reported beside the field. */
function toBody(v: Values) {
  const addend = v.qualitativeAddend.trim() === "" ? 0 : Number(v.qualitativeAddend);
  return {
    code: v.code.trim().toUpperCase(),
    name: v.name,
    regime: v.regime,
    pnlBasis: v.pnlBasis,
    currency: v.currency.trim().toUpperCase(),
    country: v.country === "" ? undefined : v.country,
    qualitativeAddend: Number.isFinite(addend) ? addend : undefined,
    supervisorName: v.supervisorName.trim() === "" ? null : v.supervisorName,
    supervisorEmails: splitList(v.supervisorEmails),
  };
}

const countryCodes = (Object.keys(CALENDAR_COUNTRIES) as CalendarCountry[]).sort((a, b) =>
  CALENDAR_COUNTRIES[a].localeCompare(CALENDAR_COUNTRIES[b]),
);

/** What the country field decides: whose public holidays the calendar imports. */
function countryHint(v: Values): string {
  if (v.country !== "") return "Its public holidays are imported into the calendar, a year at a time";
  const derived = defaultCountryOf(v.currency.trim());
  if (derived) return `Unset: ${CALENDAR_COUNTRIES[derived]}, from the currency`;
  return "Choose one to import its public holidays; the euro names no country";
}

type Props = { mode: "create"; onCreated?: (e: Entity) => void } | { mode: "edit"; entity: Entity };

export function EntityForm(props: Props) {
  const editing = props.mode === "edit" ? props.entity : undefined;
  const create = useCreateEntity();
  const update = useUpdateEntity(editing?.code ?? "");
  const mutation = editing ? update : create;
  const { formRef, values, setValues, setErrors, done, setDone, fail, check, send, field } = useFormKit(
    editing ? valuesOf(editing) : blank,
  );
  const [pnlTouched, setPnlTouched] = useState(Boolean(editing));

  function setRegime(regime: RegimeId) {
    // The P&L basis follows the rule set's default until someone picks one on purpose.
    setValues((v) => ({ ...v, regime, pnlBasis: pnlTouched ? v.pnlBasis : defaultPnlBasis[regime] }));
  }

  function submit(e: FormEvent) {
    e.preventDefault();
    setDone(undefined);
    mutation.reset();
    const body = toBody(values);
    const addendError =
      body.qualitativeAddend === undefined ? { qualitativeAddend: "Enter a number between 0 and 1, such as 0.25" } : {};

    if (!editing) {
      const r = validate(createEntityBodySchema, body);
      if (!r.ok || addendError.qualitativeAddend) return fail({ ...(r.ok ? {} : r.errors), ...addendError });
      send(create, r.data, (entity) => {
        setValues(blank);
        setPnlTouched(false);
        setDone(`${entity.code} added. Open it to add portfolios and its holiday calendar.`);
        if (props.mode === "create") props.onCreated?.(entity);
      });
      return;
    }

    // Send only what changed, so the audit log shows exactly what was edited.
    const { code: _code, ...rest } = body;
    const before = toBody(valuesOf(editing));
    const changed = Object.fromEntries(
      Object.entries(rest).filter(([k, v]) => JSON.stringify(v) !== JSON.stringify(before[k as keyof typeof before])),
    );
    if (addendError.qualitativeAddend) return fail(addendError);
    if (Object.keys(changed).length === 0) {
      setErrors({});
      setDone("Nothing has changed.");
      return;
    }
    // The version we read: if someone else saved in between, the server refuses with 409.
    const data = check(updateEntityBodySchema, { ...changed, version: editing.version });
    if (data) send(update, data, () => setDone("Changes saved."));
  }

  const titleId = editing ? "edit-entity-title" : "create-entity-title";
  const pnlBasis = field("pnlBasis");

  return (
    <form ref={formRef} onSubmit={submit} noValidate aria-labelledby={titleId} className="flex flex-col gap-3">
      <h2 id={titleId}>{editing ? "Entity settings" : "Add an entity"}</h2>
      <FormMessage>{formLevelMessage(mutation.error)}</FormMessage>
      <FormMessage tone="done">{done}</FormMessage>
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-4">
        {!editing && <TextField label="Code" {...field("code")} hint="e.g. LKS-EU; cannot change later" />}
        <TextField label="Name" {...field("name")} className={editing ? "lg:col-span-2" : ""} />
        <SelectField label="Rule set" {...field("regime")} onChange={(e) => setRegime(e.target.value as RegimeId)}>
          {regimeIds.map((r) => (
            <option key={r} value={r}>
              {regimeLabels[r]}
            </option>
          ))}
        </SelectField>
        <SelectField
          label="P&L basis for the count"
          {...pnlBasis}
          onChange={(e) => {
            setPnlTouched(true);
            pnlBasis.onChange(e);
          }}
          hint={`Default for ${regimeLabels[values.regime]}: ${pnlBasisLabels[defaultPnlBasis[values.regime]]}`}
        >
          {pnlBasisIds.map((b) => (
            <option key={b} value={b}>
              {pnlBasisLabels[b]}
            </option>
          ))}
        </SelectField>
        <TextField label="Currency" {...field("currency")} hint="ISO 4217, e.g. EUR" maxLength={3} />
        <SelectField label="Calendar country" {...field("country")} hint={countryHint(values)}>
          {/* A chosen country can be changed, not cleared: the imported days stay until the next import. */}
          {!editing?.country && <option value="">Not chosen</option>}
          {countryCodes.map((c) => (
            <option key={c} value={c}>
              {CALENDAR_COUNTRIES[c]}
            </option>
          ))}
        </SelectField>
        <TextField
          label="Qualitative addend"
          inputMode="decimal"
          {...field("qualitativeAddend")}
          hint="Set by the supervisor, 0 to 1; added to the multiplier"
          className="figures"
        />
        <TextField label="Supervisor" {...field("supervisorName")} hint="Optional" />
        <TextField
          label="Supervisor contact e-mails"
          {...field("supervisorEmails")}
          hint="Separate with commas; filing packs go to these addresses"
          className="lg:col-span-2"
        />
      </div>
      <div>
        <SubmitButton pending={mutation.isPending} busyLabel="Saving…">
          {editing ? "Save changes" : "Add entity"}
        </SubmitButton>
      </div>
    </form>
  );
}
