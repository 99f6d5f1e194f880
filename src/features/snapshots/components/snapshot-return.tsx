import { useState, type FormEvent } from "react";
import { TableDownloads } from "@/components/ui/table-downloads";
import { returnData, type ReturnField } from "@shared/backtest/return-data";
import type { Snapshot } from "@shared/schemas/snapshot";
import type { Role } from "@shared/schemas/common";
import { Button } from "@/components/ui/button";
import { FormMessage, TextField } from "@/components/ui/field";
import { Table, Td, Th, Tr } from "@/components/ui/table";
import { isApiError } from "@/lib/api-client";
import { focusWhenShown } from "@/lib/focus";
import { formatAmount, formatFactor } from "@/lib/format";
import { useSetReturnInputs } from "../api/snapshot-queries";
import { Subsection } from "@/components/ui/page-title";

function valueText(f: ReturnField): string {
  if (f.value === null) return f.analystInput ? "not entered" : "—";
  if (f.unit === "amount") return formatAmount(f.value, f.currency);
  if (f.unit === "factor") return formatFactor(f.value);
  return String(f.value);
}

/** The analyst enters the values the product does not hold; empty stays "not entered". */
function ReturnInputsForm({ snapshot, inputs }: { snapshot: Snapshot; inputs: ReturnField[] }) {
  const [text, setText] = useState<Record<string, string>>(() =>
    Object.fromEntries(inputs.map((f) => [f.key, f.value === null ? "" : String(f.value)])),
  );
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [saved, setSaved] = useState(false);
  const save = useSetReturnInputs(snapshot.id);

  async function onSubmit(e: FormEvent) {
    e.preventDefault();
    setSaved(false);
    const values: Record<string, number | null> = {};
    const wrong: Record<string, string> = {};
    for (const f of inputs) {
      const t = (text[f.key] ?? "").trim().replace(/,/g, "");
      const n = Number(t);
      if (t === "") values[f.key] = null;
      else if (!Number.isFinite(n) || n < 0) wrong[f.key] = "Enter an amount of 0 or more, or leave it empty";
      else values[f.key] = n;
    }
    setErrors(wrong);
    if (Object.keys(wrong).length) return;
    try {
      await save.mutateAsync({ values, version: snapshot.version });
      setSaved(true);
    } catch {
      // The refusal shows below the form.
    }
  }

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3" aria-labelledby="return-inputs-title">
      <h4 id="return-inputs-title" className="text-sm font-semibold">
        Values the product does not hold
      </h4>
      <p className="text-sm text-ink-soft">
        Enter them in {snapshot.figures.currency} before submitting; enter 0 where the entity has none. They are sealed
        with the figures when the CRO approves.
      </p>
      <div className="grid gap-3 sm:grid-cols-2 xl:grid-cols-3">
        {inputs.map((f) => (
          <TextField
            key={f.key}
            label={f.templateRow ? `${f.label} (${f.templateRow})` : f.label}
            inputMode="decimal"
            value={text[f.key] ?? ""}
            error={errors[f.key]}
            onChange={(e) => setText((t) => ({ ...t, [f.key]: e.target.value }))}
          />
        ))}
      </div>
      <div>
        <Button type="submit" disabled={save.isPending}>
          Save return values
        </Button>
      </div>
      {save.isError && (
        <FormMessage ref={focusWhenShown}>
          {isApiError(save.error) ? save.error.message : "The values were not saved. Try again."}
        </FormMessage>
      )}
      {saved && !save.isPending && <FormMessage tone="done">Return values saved.</FormMessage>}
    </form>
  );
}

/** The quarter's return data, read from the frozen figures by the engine's one list (docs/rules.md#return-data). */
export function SnapshotReturn({ snapshot, role }: { snapshot: Snapshot; role: Role }) {
  const data = returnData(snapshot.figures, snapshot.quarterEnd);
  const editable = role === "analyst" && (snapshot.status === "draft" || snapshot.status === "returned");
  const inputs = data.fields.filter((f) => f.analystInput);
  const missing = inputs.filter((f) => f.value === null).length;
  return (
    <Subsection titleId="return-title" title="Return data">
      <p className="text-sm text-ink-soft">
        What the quarter's supervisory return and disclosure take from these figures, with the template row where the
        standard names one.
        {missing > 0 &&
          ` ${missing} value${missing === 1 ? "" : "s"} the product does not hold ${missing === 1 ? "is" : "are"} not entered yet.`}
      </p>
      <TableDownloads path={`/api/snapshots/${snapshot.id}/return`} what="the return data" />
      {editable && inputs.length > 0 && <ReturnInputsForm key={snapshot.id} snapshot={snapshot} inputs={inputs} />}
      <Table caption={`Return data of ${snapshot.entity} for the quarter ending ${snapshot.quarterEnd}`}>
        <thead>
          <tr>
            <Th>Template row</Th>
            <Th>Field</Th>
            <Th numeric>Value</Th>
            <Th>Source</Th>
          </tr>
        </thead>
        <tbody>
          {data.fields.map((f) => (
            <Tr key={f.key}>
              <Td className="whitespace-nowrap">{f.templateRow ?? "—"}</Td>
              <Td>{f.label}</Td>
              <Td numeric data-testid={`return-${f.key}`}>
                {valueText(f)}
              </Td>
              <Td className="text-ink-muted">{f.source}</Td>
            </Tr>
          ))}
        </tbody>
      </Table>
    </Subsection>
  );
}
