import { useRef, useState, type FormEvent } from "react";
import type { Invitation } from "@shared/schemas/auth";
import { Button } from "@/components/ui/button";
import { FormMessage, TextField } from "@/components/ui/field";
import { fieldErrorsOf } from "@/lib/api-client";
import { focusFirstInvalid, formLevelMessage } from "@/lib/form";
import { useAcceptInvitation } from "../api/auth-queries";
import { usePasswordVerdict } from "../password-rule";
import { NewPasswordFields, newPasswordErrors } from "./new-password-fields";

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
  const formRef = useRef<HTMLFormElement>(null);
  const [password, setPassword] = useState("");
  const [repeat, setRepeat] = useState("");
  const [errors, setErrors] = useState<{ password?: string; repeat?: string }>({});
  const verdict = usePasswordVerdict(password, invitation);

  function submit(e: FormEvent) {
    e.preventDefault();
    accept.reset();
    const found = newPasswordErrors(password, repeat, verdict);
    setErrors(found);
    if (Object.keys(found).length) return focusFirstInvalid(formRef.current);
    accept.mutate(
      { token, password },
      {
        onSuccess: onDone,
        onError: (err) => {
          setErrors({ password: fieldErrorsOf(err).password });
          focusFirstInvalid(formRef.current);
        },
      },
    );
  }

  return (
    <form
      ref={formRef}
      onSubmit={submit}
      noValidate
      aria-labelledby="set-password-title"
      className="flex flex-col gap-4"
    >
      <FormMessage>{formLevelMessage(accept.error)}</FormMessage>
      <TextField label="E-mail" name="email" autoComplete="username" value={invitation.email} readOnly />
      <NewPasswordFields
        password={password}
        repeat={repeat}
        onPassword={(v) => {
          setPassword(v);
          setErrors((e) => ({ ...e, password: undefined })); // the live verdict takes over again
        }}
        onRepeat={(v) => {
          setRepeat(v);
          setErrors((e) => ({ ...e, repeat: undefined }));
        }}
        verdict={verdict}
        errors={errors}
      />
      <Button type="submit" disabled={accept.isPending} className="mt-1 w-full">
        {accept.isPending ? "Saving…" : "Set password and sign in"}
      </Button>
    </form>
  );
}
