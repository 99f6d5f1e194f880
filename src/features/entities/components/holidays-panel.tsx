import { useRef, useState, type FormEvent } from "react";
import {
  CALENDAR_COUNTRIES,
  createHolidayBodySchema,
  holidayImportPreviewSchema,
  type CalendarCountry,
  type Holiday,
  type HolidayImportPreview,
} from "@shared/schemas/entity";
import { Button } from "@/components/ui/button";
import { Confirmation } from "@/components/ui/confirmation";
import { FormMessage, TextField } from "@/components/ui/field";
import { HeadedForm, SubmitButton, useFormKit } from "@/components/ui/form-kit";
import { EmptyState, Table, TableHead, Td, Tr } from "@/components/ui/table";
import { isApiError, staleCurrent } from "@/lib/api-client";
import { formLevelMessage } from "@/lib/form";
import { formatBusinessDate } from "@/lib/format";
import { useAddHoliday, useHolidayImportPreview, useImportHolidays, useRemoveHoliday } from "../api/entity-queries";

const sourceLabels = { library: "Public holiday (library)", bank: "Bank closing day" } as const;

const days = (n: number) => `${n} ${n === 1 ? "day" : "days"}`;

/** The confirmation's words: how many days change, which way, and that the windows move. */
function importConsequence(entityCode: string, p: HolidayImportPreview): string {
  const parts = [];
  const one = (n: number, single: string, many: string) => `${days(n)} ${n === 1 ? single : many}`;
  if (p.add.length > 0) parts.push(one(p.add.length, "stops being a business day", "stop being business days"));
  if (p.remove.length > 0)
    parts.push(one(p.remove.length, "becomes a business day again", "become business days again"));
  return (
    `Import the ${p.year} public holidays of ${p.countryName} into ${entityCode}? ${parts.join(" and ")}. ` +
    "Every backtesting window, exception count and roll-off date that reaches them moves, and the figures are " +
    "computed again. Signed-off quarters keep their figures."
  );
}

function ImportHolidays({ entityCode, country }: { entityCode: string; country: string | null }) {
  const preview = useHolidayImportPreview(entityCode);
  const importing = useImportHolidays(entityCode);
  const [year, setYear] = useState(String(new Date().getUTCFullYear()));
  const [plan, setPlan] = useState<HolidayImportPreview | null>(null);
  const [done, setDone] = useState<string>();
  const [yearError, setYearError] = useState<string>();
  const openerRef = useRef<HTMLButtonElement>(null);

  if (!country) {
    return (
      <p className="text-sm" role="note">
        No calendar country is chosen for {entityCode}, so its calendar holds only the bank&apos;s own closing days.
        Choose the calendar country under Entity settings to import its public holidays.
      </p>
    );
  }
  const name = CALENDAR_COUNTRIES[country as CalendarCountry] ?? country;

  async function check(e: FormEvent) {
    e.preventDefault();
    setDone(undefined);
    importing.reset();
    const y = Number(year);
    if (!/^\d{4}$/.test(year.trim()) || y < 2000 || y > 2100) {
      setYearError("A year from 2000 to 2100, e.g. 2026");
      return;
    }
    setYearError(undefined);
    try {
      const p = await preview.mutateAsync(y);
      if (p.changes === 0 && p.rename.length === 0) {
        setPlan(null);
        setDone(`Nothing to change: the calendar already holds the ${p.year} public holidays of ${p.countryName}.`);
      } else setPlan(p);
    } catch {
      setPlan(null);
    }
  }

  async function confirm(p: HolidayImportPreview) {
    try {
      const result = await importing.mutateAsync({ year: p.year, changes: p.changes });
      setPlan(null);
      setDone(
        `Imported the ${result.year} public holidays of ${result.countryName}: ${days(result.add.length)} added, ` +
          `${days(result.remove.length)} removed. The figures have been computed again.`,
      );
      openerRef.current?.focus();
    } catch (err) {
      // The calendar moved since the check: show the plan as it now stands and ask again.
      const current = staleCurrent(err, holidayImportPreviewSchema);
      if (current) setPlan(current);
    }
  }

  const error = formLevelMessage(preview.error) ?? formLevelMessage(importing.error);
  return (
    <form onSubmit={check} noValidate aria-labelledby="import-holidays-title" className="flex flex-col gap-2">
      <h3 id="import-holidays-title" className="text-sm font-semibold">
        Import public holidays
      </h3>
      <p className="text-sm text-ink-muted">
        From the holiday library, for {name}: only days offices close by law (substitute days included). The bank&apos;s
        own closing days are never changed by an import.
      </p>
      <FormMessage>{error}</FormMessage>
      <FormMessage tone="done">{done}</FormMessage>
      <div className="flex flex-wrap items-start gap-2">
        <TextField
          label="Year"
          inputMode="numeric"
          value={year}
          onChange={(e) => setYear(e.target.value)}
          error={yearError}
          className="w-28"
        />
        <Button ref={openerRef} type="submit" className="mt-5" disabled={preview.isPending || importing.isPending}>
          {preview.isPending ? "Checking…" : "Check what changes"}
        </Button>
      </div>
      {plan && (
        <Confirmation
          label={`Import the ${plan.year} public holidays`}
          text={
            <>
              <p>
                {plan.changes > 0
                  ? importConsequence(entityCode, plan)
                  : `No business day moves; ${days(plan.rename.length)} get the library's current name.`}
              </p>
              {plan.add.length > 0 && (
                <p className="mt-1">
                  New holidays: {plan.add.map((h) => `${formatBusinessDate(h.date)} ${h.name}`).join("; ")}.
                </p>
              )}
              {plan.remove.length > 0 && (
                <p className="mt-1">
                  Business days again: {plan.remove.map((h) => `${formatBusinessDate(h.date)} ${h.name}`).join("; ")}.
                </p>
              )}
            </>
          }
          confirm={plan.changes > 0 ? `Import and move ${days(plan.changes)}` : "Update the names"}
          busy={importing.isPending}
          onConfirm={() => void confirm(plan)}
          onCancel={() => {
            setPlan(null);
            openerRef.current?.focus();
          }}
        />
      )}
    </form>
  );
}

