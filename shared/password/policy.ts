import { z } from "zod";

/**
 * The password rule (NIST SP 800-63B §5.1.1.2, memorized secrets): at least 12 characters (the
 * office's length; the guideline's floor is 8), no composition rules, and checked against lists of
 * common and breached-pattern passwords and against words of the person's own context (their name,
 * their e-mail). Strength is estimated by zxcvbn-ts (`./estimator.ts`), a well-kept library; a
 * score below 3 of 4 is refused with the library's own feedback.
 *
 * This file holds no dictionaries, so the client's main bundle can import it: the estimator with
 * its dictionaries (several MB) is loaded only where a password is chosen (`./load-estimator.ts`).
 */
export const PASSWORD_MIN_LENGTH = 12;
/** bcrypt reads only the first 72 bytes; longer passwords are refused rather than silently cut. */
export const PASSWORD_MAX_BYTES = 72;
/** zxcvbn scores 0–4; 3 is "safely unguessable: moderate protection from an offline slow-hash scenario". */
export const PASSWORD_MIN_SCORE = 3;

/** What zxcvbn-ts returns that the rule reads (`ZxcvbnFactory.check`). */
export interface StrengthResult {
  score: number;
  feedback: { warning: string | null; suggestions: string[] };
}
export interface StrengthEstimator {
  check(password: string, userInputs?: (string | number)[]): StrengthResult;
}

/** Who chooses the password: their own words are never part of it. */
export interface PasswordOwner {
  email: string;
  name: string;
}

const utf8Length = (s: string) => new TextEncoder().encode(s).length;

/** Letters and digits only, lower case: "Nadia-Fern" and "nadia.fern" both read "nadiafern". */
function folded(s: string): string {
  return s.toLowerCase().replace(/[^\p{L}\p{N}]+/gu, "");
}

/** The owner's words a password must not contain: the e-mail's local part, the whole name, and each name part of 4+ letters. */
export function personalWords(owner: PasswordOwner): string[] {
  const local = folded(owner.email.split("@")[0] ?? "");
  const parts = owner.name.split(/\s+/).map(folded);
  const words = [local, folded(owner.name), ...parts.filter((p) => p.length >= 4)];
  return [...new Set(words.filter((w) => w.length >= 3))];
}

/** The checks that need no dictionary: length, bcrypt's byte limit, the owner's own words. */
export function basicPasswordProblem(password: string, owner: PasswordOwner): string | null {
  if ([...password].length < PASSWORD_MIN_LENGTH) return `Use at least ${PASSWORD_MIN_LENGTH} characters.`;
  if (utf8Length(password) > PASSWORD_MAX_BYTES)
    return `Passwords are limited to ${PASSWORD_MAX_BYTES} bytes (bcrypt ignores anything longer).`;
  const plain = folded(password);
  if (personalWords(owner).some((w) => plain.includes(w)))
    return "Do not use your name or the first part of your e-mail address in your password.";
  return null;
}

/** The whole rule: the basic checks, then the estimator's score, with its feedback as the message. */
export function newPasswordProblem(
  password: string,
  owner: PasswordOwner,
  estimator: StrengthEstimator,
): string | null {
  const basic = basicPasswordProblem(password, owner);
  if (basic) return basic;
  const result = estimator.check(password, [owner.email, owner.name, ...personalWords(owner)]);
  if (result.score >= PASSWORD_MIN_SCORE) return null;
  const why = result.feedback.warning ?? "This password is too easy to guess.";
  const tip = result.feedback.suggestions[0] ?? "Add more words that are less common.";
  return `${why.replace(/\.?$/, ".")} ${tip.replace(/\.?$/, ".")}`;
}

/** The rule as a zod schema for one person's new password (server: the authority; client: instant feedback). */
export function newPasswordSchema(owner: PasswordOwner, estimator: StrengthEstimator) {
  return z.string().superRefine((password, ctx) => {
    const problem = newPasswordProblem(password, owner, estimator);
    if (problem) ctx.addIssue({ code: "custom", message: problem });
  });
}
