import { z } from "zod";
import { parseInput } from "../../errors";
import { createStrengthEstimator } from "../../../shared/password/estimator";
import { newPasswordSchema, type PasswordOwner, type StrengthEstimator } from "../../../shared/password/policy";

let estimator: StrengthEstimator | undefined;

/** zxcvbn-ts with its dictionaries, built on first use (about a second) and kept for the process. */
export function passwordEstimator(): StrengthEstimator {
  estimator ??= createStrengthEstimator();
  return estimator;
}

/**
 * The server is the authority on the password rule (`shared/password/policy.ts`): a new password
 * that breaks it is refused with 422 and the reason beside `field`, before anything is written.
 */
export function assertNewPassword(password: string, owner: PasswordOwner, field = "password"): void {
  parseInput(
    z.object({ [field]: newPasswordSchema(owner, passwordEstimator()) }),
    { [field]: password },
    "new password",
  );
}
