import { useState, type FormEvent } from "react";
import { resetPasswordBodySchema, type User } from "@shared/schemas/user";
import { Button } from "@/components/ui/button";
import { FormMessage, TextField } from "@/components/ui/field";
import { fieldErrorsOf, isApiError } from "@/lib/api-client";
import { validate } from "@/lib/form";
import { staleUserMessage, useResetPassword } from "../api/user-queries";

export function ResetPasswordForm({ user, onClose }: { user: User; onClose: (message?: string) => void }) {
  const reset = useResetPassword();
  const [password, setPassword] = useState("");
  const [error, setError] = useState<string>();

  function submit(e: FormEvent) {
    e.preventDefault();
    const r = validate(resetPasswordBodySchema, { password, version: user.version });
    if (!r.ok) return setError(r.errors.password ?? r.formError);
    setError(undefined);
    reset.mutate(
      { id: user.id, body: r.data },
      {
        onSuccess: () => onClose(`New password set for ${user.name}. Their open sessions have ended.`),
        onError: (err) => setError(fieldErrorsOf(err).password),
      },
    );
  }

  const formError =
    staleUserMessage(reset.error) ??
    (isApiError(reset.error) && !fieldErrorsOf(reset.error).password ? reset.error.message : undefined);

  return (
    <form
      onSubmit={submit}
      noValidate
      aria-label={`Set a new password for ${user.name}`}
      className="flex flex-col gap-2 py-1"
    >
      <FormMessage>{formError}</FormMessage>
      <div className="flex flex-wrap items-end gap-2">
        <TextField
          label={`New password for ${user.name}`}
          type="password"
          autoComplete="new-password"
          autoFocus
          value={password}
          onChange={(e) => setPassword(e.target.value)}
          error={error}
          hint="At least 12 characters, at most 72 bytes."
          className="w-72"
        />
        <Button type="submit" size="sm" disabled={reset.isPending}>
          {reset.isPending ? "Saving…" : "Set password"}
        </Button>
        <Button variant="secondary" size="sm" onClick={() => onClose()}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
