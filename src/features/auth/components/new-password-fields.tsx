import { useRef, useState } from "react";
import type { PasswordOwner } from "@shared/password/policy";
import { cn } from "@/lib/cn";
import { focusFirstInvalid } from "@/lib/form";
import type { PasswordVerdict } from "../password-rule";
import { usePasswordVerdict, verdictHint } from "../password-rule";
import { PasswordField } from "./password-field";

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
      <PasswordField
        kind="new"
        value={password}
        onValue={onPassword}
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
      <PasswordField kind="repeat" value={repeat} onValue={onRepeat} error={errors.repeat} />
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
 * The state behind NewPasswordFields: the two entries, the live verdict on the first, the errors
 * beside them and the form that holds them (`formRef`), whose first error takes the focus.
 * Typing into a field takes its error away: for the password the live verdict takes over again.
 */
export function useNewPassword(owner: PasswordOwner | null) {
  const formRef = useRef<HTMLFormElement>(null);
  const [password, setPassword] = useState("");
  const [repeat, setRepeat] = useState("");
  const [errors, setErrors] = useState<NewPasswordErrors>({});
  const verdict = usePasswordVerdict(password, owner);
  return {
    formRef,
    password,
    /** Shows what stops the form before it is sent; true when something does. */
    blocks() {
      const found = newPasswordErrors(password, repeat, verdict);
      setErrors(found);
      return Object.keys(found).length > 0;
    },
    /** Moves the focus to the first field of the form that carries an error. */
    focusError() {
      focusFirstInvalid(formRef.current);
    },
    /** Shows the server's refusal of the new password, if it named one, and moves the focus to the first error. */
    refuse(message: string | undefined) {
      setErrors({ password: message });
      focusFirstInvalid(formRef.current);
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
