import { useState } from "react";
import type { PasswordOwner } from "@shared/password/policy";
import { TextField } from "@/components/ui/field";
import { cn } from "@/lib/cn";
import type { PasswordVerdict } from "../password-rule";
import { usePasswordVerdict, verdictHint } from "../password-rule";

type NewPasswordErrors = { password?: string; repeat?: string };

/** A new password and its repetition; the line under the first says, as one types, what the rule thinks of it. */
export function NewPasswordFields({
  password,
  repeat,
  onPassword,
  onRepeat,
  verdict,
  errors,
}: {
  password: string;
  repeat: string;
  onPassword: (v: string) => void;
  onRepeat: (v: string) => void;
  verdict: PasswordVerdict;
  errors: NewPasswordErrors;
}) {
  return (
    <>
      <TextField
        label="New password"
        name="new-password"
        type="password"
        autoComplete="new-password"
        value={password}
        onChange={(e) => onPassword(e.target.value)}
        error={errors.password}
        hint={
          <span
            data-testid="password-verdict"
            className={cn(verdict.state === "weak" && "text-danger", verdict.state === "ok" && "text-ink-soft")}
            aria-live="polite"
          >
            {verdictHint(verdict)}
          </span>
        }
      />
      <TextField
        label="Repeat the new password"
        name="repeat-password"
        type="password"
        autoComplete="new-password"
        value={repeat}
        onChange={(e) => onRepeat(e.target.value)}
        error={errors.repeat}
      />
    </>
  );
}

/** What stops the form before it is sent: the rule's own message, or two entries that differ. */
export function newPasswordErrors(password: string, repeat: string, verdict: PasswordVerdict): NewPasswordErrors {
  if (!password) return { password: "Enter a new password" };
  if (verdict.state === "weak") return { password: verdict.message };
  if (password !== repeat) return { repeat: "The two entries differ" };
  return {};
}

/**
 * The state behind NewPasswordFields: the two entries, the live verdict on the first and the errors
 * beside them. Typing into a field takes its error away: for the password the live verdict takes over again.
 */
export function useNewPassword(owner: PasswordOwner | null) {
  const [password, setPassword] = useState("");
  const [repeat, setRepeat] = useState("");
  const [errors, setErrors] = useState<NewPasswordErrors>({});
  const verdict = usePasswordVerdict(password, owner);
  return {
    password,
    setErrors,
    /** Shows and returns what stops the form before it is sent. */
    check() {
      const found = newPasswordErrors(password, repeat, verdict);
      setErrors(found);
      return found;
    },
    clear() {
      setPassword("");
      setRepeat("");
    },
    /** The props of NewPasswordFields. */
    fields: {
      password,
      repeat,
      verdict,
      errors,
      onPassword: (v: string) => {
        setPassword(v);
        setErrors((e) => ({ ...e, password: undefined }));
      },
      onRepeat: (v: string) => {
        setRepeat(v);
        setErrors((e) => ({ ...e, repeat: undefined }));
      },
    },
  };
}
