import request from "supertest";
import { performance } from "node:perf_hooks";
import { afterAll, describe, expect, it } from "vitest";
import { createTestUser, testApp, TEST_PASSWORD, unique } from "./helpers";
import { closePasswordPool, passwordJobsDone } from "../../server/modules/auth/password-hashing";
import { sequelize } from "../../server/db/sequelize";

/** The time the main thread's event loop spent working (not idle) while `work` ran, in ms. */
async function mainThreadBusyMs(work: () => Promise<unknown>): Promise<number> {
  const before = performance.eventLoopUtilization();
  await work();
  return performance.eventLoopUtilization(before).active;
}

// Limits of its own, so failed sign-ins of earlier files on 127.0.0.1 never stand in the way.
const limitsOfItsOwn = () => ({
  signInLimits: { windowMs: 60_000, perAccount: 100, perAddress: 100, namespace: unique("threads-") },
});

describe("password hashing runs off the event loop", () => {
  afterAll(async () => {
    await closePasswordPool();
    await sequelize.close();
  });

  it("when twelve people sign in at once, then the twelve checks run in the password threads", async () => {
    const app = testApp(limitsOfItsOwn());
    const users = await Promise.all(Array.from({ length: 12 }, () => createTestUser("analyst")));

    const jobsBefore = passwordJobsDone();
    const statuses: number[] = [];
    const busyMs = await mainThreadBusyMs(() =>
      Promise.all(
        users.map((u) =>
          request(app)
            .post("/api/auth/login")
            .send({ email: u.email, password: TEST_PASSWORD })
            .then((res) => statuses.push(res.status)),
        ),
      ),
    );
    expect(statuses).toEqual(Array(12).fill(200));
    expect(passwordJobsDone() - jobsBefore).toBe(12);
    // The pool counts the checks its threads finished: all twelve left the main thread. How busy the
    // main thread was is logged to compare runs, not asserted (timings belong to the benchmarks).
    console.info(`sign-ins: main thread busy ${busyMs.toFixed(0)} ms`);
  });

  it("when a password is wrong, then the check in the pool says so", async () => {
    const user = await createTestUser("analyst");
    const res = await request(testApp(limitsOfItsOwn()))
      .post("/api/auth/login")
      .send({ email: user.email, password: "not it at all" });
    expect(res.status).toBe(401);
  });
});
