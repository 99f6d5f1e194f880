import { useRef, useState, type FormEvent } from "react";
import type { SessionUser } from "@shared/schemas/auth";
import { FormMessage, TextField } from "@/components/ui/field";
import { SubmitButton } from "@/components/ui/form-kit";
import { fieldErrorsOf } from "@/lib/api-client";
import { focusFirstInvalid, formLevelMessage } from "@/lib/form";
import { useChangePassword } from "../api/auth-queries";
import { NewPasswordFields, useNewPassword } from "./new-password-fields";

/** Changes one's own password: the current one, then the new one twice. Other sessions end. */
export function ChangePasswordForm({ user }: { user: SessionUser }) {
  const change = useChangePassword();
  const formRef = useRef<HTMLFormElement>(null);
  const [current, setCurrent] = useState("");
  const [currentError, setCurrentError] = useState<string>();
  const [done, setDone] = useState<string>();
  const newPassword = useNewPassword(user);

  function submit(e: FormEvent) {
    e.preventDefault();
    setDone(undefined);
    change.reset();
    const missing = current ? undefined : "Enter your current password";
    setCurrentError(missing);
    const found = newPassword.check();
    if (missing || Object.keys(found).length) return focusFirstInvalid(formRef.current);
    change.mutate(
      { currentPassword: current, newPassword: newPassword.password },
      {
        onSuccess: () => {
          setCurrent("");
          newPassword.clear();
          setDone("Your password is changed. You stay signed in here; every other session of yours has ended.");
        },
        onError: (err) => {
          const f = fieldErrorsOf(err);
          setCurrentError(f.currentPassword);
          newPassword.setErrors({ password: f.newPassword });
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
      aria-labelledby="change-password-title"
      className="flex max-w-sm flex-col gap-3"
    >
      <h2 id="change-password-title">Change your password</h2>
      <FormMessage>{formLevelMessage(change.error)}</FormMessage>
      <FormMessage tone="done">{done}</FormMessage>
      <TextField
        label="Current password"
        name="current-password"
        type="password"
        autoComplete="current-password"
        value={current}
        onChange={(e) => setCurrent(e.target.value)}
        error={currentError}
      />
      <NewPasswordFields {...newPassword.fields} />
      <div>
        <SubmitButton pending={change.isPending} busyLabel="Changing…">
          Change password
        </SubmitButton>
      </div>
    </form>
  );
}
