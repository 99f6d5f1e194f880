import { describe, expect, it } from "vitest";
import { z } from "zod";
import { createStrengthEstimator } from "../../shared/password/estimator";
import {
  basicPasswordProblem,
  newPasswordProblem,
  newPasswordSchema,
  personalWords,
} from "../../shared/password/policy";

// Scores and feedback come from zxcvbn-ts (@zxcvbn-ts/core 4.2.0 with the common and English
// dictionaries), a general-purpose library; the 12-character floor and the owner's-words rule are
// the office's reading of NIST SP 800-63B §5.1.1.2.
const estimator = createStrengthEstimator();
const nadia = { email: "nadia.fern@larkspur.test", name: "Nadia Fern" };

describe("the password rule (NIST SP 800-63B, zxcvbn-ts)", () => {
  it("when a password is a repeated character or a digit run of 12, then it is refused with the library's feedback", () => {
    expect(newPasswordProblem("aaaaaaaaaaaa", nadia, estimator)).toMatch(/Repeated characters like "aaa"/);
    expect(newPasswordProblem("123456789012", nadia, estimator)).toMatch(/commonly used password/);
    expect(newPasswordProblem("Password1234", nadia, estimator)).toMatch(/similar to a commonly used password/);
  });

  it("when a password is shorter than 12 characters or longer than bcrypt's 72 bytes, then it is refused", () => {
    expect(basicPasswordProblem("orbit-tulip", nadia)).toBe("Use at least 12 characters.");
    expect(basicPasswordProblem("é".repeat(37), nadia)).toMatch(/limited to 72 bytes/); // 74 bytes in UTF-8
    expect(basicPasswordProblem("é".repeat(36), nadia)).toBeNull(); // 72 bytes
  });

  it("when a password contains the name or the e-mail's local part in any case or spacing, then it is refused", () => {
    expect(personalWords(nadia)).toEqual(["nadiafern", "nadia", "fern"]);
    for (const p of ["NadiaFern-orbit-22", "orbit-tulip-nadia", "nadia.fern.mosaic", "mosaic FERN orbit 7"]) {
      expect(basicPasswordProblem(p, nadia), p).toMatch(/your name or the first part of your e-mail/);
    }
  });

  it("when a passphrase is long and uncommon, then it is accepted", () => {
    expect(newPasswordProblem("tulip-orbit-mosaic-41", nadia, estimator)).toBeNull();
    expect(newPasswordProblem("correct horse battery staple", nadia, estimator)).toBeNull();
  });

  it("when used as a zod schema, then the message is the rule's and the field carries it", () => {
    const schema = z.object({ password: newPasswordSchema(nadia, estimator) });
    const r = schema.safeParse({ password: "123456789012" });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]).toMatchObject({ path: ["password"], message: expect.stringMatching(/commonly used/) });
    expect(schema.safeParse({ password: "tulip-orbit-mosaic-41" }).success).toBe(true);
  });
});