function AddHolidayForm({ entityCode }: { entityCode: string }) {
  const add = useAddHoliday(entityCode);
  const { formRef, values, setValues, check, send, field } = useFormKit({ date: "", name: "" });

  function submit(e: FormEvent) {
    e.preventDefault();
    add.reset();
    const data = check(createHolidayBodySchema, values);
    if (data) send(add, data, () => setValues({ date: "", name: "" }));
  }

  return (
    <HeadedForm
      formRef={formRef}
      onSubmit={submit}
      titleId="add-holiday-title"
      title="Add a bank closing day"
      level={3}
      className="flex flex-col gap-2"
    >
      <FormMessage>{formLevelMessage(add.error)}</FormMessage>
      <div className="flex flex-wrap items-start gap-2">
        <TextField label="Date" type="date" {...field("date")} className="w-44" />
        <TextField label="Name" {...field("name")} className="w-64" />
        <SubmitButton pending={add.isPending} busyLabel="Adding…" className="mt-5">
          Add holiday
        </SubmitButton>
      </div>
    </HeadedForm>
  );
}

export function HolidaysPanel({
  entityCode,
  country,
  holidays,
}: {
  entityCode: string;
  country: string | null;
  holidays: Holiday[];
}) {
  const remove = useRemoveHoliday(entityCode);
  const [removing, setRemoving] = useState<string | null>(null);
  const sorted = [...holidays].sort((a, b) => a.date.localeCompare(b.date));
  const removeError = isApiError(remove.error) ? remove.error.message : undefined;
  const fromLibrary = holidays.filter((h) => h.source === "library").length;

  return (
    <section aria-labelledby="holidays-title" className="flex flex-col gap-3">
      <h2 id="holidays-title">Holiday calendar</h2>
      <p className="text-sm text-ink-muted">
        Business days are weekdays minus these dates: the public holidays imported from the holiday library and the
        bank&apos;s own closing days. The calendar decides which days the backtesting window and the roll-off forecast
        count.
      </p>
      {holidays.length > 0 && (
        <p className="text-sm">
          {fromLibrary} public {fromLibrary === 1 ? "holiday" : "holidays"} from the library ·{" "}
          {holidays.length - fromLibrary} bank closing {holidays.length - fromLibrary === 1 ? "day" : "days"}
        </p>
      )}
      <FormMessage>{removeError}</FormMessage>
      {sorted.length === 0 ? (
        <EmptyState title="No holidays recorded">
          Import the public holidays and add the bank&apos;s own closing days; until then every weekday counts as a
          business day.
        </EmptyState>
      ) : (
        <Table caption={`Holidays of ${entityCode}`}>
          <TableHead columns={["Date", "Name", "Source", { actions: "Actions" }]} />
          <tbody>
            {sorted.map((h) => (
              <Tr key={h.date}>
                <Td className="figures whitespace-nowrap">{formatBusinessDate(h.date)}</Td>
                <Td>{h.name}</Td>
                <Td className="whitespace-nowrap">{sourceLabels[h.source]}</Td>
                <Td className="text-right">
                  <Button
                    variant="quiet"
                    size="sm"
                    disabled={remove.isPending}
                    aria-label={`Remove holiday ${h.date}`}
                    aria-expanded={removing === h.date}
                    onClick={() => {
                      remove.reset();
                      setRemoving(removing === h.date ? null : h.date);
                    }}
                  >
                    Remove
                  </Button>
                  {removing === h.date && (
                    <div className="mt-2 text-left">
                      <Confirmation
                        label={`Remove holiday ${h.date}`}
                        text={`Remove ${h.date} (${h.name})? It becomes a business day of ${entityCode}: every backtesting window, exception count and roll-off date that reaches it moves, and the figures are computed again. Signed-off quarters keep their figures.`}
                        confirm="Remove the holiday"
                        danger
                        busy={remove.isPending}
                        onConfirm={() => remove.mutate(h.date, { onSettled: () => setRemoving(null) })}
                        onCancel={() => setRemoving(null)}
                      />
                    </div>
                  )}
                </Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      )}
      <ImportHolidays entityCode={entityCode} country={country} />
      <AddHolidayForm entityCode={entityCode} />
    </section>
  );
}
