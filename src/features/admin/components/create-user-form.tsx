import type { FormEvent } from "react";
import { createUserBodySchema, needsSecondAdmin } from "@shared/schemas/user";
import type { Role } from "@shared/schemas/common";
import { FormMessage, SelectField, TextField } from "@/components/ui/field";
import { HeadedForm, SubmitButton, useFormKit } from "@/components/ui/form-kit";
import { formLevelMessage } from "@/lib/form";
import { roleIds, roleLabels } from "@/lib/role-labels";
import { formatDateTime } from "@/lib/format";
import { useCreateUser } from "../api/user-queries";

const empty = { name: "", email: "", role: "analyst" as Role };

export function CreateUserForm() {
  const create = useCreateUser();
  const { formRef, values, setValues, done, setDone, check, send, field } = useFormKit(empty);

  function submit(e: FormEvent) {
    e.preventDefault();
    setDone(undefined);
    create.reset();
    const data = check(createUserBodySchema, values);
    if (!data) return;
    send(create, data, (result) => {
      setValues(empty);
      setDone(
        result.outcome === "invited"
          ? `Invitation sent to ${result.user.email}. ${result.user.name} chooses their own password with the link (valid until ${formatDateTime(result.invitation.expiresAt)}).`
          : `Inviting ${result.request.name} as ${roleLabels[result.request.toRole]} waits for a second administrator's approval (below). Nothing is sent until then.`,
      );
    });
  }

  return (
    <HeadedForm formRef={formRef} onSubmit={submit} titleId="create-user-title" title="Invite a user">
      <p className="text-sm text-ink-muted">
        The person gets a one-time link by e-mail and chooses their own password; nobody else ever knows it.
      </p>
      <FormMessage>{formLevelMessage(create.error)}</FormMessage>
      <FormMessage tone="done">{done}</FormMessage>
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
        <TextField label="Name" autoComplete="off" {...field("name")} />
        <TextField label="E-mail" type="email" autoComplete="off" {...field("email")} />
        <SelectField label="Role" {...field("role")}>
          {roleIds.map((r) => (
            <option key={r} value={r}>
              {roleLabels[r]}
            </option>
          ))}
        </SelectField>
      </div>
      {needsSecondAdmin(null, values.role) && (
        <p className="text-sm text-ink-soft" data-testid="invite-needs-approval">
          Granting the {roleLabels[values.role]} role needs a second administrator: the invitation is sent only once
          another administrator approves it.
        </p>
      )}
      <div>
        <SubmitButton pending={create.isPending} busyLabel="Sending…">
          Send invitation
        </SubmitButton>
      </div>
    </HeadedForm>
  );
}
