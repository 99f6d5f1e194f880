import { useEffect, useState } from "react";
import { loadStrengthEstimator } from "@shared/password/load-estimator";
import {
  basicPasswordProblem,
  newPasswordProblem,
  type PasswordOwner,
  type StrengthEstimator,
} from "@shared/password/policy";

export type PasswordVerdict =
  { state: "empty" } | { state: "checking" } | { state: "weak"; message: string } | { state: "ok" };

/**
 * The password rule as the person types, with the server's own function (`shared/password/policy.ts`):
 * the cheap checks at once, the strength estimate once its dictionaries have loaded (their own
 * chunk, fetched when a password form opens, never in the main bundle). The server decides.
 */
export function usePasswordVerdict(password: string, owner: PasswordOwner | null): PasswordVerdict {
  const [estimator, setEstimator] = useState<StrengthEstimator | null>(null);
  useEffect(() => {
    let live = true;
    loadStrengthEstimator().then(
      (e) => live && setEstimator(() => e),
      () => undefined, // without the estimator the server still checks on submit
    );
    return () => {
      live = false;
    };
  }, []);
  const [verdict, setVerdict] = useState<PasswordVerdict>({ state: "empty" });
  const email = owner?.email ?? "";
  const name = owner?.name ?? "";
  useEffect(() => {
    if (!password) return setVerdict({ state: "empty" });
    const who = { email, name };
    const basic = basicPasswordProblem(password, who);
    if (basic) return setVerdict({ state: "weak", message: basic });
    if (!estimator) return setVerdict({ state: "checking" });
    // A short pause so that the estimate runs when typing stops, not on every key.
    const timer = setTimeout(() => {
      const problem = newPasswordProblem(password, who, estimator);
      setVerdict(problem ? { state: "weak", message: problem } : { state: "ok" });
    }, 150);
    return () => clearTimeout(timer);
  }, [password, email, name, estimator]);
  return verdict;
}

/** The line under a new-password field. */
export function verdictHint(verdict: PasswordVerdict): string {
  switch (verdict.state) {
    case "empty":
      return "At least 12 characters. A few unrelated words make a strong one; avoid your name and common passwords.";
    case "checking":
      return "Checking against common passwords…";
    case "weak":
      return verdict.message;
    case "ok":
      return "Strong enough.";
  }
}
