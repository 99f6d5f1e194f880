import { useRef, useState, type FormEvent } from "react";
import {
  API_TOKEN_DEFAULT_DAYS,
  API_TOKEN_MAX_DAYS,
  createApiTokenBodySchema,
  type CreatedApiToken,
} from "@shared/schemas/api-token";
import { Button } from "@/components/ui/button";
import { FormMessage, TextField } from "@/components/ui/field";
import { fieldErrorsOf } from "@/lib/api-client";
import { focusFirstInvalid, formLevelMessage, validate, type FieldErrors } from "@/lib/form";
import { useCreateApiToken } from "../api/api-token-queries";

const empty = { name: "", expiresInDays: String(API_TOKEN_DEFAULT_DAYS) };

/** The typed number of days for the schema to judge; anything that is not a number stays text so the schema refuses it. */
function daysOf(text: string): number | string {
  const t = text.trim();
  return t !== "" && Number.isFinite(Number(t)) ? Number(t) : text;
}

/** Names a new token and how long it lives; checked with the server's own schema before anything is sent. */
export function CreateTokenForm({ onCreated }: { onCreated: (token: CreatedApiToken) => void }) {
  const create = useCreateApiToken();
  const formRef = useRef<HTMLFormElement>(null);
  const [values, setValues] = useState(empty);
  const [errors, setErrors] = useState<FieldErrors>({});
  const set = (k: keyof typeof empty) => (e: { target: { value: string } }) =>
    setValues((v) => ({ ...v, [k]: e.target.value }));

  function submit(e: FormEvent) {
    e.preventDefault();
    create.reset();
    const r = validate(createApiTokenBodySchema, { name: values.name, expiresInDays: daysOf(values.expiresInDays) });
    if (!r.ok) {
      setErrors(
        typeof daysOf(values.expiresInDays) === "string" && r.errors.expiresInDays
          ? { ...r.errors, expiresInDays: "Enter a number of days" }
          : r.errors,
      );
      focusFirstInvalid(formRef.current);
      return;
    }
    setErrors({});
    create.mutate(r.data, {
      onSuccess: (token) => {
        setValues(empty);
        onCreated(token);
      },
      onError: (err) => {
        setErrors(fieldErrorsOf(err));
        focusFirstInvalid(formRef.current);
      },
    });
  }

  return (
    <form
      ref={formRef}
      onSubmit={submit}
      noValidate
      aria-labelledby="create-token-title"
      className="flex flex-col gap-3"
    >
      <h2 id="create-token-title">Create a token</h2>
      <FormMessage>{formLevelMessage(create.error)}</FormMessage>
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <TextField
          label="Name"
          name="name"
          autoComplete="off"
          value={values.name}
          onChange={set("name")}
          error={errors.name}
          hint="What the script does or where it runs, e.g. “Monthly capital pack, finance server”."
        />
        <TextField
          label="Valid for (days)"
          name="expiresInDays"
          type="number"
          inputMode="numeric"
          min={1}
          max={API_TOKEN_MAX_DAYS}
          value={values.expiresInDays}
          onChange={set("expiresInDays")}
          error={errors.expiresInDays}
          hint={`1 to ${API_TOKEN_MAX_DAYS} days. Shorter is safer; make a new token when it runs out.`}
        />
      </div>
      <div>
        <Button type="submit" disabled={create.isPending}>
          {create.isPending ? "Creating…" : "Create token"}
        </Button>
      </div>
    </form>
  );
}
