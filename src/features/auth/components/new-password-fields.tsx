import { TextField } from "@/components/ui/field";
import { cn } from "@/lib/cn";
import type { PasswordVerdict } from "../password-rule";
import { verdictHint } from "../password-rule";

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
  errors: { password?: string; repeat?: string };
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
export function newPasswordErrors(
  password: string,
  repeat: string,
  verdict: PasswordVerdict,
): { password?: string; repeat?: string } {
  if (!password) return { password: "Enter a new password" };
  if (verdict.state === "weak") return { password: verdict.message };
  if (password !== repeat) return { repeat: "The two entries differ" };
  return {};
}
