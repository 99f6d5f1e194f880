import type { FormEvent } from "react";
import type { Assignment } from "@shared/schemas/assignment";
import type { Entity } from "@shared/schemas/entity";
import type { User } from "@shared/schemas/user";
import { Button } from "@/components/ui/button";
import { FormMessage, SelectField } from "@/components/ui/field";
import { SubmitButton, useFormKit } from "@/components/ui/form-kit";
import { EmptyState, Table, TableHead, Td, Tr } from "@/components/ui/table";
import { isApiError } from "@/lib/api-client";
import { formLevelMessage } from "@/lib/form";
import { useAddAssignment, useRemoveAssignment } from "../api/assignment-queries";

type Props = { assignments: Assignment[]; users: User[]; entities: Pick<Entity, "code" | "name">[] };

function AddAssignmentForm({ assignments, users, entities }: Props) {
  const add = useAddAssignment();
  const regulators = users.filter((u) => u.role === "regulator" && !u.disabled);
  const { values, setValues, setErrors, done, setDone, send, field } = useFormKit({ userId: "", entityCode: "" });
  const { userId, entityCode } = values;

  function submit(e: FormEvent) {
    e.preventDefault();
    setDone(undefined);
    add.reset();
    const next = {
      userId: userId ? undefined : "Choose a regulator",
      entityCode: entityCode ? undefined : "Choose an entity",
    };
    if (
      !next.userId &&
      !next.entityCode &&
      assignments.some((a) => a.userId === Number(userId) && a.entityCode === entityCode)
    ) {
      next.entityCode = "This regulator can already see this entity";
    }
    setErrors(next);
    if (next.userId || next.entityCode) return;
    send(add, { userId: Number(userId), entityCode }, () => {
      const who = regulators.find((u) => u.id === Number(userId));
      setDone(`${who?.name ?? "The regulator"} can now see filings of ${entityCode}.`);
      setValues((v) => ({ ...v, entityCode: "" }));
    });
  }

  if (regulators.length === 0) {
    return (
      <EmptyState title="No active regulator users">
        Add a user with the Regulator role under Users first; you can then grant them access to entities here.
      </EmptyState>
    );
  }

  return (
    <form onSubmit={submit} noValidate aria-labelledby="add-assignment-title" className="flex flex-col gap-2">
      <h2 id="add-assignment-title">Grant access</h2>
      <FormMessage>{formLevelMessage(add.error)}</FormMessage>
      <FormMessage tone="done">{done}</FormMessage>
      <div className="flex flex-wrap items-start gap-2">
        <SelectField label="Regulator" {...field("userId")} className="w-72">
          <option value="">Choose…</option>
          {regulators.map((u) => (
            <option key={u.id} value={u.id}>
              {u.name} ({u.email})
            </option>
          ))}
        </SelectField>
        <SelectField label="Entity" {...field("entityCode")} className="w-72">
          <option value="">Choose…</option>
          {entities.map((en) => (
            <option key={en.code} value={en.code}>
              {en.code} — {en.name}
            </option>
          ))}
        </SelectField>
        <SubmitButton pending={add.isPending} busyLabel="Granting…" className="mt-5">
          Grant access
        </SubmitButton>
      </div>
    </form>
  );
}

export function AssignmentsPanel(props: Props) {
  const remove = useRemoveAssignment();
  const { assignments, entities } = props;
  const nameOf = (code: string) => entities.find((e) => e.code === code)?.name;
  const sorted = [...assignments].sort(
    (a, b) => a.name.localeCompare(b.name) || a.entityCode.localeCompare(b.entityCode),
  );
  const removeError = isApiError(remove.error) ? remove.error.message : undefined;

  return (
    <div className="flex flex-col gap-8">
      <div className="flex flex-col gap-2">
        <FormMessage>{removeError}</FormMessage>
        {sorted.length === 0 ? (
          <EmptyState title="No regulator has access yet">
            Grant a regulator access to an entity below; they then see only that entity's filed packs.
          </EmptyState>
        ) : (
          <Table caption="Regulator access by entity">
            <TableHead columns={["Regulator", "E-mail", "Entity", { actions: "Actions" }]} />
            <tbody>
              {sorted.map((a) => (
                <Tr key={`${a.userId}-${a.entityCode}`}>
                  <Td className="font-medium">{a.name}</Td>
                  <Td>{a.email}</Td>
                  <Td>
                    <span className="font-medium">{a.entityCode}</span>
                    {nameOf(a.entityCode) && <span className="text-ink-muted"> — {nameOf(a.entityCode)}</span>}
                  </Td>
                  <Td className="text-right">
                    <Button
                      variant="quiet"
                      size="sm"
                      disabled={remove.isPending}
                      aria-label={`Remove access of ${a.name} to ${a.entityCode}`}
                      onClick={() => remove.mutate({ userId: a.userId, entityCode: a.entityCode })}
                    >
                      Remove access
                    </Button>
                  </Td>
                </Tr>
              ))}
            </tbody>
          </Table>
        )}
      </div>
      <section className="border-t border-rule pt-5">
        <AddAssignmentForm {...props} />
      </section>
    </div>
  );
}
