import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { testApp, unique } from "./helpers";

afterAll(() => sequelize.close());

const FORGED = ["203.0.113.7", "198.51.100.23", "192.0.2.44", "203.0.113.99", "198.51.100.1"];

/** A failed sign-in for an unknown address (a new e-mail each time: only the per-address limit applies). */
function failedSignIn(app: ReturnType<typeof testApp>, email: string, forwardedFor: string) {
  return request(app)
    .post("/api/auth/login")
    .set("X-Forwarded-For", forwardedFor)
    .send({ email, password: "not the password at all" });
}

async function auditedAddressOf(email: string): Promise<string | null> {
  const row = await AuditEventModel.findOne({ where: { action: "auth.sign_in_failed", target: email } });
  return row!.ip;
}

describe("which address the sign-in limit and the audit log believe", () => {
  it("when no proxy is trusted (the default), then rotating X-Forwarded-For neither gets past the per-address limit nor forges the audited address", async () => {
    const app = testApp({
      signInLimits: { windowMs: 60_000, perAccount: 100, perAddress: 3, namespace: unique("xff-") },
    });
    const statuses: number[] = [];
    const emails: string[] = [];
    for (const forged of FORGED) {
      const email = `nobody-${unique()}@tests.quartermark.test`;
      emails.push(email);
      statuses.push((await failedSignIn(app, email, forged)).status);
    }
    expect(statuses).toEqual([401, 401, 401, 429, 429]);
    const address = await auditedAddressOf(emails[0]);
    expect(address).not.toBe(FORGED[0]);
    expect(address).toMatch(/127\.0\.0\.1|::1/);
  });

  it("when TRUST_PROXY names the local proxy, then the address it forwards is the one limited and audited", async () => {
    const app = testApp({
      trustProxy: ["127.0.0.1", "::1"],
      signInLimits: { windowMs: 60_000, perAccount: 100, perAddress: 3, namespace: unique("xff-") },
    });
    const email = `nobody-${unique()}@tests.quartermark.test`;
    expect((await failedSignIn(app, email, FORGED[0])).status).toBe(401);
    expect(await auditedAddressOf(email)).toBe(FORGED[0]);
    // Each forwarded address is counted on its own, as the proxy reports them.
    for (const forged of FORGED.slice(1)) {
      expect((await failedSignIn(app, `nobody-${unique()}@tests.quartermark.test`, forged)).status).toBe(401);
    }
  });
});
