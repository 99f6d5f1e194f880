import { useRef, useState, type FormEvent } from "react";
import type { SessionUser } from "@shared/schemas/auth";
import { Button } from "@/components/ui/button";
import { FormMessage, TextField } from "@/components/ui/field";
import { fieldErrorsOf } from "@/lib/api-client";
import { focusFirstInvalid, formLevelMessage } from "@/lib/form";
import { useChangePassword } from "../api/auth-queries";
import { usePasswordVerdict } from "../password-rule";
import { NewPasswordFields, newPasswordErrors } from "./new-password-fields";

type Errors = { currentPassword?: string; password?: string; repeat?: string };

/** Changes one's own password: the current one, then the new one twice. Other sessions end. */
export function ChangePasswordForm({ user }: { user: SessionUser }) {
  const change = useChangePassword();
  const formRef = useRef<HTMLFormElement>(null);
  const [current, setCurrent] = useState("");
  const [password, setPassword] = useState("");
  const [repeat, setRepeat] = useState("");
  const [errors, setErrors] = useState<Errors>({});
  const [done, setDone] = useState<string>();
  const verdict = usePasswordVerdict(password, user);

  function submit(e: FormEvent) {
    e.preventDefault();
    setDone(undefined);
    change.reset();
    const found: Errors = {
      ...(current ? {} : { currentPassword: "Enter your current password" }),
      ...newPasswordErrors(password, repeat, verdict),
    };
    setErrors(found);
    if (Object.keys(found).length) return focusFirstInvalid(formRef.current);
    change.mutate(
      { currentPassword: current, newPassword: password },
      {
        onSuccess: () => {
          setCurrent("");
          setPassword("");
          setRepeat("");
          setDone("Your password is changed. You stay signed in here; every other session of yours has ended.");
        },
        onError: (err) => {
          const f = fieldErrorsOf(err);
          setErrors({ currentPassword: f.currentPassword, password: f.newPassword });
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
        error={errors.currentPassword}
      />
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
      <div>
        <Button type="submit" disabled={change.isPending}>
          {change.isPending ? "Changing…" : "Change password"}
        </Button>
      </div>
    </form>
  );
}
