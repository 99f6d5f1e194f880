import { useState, type FormEvent } from "react";
import { createPortfolioBodySchema, updatePortfolioBodySchema, type Portfolio } from "@shared/schemas/entity";
import type { PortfolioLevel } from "@shared/schemas/common";
import { Button } from "@/components/ui/button";
import { FormMessage, SelectField, TextField } from "@/components/ui/field";
import { HeadedForm, SubmitButton, useFormKit } from "@/components/ui/form-kit";
import { EmptyState, Table, TableHead, Td, Tr } from "@/components/ui/table";
import { fieldErrorsOf, isApiError } from "@/lib/api-client";
import { formLevelMessage, validate } from "@/lib/form";
import { useCreatePortfolio, useRenamePortfolio } from "../api/entity-queries";

const levelLabels: Record<PortfolioLevel, string> = { top: "Top of house", desk: "Trading desk" };

function RenameRow({
  entityCode,
  portfolio,
  onDone,
}: {
  entityCode: string;
  portfolio: Portfolio;
  onDone: (msg?: string) => void;
}) {
  const rename = useRenamePortfolio(entityCode);
  const [name, setName] = useState(portfolio.name);
  const [error, setError] = useState<string>();
  function submit(e: FormEvent) {
    e.preventDefault();
    const r = validate(updatePortfolioBodySchema, { name });
    if (!r.ok) return setError(r.errors.name);
    rename.mutate(
      { portfolio: portfolio.code, name: r.data.name },
      {
        onSuccess: () => onDone(`${portfolio.code} renamed.`),
        onError: (err) => setError(fieldErrorsOf(err).name ?? (isApiError(err) ? err.message : undefined)),
      },
    );
  }
  return (
    <form
      onSubmit={submit}
      noValidate
      className="flex flex-wrap items-end gap-2"
      aria-label={`Rename ${portfolio.code}`}
    >
      <TextField
        label={`New name for ${portfolio.code}`}
        value={name}
        autoFocus
        onChange={(e) => setName(e.target.value)}
        error={error}
        className="w-72"
      />
      <Button type="submit" size="sm" disabled={rename.isPending}>
        Save
      </Button>
      <Button variant="secondary" size="sm" onClick={() => onDone()}>
        Cancel
      </Button>
    </form>
  );
}

function AddPortfolioForm({ entityCode, hasTop }: { entityCode: string; hasTop: boolean }) {
  const create = useCreatePortfolio(entityCode);
  const { formRef, values, setValues, check, send, field } = useFormKit({
    code: "",
    name: "",
    level: (hasTop ? "desk" : "top") as PortfolioLevel,
  });

  function submit(e: FormEvent) {
    e.preventDefault();
    create.reset();
    const data = check(createPortfolioBodySchema, { ...values, code: values.code.trim().toUpperCase() });
    if (data) send(create, data, () => setValues({ code: "", name: "", level: "desk" }));
  }

  return (
    <HeadedForm
      formRef={formRef}
      onSubmit={submit}
      titleId="add-portfolio-title"
      title="Add a portfolio"
      level={3}
      className="flex flex-col gap-2"
    >
      <FormMessage>{formLevelMessage(create.error)}</FormMessage>
      <div className="flex flex-wrap items-start gap-2">
        <TextField label="Code" {...field("code")} className="w-40" hint="e.g. LKS-UK-RATES" />
        <TextField label="Name" {...field("name")} className="w-64" />
        <SelectField label="Level" {...field("level")} className="w-40">
          <option value="top">{levelLabels.top}</option>
          <option value="desk">{levelLabels.desk}</option>
        </SelectField>
        <SubmitButton pending={create.isPending} busyLabel="Adding…" className="mt-5">
          Add portfolio
        </SubmitButton>
      </div>
    </HeadedForm>
  );
}

export function PortfoliosPanel({
  entityCode,
  portfolios,
  isFrtb,
}: {
  entityCode: string;
  portfolios: Portfolio[];
  isFrtb: boolean;
}) {
  const [renaming, setRenaming] = useState<string | null>(null);
  const [notice, setNotice] = useState<string>();
  // Top of house first, then desks, each by code.
  const sorted = [...portfolios].sort((a, b) =>
    a.level === b.level ? a.code.localeCompare(b.code) : a.level === "top" ? -1 : 1,
  );
  const hasTop = portfolios.some((p) => p.level === "top");

  return (
    <section aria-labelledby="portfolios-title" className="flex flex-col gap-3">
      <h2 id="portfolios-title">Portfolios</h2>
      <p className="text-sm text-ink-muted">
        Backtesting runs per portfolio: one top-of-house portfolio for the entity
        {isFrtb ? ", plus one per trading desk for the FRTB desk tests" : ", and desks where you report them"}.
      </p>
      <FormMessage tone="done">{notice}</FormMessage>
      {sorted.length === 0 ? (
        <EmptyState title="No portfolios yet">
          Add the top-of-house portfolio first; daily data is uploaded against its code.
        </EmptyState>
      ) : (
        <Table caption={`Portfolios of ${entityCode}`}>
          <TableHead columns={["Code", "Name", "Level", { actions: "Actions" }]} />
          <tbody>
            {sorted.map((p) => (
              <Tr key={p.code}>
                <Td className="font-medium whitespace-nowrap">{p.code}</Td>
                <Td>
                  {renaming === p.code ? (
                    <RenameRow
                      entityCode={entityCode}
                      portfolio={p}
                      onDone={(msg) => {
                        setRenaming(null);
                        setNotice(msg);
                      }}
                    />
                  ) : (
                    p.name
                  )}
                </Td>
                <Td>{levelLabels[p.level]}</Td>
                <Td className="text-right">
                  {renaming !== p.code && (
                    <Button
                      variant="quiet"
                      size="sm"
                      aria-label={`Rename ${p.code}`}
                      onClick={() => setRenaming(p.code)}
                    >
                      Rename
                    </Button>
                  )}
                </Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      )}
      <AddPortfolioForm entityCode={entityCode} hasTop={hasTop} />
    </section>
  );
}
