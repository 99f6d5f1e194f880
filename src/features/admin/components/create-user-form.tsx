import { useRef, useState, type FormEvent } from "react";
import { createUserBodySchema, needsSecondAdmin } from "@shared/schemas/user";
import type { Role } from "@shared/schemas/common";
import { Button } from "@/components/ui/button";
import { FormMessage, SelectField, TextField } from "@/components/ui/field";
import { fieldErrorsOf } from "@/lib/api-client";
import { focusFirstInvalid, formLevelMessage, validate, type FieldErrors } from "@/lib/form";
import { roleIds, roleLabels } from "@/lib/role-labels";
import { formatDateTime } from "@/lib/format";
import { useCreateUser } from "../api/user-queries";

const empty = { name: "", email: "", role: "analyst" as Role };

export function CreateUserForm() {
  const create = useCreateUser();
  const formRef = useRef<HTMLFormElement>(null);
  const [values, setValues] = useState(empty);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [done, setDone] = useState<string>();
  const set = (k: keyof typeof empty) => (e: { target: { value: string } }) =>
    setValues((v) => ({ ...v, [k]: e.target.value }));

  function submit(e: FormEvent) {
    e.preventDefault();
    setDone(undefined);
    create.reset();
    const r = validate(createUserBodySchema, values);
    if (!r.ok) {
      setErrors(r.errors);
      focusFirstInvalid(formRef.current);
      return;
    }
    setErrors({});
    create.mutate(r.data, {
      onSuccess: (result) => {
        setValues(empty);
        setDone(
          result.outcome === "invited"
            ? `Invitation sent to ${result.user.email}. ${result.user.name} chooses their own password with the link (valid until ${formatDateTime(result.invitation.expiresAt)}).`
            : `Inviting ${result.request.name} as ${roleLabels[result.request.toRole]} waits for a second administrator's approval (below). Nothing is sent until then.`,
        );
      },
      onError: (err) => {
        setErrors(fieldErrorsOf(err));
        focusFirstInvalid(formRef.current);
      },
    });
  }

  const formError = formLevelMessage(create.error);

  return (
    <form
      ref={formRef}
      onSubmit={submit}
      noValidate
      aria-labelledby="create-user-title"
      className="flex flex-col gap-3"
    >
      <h2 id="create-user-title">Invite a user</h2>
      <p className="text-sm text-ink-muted">
        The person gets a one-time link by e-mail and chooses their own password; nobody else ever knows it.
      </p>
      <FormMessage>{formError}</FormMessage>
      <FormMessage tone="done">{done}</FormMessage>
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
        <TextField
          label="Name"
          name="name"
          autoComplete="off"
          value={values.name}
          onChange={set("name")}
          error={errors.name}
        />
        <TextField
          label="E-mail"
          name="email"
          type="email"
          autoComplete="off"
          value={values.email}
          onChange={set("email")}
          error={errors.email}
        />
        <SelectField label="Role" name="role" value={values.role} onChange={set("role")} error={errors.role}>
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
        <Button type="submit" disabled={create.isPending}>
          {create.isPending ? "Sending…" : "Send invitation"}
        </Button>
      </div>
    </form>
  );
}
