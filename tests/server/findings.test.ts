import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { DataFindingModel } from "../../server/models/data-finding";
import { createTestUser, sessionCookieFor, testApp } from "./helpers";
import { HEADER, ingestFixture, uploadCsv } from "./ingest-helpers";

const app = testApp();
afterAll(() => sequelize.close());

async function commitCsv(cookie: string, csv: string) {
  const preview = await uploadCsv(app, cookie, csv);
  expect(preview.status).toBe(201);
  const commit = await request(app).post(`/api/uploads/${preview.body.id}/commit`).set("Cookie", cookie);
  expect(commit.status).toBe(200);
}

describe("data-quality findings", () => {
  it("when a committed file has a gap, stale VaR, a P&L without VaR and an outlier, then each is listed as an open finding", async () => {
    const { portfolio, entity, cookie } = await ingestFixture();
    const P = portfolio.code;
    // Mon 2 Nov … Fri 13 Nov 2026; Thu 5 and Fri 6 Nov are missing.
    const csv = [
      HEADER,
      `${P},2026-11-02,-10,-10,100`,
      `${P},2026-11-03,-10,-10,100`,
      `${P},2026-11-04,-10,-10,100`,
      `${P},2026-11-09,-10,-10,100`,
      `${P},2026-11-10,-10,-10,100`,
      `${P},2026-11-11,800,-10,120`,
      `${P},2026-11-12,-10,-10,`,
      `${P},2026-11-13,-10,-10,130`,
    ].join("\n");
    await commitCsv(cookie, csv);

    const res = await request(app).get(`/api/findings?entity=${entity.code}`).set("Cookie", cookie);
    expect(res.status).toBe(200);
    const byKind = Object.fromEntries(res.body.map((f: { kind: string }) => [f.kind, f]));
    expect(byKind.missing_day).toMatchObject({ from: "2026-11-05", to: "2026-11-06", status: "open", portfolio: P });
    expect(byKind.stale_var).toMatchObject({ from: "2026-11-02", to: "2026-11-10" });
    expect(byKind.pnl_without_var).toMatchObject({ from: "2026-11-12" });
    expect(byKind.outlier).toMatchObject({ from: "2026-11-11" }); // 800 > 5 × 120 (common practice threshold)
    expect(await DataFindingModel.count({ where: { portfolioId: portfolio.id, status: "open" } })).toBe(4);
  });

  it("when the missing days arrive later, then that finding is resolved by the data", async () => {
    const { portfolio, cookie } = await ingestFixture();
    const P = portfolio.code;
    await commitCsv(cookie, [HEADER, `${P},2026-11-02,-1,-1,100`, `${P},2026-11-04,-1,-1,101`].join("\n"));
    expect(
      await DataFindingModel.count({ where: { portfolioId: portfolio.id, kind: "missing_day", status: "open" } }),
    ).toBe(1);
    await commitCsv(cookie, [HEADER, `${P},2026-11-03,-1,-1,102`].join("\n"));
    const finding = await DataFindingModel.findOne({ where: { portfolioId: portfolio.id, kind: "missing_day" } });
    expect(finding!.status).toBe("resolved");
    expect(finding!.note).toMatch(/Cleared by later data/);
  });

  it("when an analyst explains a finding, then it is stored with who and why; a stale version gets 409 and changes nothing", async () => {
    const { portfolio, cookie } = await ingestFixture();
    const P = portfolio.code;
    await commitCsv(cookie, [HEADER, `${P},2026-11-02,-1,-1,100`, `${P},2026-11-04,-1,-1,101`].join("\n"));
    const [finding] = (await request(app).get(`/api/findings?portfolio=${P}&status=open`).set("Cookie", cookie)).body;
    const ok = await request(app)
      .put(`/api/findings/${finding.id}`)
      .set("Cookie", cookie)
      .send({ status: "explained", note: "Office closed for a local holiday", version: finding.version });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({
      status: "explained",
      note: "Office closed for a local holiday",
      version: finding.version + 1,
    });
    expect(ok.body.closedBy).toMatch(/@/);
    const stale = await request(app)
      .put(`/api/findings/${finding.id}`)
      .set("Cookie", cookie)
      .send({ status: "resolved", note: "Another view", version: finding.version });
    expect(stale.status).toBe(409);
    const row = await DataFindingModel.findByPk(finding.id);
    expect(row!.status).toBe("explained");
    expect(row!.note).toBe("Office closed for a local holiday");
  });
});

describe("findings follow the data and the calendar", () => {
  it("when a cleared gap comes back through a restatement of the calendar, then the finding opens again", async () => {
    const { portfolio, entity, cookie } = await ingestFixture();
    const P = portfolio.code;
    await commitCsv(cookie, [HEADER, `${P},2026-11-02,-1,-1,100`, `${P},2026-11-04,-1,-1,101`].join("\n"));
    const admin = await createTestUser("admin");
    const adminCookie = await sessionCookieFor(admin.id);
    // Declaring 3 Nov a holiday clears the gap; removing it again brings the gap back.
    await request(app)
      .post(`/api/entities/${entity.code}/holidays`)
      .set("Cookie", adminCookie)
      .send({ date: "2026-11-03", name: "Closure" })
      .expect(201);
    let finding = await DataFindingModel.findOne({ where: { portfolioId: portfolio.id, kind: "missing_day" } });
    expect(finding!.status).toBe("resolved");
    await request(app)
      .delete(`/api/entities/${entity.code}/holidays/2026-11-03`)
      .set("Cookie", adminCookie)
      .expect(204);
    finding = await DataFindingModel.findOne({ where: { portfolioId: portfolio.id, kind: "missing_day" } });
    expect(finding).toMatchObject({ status: "open", note: null, dateFrom: "2026-11-03" });
  });
});
