import { useRef, useState, type FormEvent, type ReactNode } from "react";
import { useQuery } from "@tanstack/react-query";
import { whatIfBodySchema, type WhatIfResponse } from "@shared/schemas/capital";
import { Button } from "@/components/ui/button";
import { FormMessage, TextField } from "@/components/ui/field";
import { Table, Td, Th, Tr } from "@/components/ui/table";
import { ZoneBadge } from "@/components/ui/zone-badge";
import { fieldErrorsOf, isApiError } from "@/lib/api-client";
import { focusFirstInvalid, validate, type FieldErrors } from "@/lib/form";
import { formatAmount, formatChange, formatFactor } from "@/lib/format";
import { bitesFromWords, periodLabel } from "@/lib/determination-words";
import { capitalQueries, type WhatIfInputs } from "../api/capital-queries";

const FIELDS = ["extraExceptions", "varScale", "svarScale"] as const;
type Field = (typeof FIELDS)[number];
type Values = Record<Field, string>;

/** The typed text as a number for the schema to judge; an empty or unreadable field stays a string so the schema refuses it. */
function numberOf(text: string): number | string {
  const t = text.trim().replace(",", ".");
  return t !== "" && Number.isFinite(Number(t)) ? Number(t) : text;
}

/** The schema's words, save for text that is not a number at all. */
function messageFor(values: Values, errors: FieldErrors): FieldErrors {
  const out: FieldErrors = { ...errors };
  for (const f of FIELDS) if (out[f] && typeof numberOf(values[f]) === "string") out[f] = "Enter a number";
  return out;
}

function ResultTable({ result, regime }: { result: WhatIfResponse; regime: string }) {
  const { base, scenario, delta, currency } = result;
  const amount = (v: number) => formatAmount(v, currency);
  const row = (label: string, b: ReactNode, s: ReactNode, d: ReactNode, testId: string) => (
    <Tr data-testid={testId}>
      <th scope="row" className="border-b border-rule px-2 py-1.5 text-left align-top font-medium text-ink">
        {label}
      </th>
      <Td numeric>{b}</Td>
      <Td numeric>{s}</Td>
      <Td numeric className="font-medium">
        {d}
      </Td>
    </Tr>
  );
  return (
    <Table caption={`What-if as of ${result.asOf}: today, the scenario and the change`}>
      <thead>
        <tr>
          <Th>Figure</Th>
          <Th numeric>Today</Th>
          <Th numeric>Scenario</Th>
          <Th numeric>Change</Th>
        </tr>
      </thead>
      <tbody>
        {row(
          "Traffic-light zone",
          <ZoneBadge zone={base.zone} regime={regime} />,
          <ZoneBadge zone={scenario.zone} regime={regime} />,
          delta.zoneChanged ? "Changes" : "No change",
          "what-if-zone",
        )}
        {row(
          "Counted exceptions",
          base.counted,
          scenario.counted,
          formatChange(delta.counted, String),
          "what-if-counted",
        )}
        {row(
          "Plus factor",
          formatFactor(base.plusFactor),
          formatFactor(scenario.plusFactor),
          formatChange(delta.plusFactor, formatFactor),
          "what-if-plus-factor",
        )}
        {row(
          "Multiplier",
          formatFactor(base.multiplier),
          formatFactor(scenario.multiplier),
          formatChange(delta.multiplier, formatFactor),
          "what-if-multiplier",
        )}
        {row(
          "Capital requirement",
          amount(base.capital),
          amount(scenario.capital),
          formatChange(delta.capital, amount),
          "what-if-capital",
        )}
        {row(
          "Capital add-on",
          amount(base.addOn),
          amount(scenario.addOn),
          formatChange(delta.addOn, amount),
          "what-if-add-on",
        )}
      </tbody>
    </Table>
  );
}

/**
 * Treasury's question, asked directly: what if more exceptions came, or VaR and stressed VaR rose?
 * The form is checked with the server's own schema; nothing is sent until it passes.
 */
