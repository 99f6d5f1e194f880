import { fieldErrorsOf, isApiError } from "@/lib/api-client";
import { z } from "zod";

export type FieldErrors = Record<string, string | undefined>;

/** Parses form input with the same schema the server uses; the first message per field. */
export function validate<S extends z.ZodType>(
  schema: S,
  input: unknown,
): { ok: true; data: z.output<S> } | { ok: false; errors: FieldErrors; formError?: string } {
  const parsed = schema.safeParse(input);
  if (parsed.success) return { ok: true, data: parsed.data };
  const flat = z.flattenError(parsed.error);
  const errors: FieldErrors = {};
  for (const [k, v] of Object.entries(flat.fieldErrors as Record<string, string[] | undefined>)) errors[k] = v?.[0];
  return { ok: false, errors, formError: flat.formErrors[0] };
}

/** "a@x.test, b@y.test" → ["a@x.test", "b@y.test"] */
export function splitList(s: string): string[] {
  return s
    .split(/[,;\s]+/)
    .map((x) => x.trim())
    .filter(Boolean);
}

/** Focuses the first field that carries an error so keyboard users land on it. */
export function focusFirstInvalid(form: HTMLFormElement | null) {
  requestAnimationFrame(() => form?.querySelector<HTMLElement>("[aria-invalid='true']")?.focus());
}

/** The message to show above a form: the server's, unless it belongs beside the fields. */
export function formLevelMessage(error: unknown): string | undefined {
  return isApiError(error) && Object.keys(fieldErrorsOf(error)).length === 0 ? error.message : undefined;
}
