import { useRef, useState, type FormEvent } from "react";
import { createHolidayBodySchema, type Holiday } from "@shared/schemas/entity";
import { Button } from "@/components/ui/button";
import { Confirmation } from "@/components/ui/confirmation";
import { FormMessage, TextField } from "@/components/ui/field";
import { EmptyState, Table, Td, Th, Tr } from "@/components/ui/table";
import { fieldErrorsOf, isApiError } from "@/lib/api-client";
import { focusFirstInvalid, formLevelMessage, validate, type FieldErrors } from "@/lib/form";
import { formatBusinessDate } from "@/lib/format";
import { useAddHoliday, useRemoveHoliday } from "../api/entity-queries";

function AddHolidayForm({ entityCode }: { entityCode: string }) {
  const add = useAddHoliday(entityCode);
  const formRef = useRef<HTMLFormElement>(null);
  const [values, setValues] = useState({ date: "", name: "" });
  const [errors, setErrors] = useState<FieldErrors>({});

  function submit(e: FormEvent) {
    e.preventDefault();
    add.reset();
    const r = validate(createHolidayBodySchema, values);
    if (!r.ok) {
      setErrors(r.errors);
      return focusFirstInvalid(formRef.current);
    }
    setErrors({});
    add.mutate(r.data, {
      onSuccess: () => setValues({ date: "", name: "" }),
      onError: (err) => {
        setErrors(fieldErrorsOf(err));
        focusFirstInvalid(formRef.current);
      },
    });
  }
  const formError = formLevelMessage(add.error);

  return (
    <form
      ref={formRef}
      onSubmit={submit}
      noValidate
      aria-labelledby="add-holiday-title"
      className="flex flex-col gap-2"
    >
      <h3 id="add-holiday-title" className="text-sm font-semibold">
        Add a holiday
      </h3>
      <FormMessage>{formError}</FormMessage>
      <div className="flex flex-wrap items-start gap-2">
        <TextField
          label="Date"
          type="date"
          value={values.date}
          onChange={(e) => setValues((v) => ({ ...v, date: e.target.value }))}
          error={errors.date}
          className="w-44"
        />
        <TextField
          label="Name"
          value={values.name}
          onChange={(e) => setValues((v) => ({ ...v, name: e.target.value }))}
          error={errors.name}
          className="w-64"
        />
        <Button type="submit" className="mt-5" disabled={add.isPending}>
          {add.isPending ? "Adding…" : "Add holiday"}
        </Button>
      </div>
    </form>
  );
}

export function HolidaysPanel({ entityCode, holidays }: { entityCode: string; holidays: Holiday[] }) {
  const remove = useRemoveHoliday(entityCode);
  const [removing, setRemoving] = useState<string | null>(null);
  const sorted = [...holidays].sort((a, b) => a.date.localeCompare(b.date));
  const removeError = isApiError(remove.error) ? remove.error.message : undefined;

  return (
    <section aria-labelledby="holidays-title" className="flex flex-col gap-3">
      <h2 id="holidays-title">Holiday calendar</h2>
      <p className="text-sm text-ink-muted">
        Business days are weekdays minus these dates. The calendar decides which days the backtesting window and the
        roll-off forecast count.
      </p>
      <FormMessage>{removeError}</FormMessage>
      {sorted.length === 0 ? (
        <EmptyState title="No holidays recorded">
          Add the entity's non-business days; until then every weekday counts as a business day.
        </EmptyState>
      ) : (
        <Table caption={`Holidays of ${entityCode}`}>
          <thead>
            <tr>
              <Th>Date</Th>
              <Th>Name</Th>
              <Th>
                <span className="sr-only">Actions</span>
              </Th>
            </tr>
          </thead>
          <tbody>
            {sorted.map((h) => (
              <Tr key={h.date}>
                <Td className="figures whitespace-nowrap">{formatBusinessDate(h.date)}</Td>
                <Td>{h.name}</Td>
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
      <AddHolidayForm entityCode={entityCode} />
    </section>
  );
}
