/**
 * Several server processes on one database (server/cluster.ts): what one process writes, another
 * reads at once; the sign-in limit is one limit across processes; a worker that dies is replaced.
 * Each server here is the real entry (server/index.ts) in a process of its own.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { PortfolioModel } from "../../server/models/portfolio";
import { createTestEntity, createTestUser, sessionCookieFor, unique } from "./helpers";
import { startServerProcess, type ServerProcess } from "./support/server-process";

const alive = (pid: number) => {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
};

describe("two server processes on the one database", () => {
  let a: ServerProcess;
  let b: ServerProcess;
  beforeAll(async () => {
    [a, b] = await Promise.all([startServerProcess(1), startServerProcess(1)]);
  }, 180_000);
  afterAll(async () => {
    await Promise.all([a?.stop(), b?.stop()]);
  });

  it("when an admin creates an entity through one process, then the other lists it at once", async () => {
    const admin = await createTestUser("admin");
    const cookie = await sessionCookieFor(admin.id);
    const code = `X-${unique().toUpperCase()}`;
    const created = await fetch(`${a.base}/api/entities`, {
      method: "POST",
      headers: { cookie, origin: a.base, "content-type": "application/json" },
      body: JSON.stringify({ code, name: "Cross-process entity", regime: "eu", currency: "EUR" }),
    });
    expect(created.status).toBe(201);
    const listed = await fetch(`${b.base}/api/entities`, { headers: { cookie } });
    expect(listed.status).toBe(200);
    expect(((await listed.json()) as { code: string }[]).map((e) => e.code)).toContain(code);
  });

  it("when an analyst commits a day through one process, then the other's backtest stands on that day at once", async () => {
    const entity = await createTestEntity();
    const code = `${entity.code}-TOP`;
    await PortfolioModel.create({ entityId: entity.id, code, name: "Top of house", level: "top" });
    const cookie = await sessionCookieFor((await createTestUser("analyst")).id);
    const send = async (csv: string) => {
      const form = new FormData();
      form.append("file", new Blob([csv], { type: "text/csv" }), `${unique()}.csv`);
      const preview = await fetch(`${a.base}/api/uploads`, {
        method: "POST",
        headers: { cookie, origin: a.base },
        body: form,
      });
      expect(preview.status).toBe(201);
      const { id } = (await preview.json()) as { id: number };
      const commit = await fetch(`${a.base}/api/uploads/${id}/commit`, {
        method: "POST",
        headers: { cookie, origin: a.base },
      });
      expect(commit.status).toBe(200);
    };
    const header = "portfolio,date,actual_pnl,hypothetical_pnl,var_99\n";
    await send(`${header}${code},2026-03-02,-100.00,-100.00,5000.00\n`);
    const first = await fetch(`${b.base}/api/portfolios/${code}/backtest`, { headers: { cookie } });
    expect(((await first.json()) as { latestDate: string }).latestDate).toBe("2026-03-02");
    // A loss beyond VaR on the next day, written through A: B counts it at once.
    await send(`${header}${code},2026-03-03,-9000.00,-9000.00,5000.00\n`);
    const second = (await (
      await fetch(`${b.base}/api/portfolios/${code}/backtest`, { headers: { cookie } })
    ).json()) as {
      latestDate: string;
      exceptionDays: { date: string }[];
    };
    expect(second.latestDate).toBe("2026-03-03");
    expect(second.exceptionDays.map((d) => d.date)).toEqual(["2026-03-03"]);
  });

  it("when an account fails to sign in five times on one process, then the other refuses the sixth (429)", async () => {
    // The per-account limit is 5 failed attempts in 15 minutes (server/modules/auth/auth.router.ts).
    const user = await createTestUser("analyst");
    const attempt = (s: ServerProcess, password: string) =>
      fetch(`${s.base}/api/auth/login`, {
        method: "POST",
        headers: { origin: s.base, "content-type": "application/json" },
        body: JSON.stringify({ email: user.email, password }),
      });
    for (let i = 0; i < 5; i++) expect((await attempt(a, "not-the-password")).status).toBe(401);
    expect((await attempt(b, "not-the-password")).status).toBe(429);
  });
});

describe("the cluster primary", () => {
  let server: ServerProcess;
  beforeAll(async () => {
    server = await startServerProcess(2);
  }, 180_000);
  afterAll(async () => {
    await server?.stop();
  });

  it("when a worker is killed, then the crash is logged and a new worker takes its place", async () => {
    const [, list] = await server.waitFor(/\[cluster\] 2 worker process\(es\): ([\d, ]+)/);
    const pids = list.split(",").map((p) => Number(p.trim()));
    expect(pids).toHaveLength(2);
    process.kill(pids[0], "SIGKILL");
    await server.waitFor(new RegExp(`worker ${pids[0]} died \\(signal SIGKILL\\)`));
    const [, replacement] = await server.waitFor(new RegExp(`worker (\\d+) replaces ${pids[0]}`));
    expect(alive(Number(replacement))).toBe(true);
    expect(alive(pids[0])).toBe(false);
    // The port is still served, by the survivor and the new worker.
    for (let i = 0; i < 4; i++) expect((await fetch(`${server.base}/api/health`)).status).toBe(200);
  });
});
