import { useState, type FormEvent } from "react";
import type { SessionUser } from "@shared/schemas/auth";
import { FormMessage } from "@/components/ui/field";
import { HeadedForm, SubmitButton } from "@/components/ui/form-kit";
import { fieldErrorsOf } from "@/lib/api-client";
import { formLevelMessage } from "@/lib/form";
import { useChangePassword } from "../api/auth-queries";
import { NewPasswordFields, useNewPassword } from "./new-password-fields";
import { PasswordField } from "./password-field";

/** Changes one's own password: the current one, then the new one twice. Other sessions end. */
export function ChangePasswordForm({ user }: { user: SessionUser }) {
  const change = useChangePassword();
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
    if (newPassword.blocks() || missing) return newPassword.focusError();
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
          newPassword.refuse(f.newPassword);
        },
      },
    );
  }

  return (
    <HeadedForm
      formRef={newPassword.formRef}
      onSubmit={submit}
      titleId="change-password-title"
      title="Change your password"
      className="flex max-w-sm flex-col gap-3"
    >
      <FormMessage>{formLevelMessage(change.error)}</FormMessage>
      <FormMessage tone="done">{done}</FormMessage>
      <PasswordField kind="current" value={current} onValue={setCurrent} error={currentError} />
      <NewPasswordFields {...newPassword.fields} />
      <div>
        <SubmitButton pending={change.isPending} busyLabel="Changing…">
          Change password
        </SubmitButton>
      </div>
    </HeadedForm>
  );
}
