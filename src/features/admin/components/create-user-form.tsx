import { useRef, useState, type FormEvent } from "react";
import { createUserBodySchema } from "@shared/schemas/user";
import type { Role } from "@shared/schemas/common";
import { Button } from "@/components/ui/button";
import { FormMessage, SelectField, TextField } from "@/components/ui/field";
import { fieldErrorsOf } from "@/lib/api-client";
import { focusFirstInvalid, formLevelMessage, validate, type FieldErrors } from "@/lib/form";
import { roleIds, roleLabels } from "@/lib/role-labels";
import { useCreateUser } from "../api/user-queries";

const empty = { name: "", email: "", role: "analyst" as Role, password: "" };

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
      onSuccess: (user) => {
        setValues(empty);
        setDone(`${user.name} can now sign in as ${roleLabels[user.role]}.`);
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
      <h2 id="create-user-title">Add a user</h2>
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
        <TextField
          label="Initial password"
          name="password"
          type="password"
          autoComplete="new-password"
          value={values.password}
          onChange={set("password")}
          error={errors.password}
          hint="At least 12 characters, at most 72 bytes. Hand it over outside e-mail."
        />
      </div>
      <div>
        <Button type="submit" disabled={create.isPending}>
          {create.isPending ? "Adding…" : "Add user"}
        </Button>
      </div>
    </form>
  );
}