export function WhatIfForm({ entity, regime }: { entity: string; regime: string }) {
  const formRef = useRef<HTMLFormElement>(null);
  const [values, setValues] = useState<Values>({ extraExceptions: "1", varScale: "1", svarScale: "1" });
  const [clientErrors, setClientErrors] = useState<FieldErrors>({});
  const [asked, setAsked] = useState<WhatIfInputs | null>(null);
  const result = useQuery({
    ...capitalQueries.whatIf(entity, asked ?? whatIfBodySchema.parse({})),
    enabled: asked !== null,
  });

  const serverFields = fieldErrorsOf(result.error);
  const errors: FieldErrors = Object.keys(clientErrors).length ? clientErrors : serverFields;
  // A refusal that names no field of this form (a data problem, an as-of date) is said above it.
  const formError =
    isApiError(result.error) && !FIELDS.some((f) => serverFields[f]) && Object.keys(clientErrors).length === 0
      ? result.error.message
      : undefined;

  function submit(e: FormEvent) {
    e.preventDefault();
    const r = validate(whatIfBodySchema, {
      extraExceptions: numberOf(values.extraExceptions),
      varScale: numberOf(values.varScale),
      svarScale: numberOf(values.svarScale),
    });
    if (!r.ok) {
      setClientErrors(messageFor(values, r.errors));
      return focusFirstInvalid(formRef.current);
    }
    setClientErrors({});
    // The same scenario again after a failed answer: ask once more (a network blip may have passed).
    if (asked && result.isError && JSON.stringify(asked) === JSON.stringify(r.data)) void result.refetch();
    else setAsked(r.data);
  }

  const field = (name: Field, label: string, hint: string, step: string) => (
    <TextField
      label={label}
      name={name}
      type="number"
      step={step}
      min={0}
      value={values[name]}
      onChange={(e) => setValues((v) => ({ ...v, [name]: e.target.value }))}
      error={errors[name]}
      hint={hint}
      className="w-52"
    />
  );

  const shown = result.data && asked ? result.data : undefined;
  return (
    <section aria-labelledby="what-if-title" className="flex flex-col gap-3">
      <div className="flex flex-col gap-1">
        <h2 id="what-if-title">What if</h2>
        <p className="text-sm text-ink-soft">
          Add exceptions to today's count, or scale the capital inputs, and see the zone, multiplier and capital that
          would follow. Nothing is saved.
        </p>
      </div>
      <form ref={formRef} onSubmit={submit} noValidate aria-label="What-if scenario" className="flex flex-col gap-3">
        <FormMessage>{formError}</FormMessage>
        <div className="flex flex-wrap items-start gap-4">
          {field("extraExceptions", "Extra exceptions", "Whole number, 0 or more", "1")}
          {field("varScale", "VaR (FRTB: ES) scale", "1 = today's figure", "0.05")}
          {field("svarScale", "stressed VaR (FRTB: SES) scale", "1 = today's figure", "0.05")}
          <Button type="submit" className="mt-5" disabled={result.isFetching}>
            {result.isFetching ? "Computing…" : "Compute the scenario"}
          </Button>
        </div>
      </form>
      {shown && (
        <div className="flex flex-col gap-2" aria-live="polite">
          <p className="text-sm text-ink-soft">
            {shown.portfolio} as of <span className="figures">{shown.asOf}</span>: {asked!.extraExceptions} extra{" "}
            {asked!.extraExceptions === 1 ? "exception" : "exceptions"}, VaR × {asked!.varScale}, stressed VaR ×{" "}
            {asked!.svarScale}
            {regime === "frtb" ? " (ES and SES for FRTB)" : ""}.
          </p>
          <ResultTable result={shown} regime={regime} />
          <p className="text-sm text-ink-soft" data-testid="what-if-bites-from">
            {shown.startsFrom.kind === "approved" && shown.startsFrom.quarterEnd
              ? `Starts from the ${shown.startsFrom.status ?? "approved"} ${periodLabel(shown.startsFrom.quarterEnd)} determination. `
              : ""}
            Exceptions after {shown.asOf} would change the multiplier in force {bitesFromWords(shown.bitesFrom)}.
          </p>
        </div>
      )}
    </section>
  );
}
