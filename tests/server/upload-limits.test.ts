import { spawn, type ChildProcess } from "node:child_process";
import { createInterface } from "node:readline";
import path from "node:path";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { config } from "../../server/config";
import { sequelize } from "../../server/db/sequelize";
import { UploadModel } from "../../server/models/upload";
import { Semaphore } from "../../server/semaphore";
import { testApp } from "./helpers";
import { HEADER, ingestFixture, uploadCsv } from "./ingest-helpers";

const app = testApp();
afterAll(() => sequelize.close());

const MB = 1024 * 1024;

/** About `bytes` of data lines in which every cell is wrong (a valid header, so the file is read). */
function hopelessFile(bytes: number, tag: string): Buffer {
  const line = `not a code ${tag}!,31.02.2026,1e5,NaN,-0\n`;
  return Buffer.from(HEADER + "\n" + line.repeat(Math.floor(bytes / line.length)));
}

/** The app in a child process with a 256 MB heap, as the production bundle runs; stopped by `close`. */
async function appWithHeapCeiling(): Promise<{ url: string; child: ChildProcess; exited: () => boolean }> {
  const tsx = path.join(config.projectRoot, "node_modules", ".bin", "tsx");
  const child = spawn(tsx, [path.join(import.meta.dirname, "support", "serve-app.ts")], {
    cwd: config.projectRoot,
    env: { ...process.env, LOG_LEVEL: "error", NODE_OPTIONS: "--max-old-space-size=256" },
    stdio: ["ignore", "pipe", "inherit"],
  });
  let exited = false;
  child.once("exit", () => (exited = true));
  const port = await new Promise<number>((resolve, reject) => {
    child.once("exit", (code) => reject(new Error(`the app exited (${code}) before it listened`)));
    createInterface({ input: child.stdout! }).once("line", (line) => resolve(JSON.parse(line).port));
  });
  return { url: `http://127.0.0.1:${port}`, child, exited: () => exited };
}

let fx: Awaited<ReturnType<typeof ingestFixture>>;
beforeAll(async () => {
  fx = await ingestFixture();
});

describe("bounded memory and work per upload", () => {
  it("when two analysts upload a 15 MB file full of invalid cells at once to a server with a 256 MB heap, then the server survives, both get a clear answer, and it keeps serving", async () => {
    const server = await appWithHeapCeiling();
    try {
      const send = (tag: string) =>
        request(server.url)
          .post("/api/uploads")
          .set("Cookie", fx.cookie)
          .attach("file", hopelessFile(15 * MB, tag), `hopeless-${tag}.csv`)
          .then(
            (res) => ({ status: res.status, body: res.body }),
            (err: Error) => ({ status: 0, body: { error: { message: err.message } } }),
          );
      const answers = await Promise.all([send("a"), send("b")]);
      for (const answer of answers) {
        // A clear refusal: the file is hopeless (422) or has to wait its turn (503 with Retry-After).
        expect([422, 503], JSON.stringify(answer.body).slice(0, 300)).toContain(answer.status);
        expect(answer.body.error.message).toMatch(/\w/);
      }
      const hopeless = answers.find((a) => a.status === 422);
      expect(hopeless?.body.error.code).toBe("invalid_file");
      expect(hopeless?.body.error.message).toMatch(/reading stopped/i);
      expect(hopeless?.body.error.details.errors.length).toBeGreaterThan(0);
      expect(hopeless?.body.error.details.errors.length).toBeLessThanOrEqual(200);
      expect(server.exited()).toBe(false);
      const health = await request(server.url).get("/api/health");
      expect(health.status).toBe(200);
    } finally {
      server.child.kill("SIGTERM");
    }
  }, 120_000);

  it("when a file has many bad rows among good ones, then the preview keeps a bounded number of problems and says how many there were in all", async () => {
    // Two good days, then a line with three bad amounts: 2,000 bad lines among 4,000 good ones.
    const lines: string[] = [];
    for (let i = 0; lines.length < 6000; i++) {
      const d = new Date(Date.UTC(2010, 0, 1 + i));
      const iso = d.toISOString().slice(0, 10);
      if (d.getUTCDay() % 6 === 0 || iso === "2026-12-25") continue;
      lines.push(lines.length % 3 === 2 ? `${fx.portfolio.code},${iso},x,y,z` : `${fx.portfolio.code},${iso},-1,-1,10`);
    }
    const res = await uploadCsv(app, fx.cookie, [HEADER, ...lines].join("\n"), "half-bad.csv");
    expect(res.status).toBe(201);
    expect(res.body.invalid).toBe(2000);
    expect(res.body.errorCount).toBe(2000 * 3); // actual, hypothetical and var on every bad line
    expect(res.body.errors).toHaveLength(200);
    const stored = await UploadModel.findByPk(res.body.id);
    expect(JSON.parse(stored!.errorsJson!).length).toBeLessThanOrEqual(1000);
  });

  it("when more large uploads arrive than may wait their turn, then the next is refused at once with 503, Retry-After and a clear message, and a freed turn lets uploads in again", async () => {
    // One turn and no waiting room; every file counts as large.
    const gate = new Semaphore(1, 0);
    const gated = testApp({ uploadLimits: { gate, largeFileBytes: 0 } });
    const csv = `${HEADER}\n${fx.portfolio.code},2026-01-05,-1,-1,10\n`;
    const release = await gate.acquire(); // another large upload is being checked
    const refused = await uploadCsv(gated, fx.cookie, csv, "queued.csv");
    expect(refused.status).toBe(503);
    expect(refused.headers["retry-after"]).toMatch(/^\d+$/);
    expect(refused.body.error.code).toBe("busy");
    expect(refused.body.error.message).toMatch(/large files are being checked.*try again/i);
    release();
    const accepted = await uploadCsv(gated, fx.cookie, csv, "queued.csv");
    expect(accepted.status).toBe(201);
    await vi.waitFor(() => expect(gate.holders).toBe(0)); // the turn is given back once the answer is sent
  });

  it("when one cell is 15 MB long, then a clear 4xx names the line, not a 500 (no pattern runs over it)", async () => {
    const huge = "1".repeat(15 * MB) + "x";
    const res = await uploadCsv(
      app,
      fx.cookie,
      `${HEADER}\n${fx.portfolio.code},2026-01-05,${huge},1,10\n`,
      "one-cell.csv",
    );
    expect(res.status).toBeGreaterThanOrEqual(400);
    expect(res.status).toBeLessThan(500);
    expect(JSON.stringify(res.body)).toMatch(/line 2|"line":2/);
    expect(JSON.stringify(res.body)).toMatch(/characters/);
  }, 60_000);
});
