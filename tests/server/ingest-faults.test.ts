import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { ObservationModel } from "../../server/models/observation";
import { UploadModel } from "../../server/models/upload";
import { testApp } from "./helpers";
import { csvFor, ingestFixture, uploadCsv, weekdays } from "./ingest-helpers";
import { otherConnectionRunning, outsideSession } from "./support/outside-session";

const app = testApp();
afterAll(() => sequelize.close());

/** Kills, from outside, the database connection that is running the commit's INSERT into observations. */
async function killCommitConnection(deadlineMs: number): Promise<boolean> {
  const admin = await outsideSession();
  try {
    const victim = await otherConnectionRunning(admin, (q) => /INSERT INTO observations/.test(q), deadlineMs);
    if (victim === undefined) return false;
    await admin.query(`KILL CONNECTION ${victim}`);
    return true;
  } finally {
    await admin.end();
  }
}

describe("the database goes away in the middle of a commit", () => {
  it("when the commit's connection is killed mid-batch, then the API answers 503 with a clear message and no row of the batch remains", async () => {
    const { portfolio, cookie, analyst } = await ingestFixture();
    // 30,000 weekdays: three 10,000-row INSERT batches, so the kill lands between or inside them.
    const dates = weekdays("1911-01-02", 30000);
    const preview = await uploadCsv(app, cookie, csvFor(portfolio.code, dates));
    expect(preview.status).toBe(201);
    expect(preview.body.valid).toBe(30000);

    const [commit, killed] = await Promise.all([
      request(app).post(`/api/uploads/${preview.body.id}/commit`).set("Cookie", cookie),
      killCommitConnection(20_000),
    ]);
    expect(killed).toBe(true);
    expect(commit.status).toBe(503);
    expect(commit.body.error.code).toBe("database_unavailable");
    expect(commit.body.error.message).toMatch(/Nothing was changed/);

    // Whole or absent, never partial: nothing of the batch, and the upload is still a preview.
    expect(await ObservationModel.count({ where: { portfolioId: portfolio.id } })).toBe(0);
    const upload = await UploadModel.findByPk(preview.body.id);
    expect(upload!.status).toBe("preview");
    expect(upload!.committedSha256).toBeNull();

    // The pool recovers and the same preview commits whole.
    const retry = await request(app).post(`/api/uploads/${preview.body.id}/commit`).set("Cookie", cookie);
    expect(retry.status).toBe(200);
    expect(retry.body.inserted).toBe(30000);
    expect(await ObservationModel.count({ where: { portfolioId: portfolio.id, uploadId: preview.body.id } })).toBe(
      30000,
    );
    const committed = await UploadModel.findByPk(preview.body.id);
    expect(committed!.committedBy).toBe(analyst.id);
  });
});
