import type { FormEvent } from "react";
import type { Invitation } from "@shared/schemas/auth";
import { FormMessage, TextField } from "@/components/ui/field";
import { SubmitButton } from "@/components/ui/form-kit";
import { fieldErrorsOf } from "@/lib/api-client";
import { formLevelMessage } from "@/lib/form";
import { useAcceptInvitation } from "../api/auth-queries";
import { NewPasswordFields, useNewPassword } from "./new-password-fields";

/** The invitee (or someone with a reset link) chooses their password; the server then signs them in. */
export function SetPasswordForm({
  token,
  invitation,
  onDone,
}: {
  token: string;
  invitation: Invitation;
  onDone: () => void;
}) {
  const accept = useAcceptInvitation();
  const newPassword = useNewPassword(invitation);

  function submit(e: FormEvent) {
    e.preventDefault();
    accept.reset();
    if (newPassword.blocks()) return newPassword.focusError();
    accept.mutate(
      { token, password: newPassword.password },
      { onSuccess: onDone, onError: (err) => newPassword.refuse(fieldErrorsOf(err).password) },
    );
  }

  return (
    <form
      ref={newPassword.formRef}
      onSubmit={submit}
      noValidate
      aria-labelledby="set-password-title"
      className="flex flex-col gap-4"
    >
      <FormMessage>{formLevelMessage(accept.error)}</FormMessage>
      <TextField label="E-mail" name="email" autoComplete="username" value={invitation.email} readOnly />
      <NewPasswordFields {...newPassword.fields} />
      <SubmitButton pending={accept.isPending} busyLabel="Saving…" className="mt-1 w-full">
        Set password and sign in
      </SubmitButton>
    </form>
  );
}
