import { useState, type FormEvent } from "react";
import { z } from "zod";
import { loginBodySchema } from "@shared/schemas/auth";
import { Button } from "@/components/ui/button";
import { FormMessage, TextField } from "@/components/ui/field";
import { fieldErrorsOf, isApiError } from "@/lib/api-client";
import { useLogin } from "../api/auth-queries";
import { PasswordField } from "./password-field";

type Fields = { email?: string; password?: string };

function formMessageFor(error: unknown): string | undefined {
  if (!error) return undefined;
  if (!isApiError(error)) return "Signing in failed. Try again.";
  if (error.status === 401) return error.message || "That e-mail and password do not match an active account.";
  if (error.status === 429) return error.message || "Too many attempts. Wait a few minutes before trying again.";
  if (error.status === 422) return Object.keys(fieldErrorsOf(error)).length ? undefined : error.message;
  return error.message;
}

export function SignInForm({ onSignedIn }: { onSignedIn: () => void }) {
  const login = useLogin();
  const [email, setEmail] = useState("");
  const [password, setPassword] = useState("");
  const [fieldErrors, setFieldErrors] = useState<Fields>({});

  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    login.reset();
    const parsed = loginBodySchema.safeParse({ email, password });
    if (!parsed.success) {
      const f = z.flattenError(parsed.error).fieldErrors;
      setFieldErrors({ email: f.email?.[0], password: f.password?.[0] });
      // Put the reader where the first problem is.
      const first = f.email ? "sign-in-email" : "sign-in-password";
      document.getElementById(first)?.focus();
      return;
    }
    setFieldErrors({});
    login.mutate(parsed.data, {
      onSuccess: onSignedIn,
      onError: (err) => {
        const f = fieldErrorsOf(err);
        setFieldErrors({ email: f.email, password: f.password });
      },
    });
  }

  const message = formMessageFor(login.error);

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-labelledby="sign-in-title">
      <FormMessage>{message}</FormMessage>
      <TextField
        id="sign-in-email"
        label="E-mail"
        type="email"
        name="email"
        autoComplete="username"
        autoFocus
        value={email}
        onChange={(e) => setEmail(e.target.value)}
        error={fieldErrors.email}
      />
      <PasswordField
        id="sign-in-password"
        kind="sign-in"
        value={password}
        onValue={setPassword}
        error={fieldErrors.password}
      />
      <Button type="submit" disabled={login.isPending} className="mt-1 w-full">
        {login.isPending ? "Signing in…" : "Sign in"}
      </Button>
    </form>
  );
}
