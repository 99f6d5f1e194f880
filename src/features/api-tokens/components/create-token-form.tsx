import type { FormEvent } from "react";
import {
  API_TOKEN_DEFAULT_DAYS,
  API_TOKEN_MAX_DAYS,
  createApiTokenBodySchema,
  type CreatedApiToken,
} from "@shared/schemas/api-token";
import { FormMessage, TextField } from "@/components/ui/field";
import { HeadedForm, SubmitButton, useFormKit } from "@/components/ui/form-kit";
import { formLevelMessage } from "@/lib/form";
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
  const { formRef, values, setValues, check, send, field } = useFormKit(empty);

  function submit(e: FormEvent) {
    e.preventDefault();
    create.reset();
    const days = daysOf(values.expiresInDays);
    const data = check(createApiTokenBodySchema, { name: values.name, expiresInDays: days }, (errors) =>
      typeof days === "string" && errors.expiresInDays
        ? { ...errors, expiresInDays: "Enter a number of days" }
        : errors,
    );
    if (!data) return;
    send(create, data, (token) => {
      setValues(empty);
      onCreated(token);
    });
  }

  return (
    <HeadedForm formRef={formRef} onSubmit={submit} titleId="create-token-title" title="Create a token">
      <FormMessage>{formLevelMessage(create.error)}</FormMessage>
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <TextField
          label="Name"
          autoComplete="off"
          {...field("name")}
          hint="What the script does or where it runs, e.g. “Monthly capital pack, finance server”."
        />
        <TextField
          label="Valid for (days)"
          type="number"
          inputMode="numeric"
          min={1}
          max={API_TOKEN_MAX_DAYS}
          {...field("expiresInDays")}
          hint={`1 to ${API_TOKEN_MAX_DAYS} days. Shorter is safer; make a new token when it runs out.`}
        />
      </div>
      <div>
        <SubmitButton pending={create.isPending} busyLabel="Creating…">
          Create token
        </SubmitButton>
      </div>
    </HeadedForm>
  );
}
