import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { ObservationModel } from "../../server/models/observation";
import { UploadModel } from "../../server/models/upload";
import { AuditEventModel } from "../../server/models/audit-event";
import { HolidayModel } from "../../server/models/holiday";
import { checkedRowsOf, forgetCheckedRows } from "../../server/modules/uploads/preview-cache";
import { queueInsertVersions, type PipelinedWrites } from "../../server/modules/observations/observations.repository";
import { testApp } from "./helpers";
import { csvFor, HEADER, ingestFixture, uploadCsv, weekdays } from "./ingest-helpers";

const app = testApp();
afterAll(() => sequelize.close());

async function observationCount(portfolioId: number) {
  return ObservationModel.count({ where: { portfolioId } });
}

/** Commits an upload that must be refused: the status, the message if given, and not one day of the portfolio written. */
async function expectCommitRefused(
  uploadId: number,
  cookie: string,
  portfolioId: number,
  status: number,
  message?: RegExp,
) {
  const commit = await request(app).post(`/api/uploads/${uploadId}/commit`).set("Cookie", cookie);
  expect(commit.status).toBe(status);
  if (message) expect(commit.body.error.message).toMatch(message);
  expect(await observationCount(portfolioId)).toBe(0);
}

describe("uploading daily data", () => {
  it("when a clean file is uploaded, then the preview counts the rows and nothing is written until commit", async () => {
    const { portfolio, cookie } = await ingestFixture();
    const dates = weekdays("2026-11-02", 10);
    const res = await uploadCsv(app, cookie, csvFor(portfolio.code, dates));
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      status: "preview",
      rows: 10,
      valid: 10,
      invalid: 0,
      newRows: 10,
      restatements: 0,
      errors: [],
      portfolios: [portfolio.code],
      from: dates[0],
      to: dates[9],
    });
    expect(res.body.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(await observationCount(portfolio.id)).toBe(0);

    const commit = await request(app).post(`/api/uploads/${res.body.id}/commit`).set("Cookie", cookie);
    expect(commit.status).toBe(200);
    expect(commit.body).toEqual({ id: res.body.id, status: "committed", inserted: 10, restated: 0, unchanged: 0 });
    expect(await observationCount(portfolio.id)).toBe(10);
    const stored = await ObservationModel.findOne({ where: { portfolioId: portfolio.id, businessDate: dates[3] } });
    expect(stored).toMatchObject({ version: 1, isCurrent: true, actualPnl: -301, hypotheticalPnl: -270, var99: 1003 });
    expect((await UploadModel.findByPk(res.body.id))!.status).toBe("committed");
    expect(await AuditEventModel.count({ where: { action: "upload.commit", target: `upload #${res.body.id}` } })).toBe(
      1,
    );

    const read = await request(app)
      .get(`/api/portfolios/${portfolio.code}/observations?from=${dates[2]}&to=${dates[4]}`)
      .set("Cookie", cookie);
    expect(read.status).toBe(200);
    expect(read.body.map((o: { date: string }) => o.date)).toEqual(dates.slice(2, 5));
    expect(read.body[1]).toMatchObject({
      actualPnl: -301,
      hypotheticalPnl: -270,
      var99: 1003,
      var975: null,
      version: 1,
    });
  });

  it("when a file restates stored days, then each changed day gets a new version, the old one is kept, and unchanged days are skipped", async () => {
    const { portfolio, cookie, analyst } = await ingestFixture();
    const dates = weekdays("2026-10-05", 5);
    const first = await uploadCsv(app, cookie, csvFor(portfolio.code, dates));
    await request(app).post(`/api/uploads/${first.body.id}/commit`).set("Cookie", cookie).expect(200);

    const changed = csvFor(portfolio.code, dates, (i) =>
      i === 2 ? "-999.5,-90.25,1500" : `${-100 * i - 1},${-90 * i},${1000 + i}`,
    );
    const second = await uploadCsv(app, cookie, changed, "restated.csv");
    expect(second.body).toMatchObject({ rows: 5, newRows: 0, restatements: 1, unchanged: 4 });
    const commit = await request(app).post(`/api/uploads/${second.body.id}/commit`).set("Cookie", cookie);
    expect(commit.body).toMatchObject({ inserted: 1, restated: 1, unchanged: 4 });

    const versions = await ObservationModel.findAll({
      where: { portfolioId: portfolio.id, businessDate: dates[2] },
      order: [["version", "ASC"]],
    });
    expect(versions.map((v) => [v.version, v.isCurrent, v.actualPnl])).toEqual([
      [1, false, -201],
      [2, true, -999.5],
    ]);
    // Who and when of each version: the commit of the upload that wrote it.
    expect(versions.map((v) => v.uploadId)).toEqual([first.body.id, second.body.id]);
    const writers = await UploadModel.findAll({
      where: { id: [first.body.id, second.body.id] },
      order: [["id", "ASC"]],
    });
    expect(writers.map((u) => u.committedBy)).toEqual([analyst.id, analyst.id]);
    expect(writers[1].committedAt!.getTime()).toBeGreaterThanOrEqual(writers[0].committedAt!.getTime());
    const history = await request(app).get(`/api/uploads/${second.body.id}`).set("Cookie", cookie);
    expect(history.body).toMatchObject({
      committedBy: analyst.email,
      committedAt: writers[1].committedAt!.toISOString(),
    });
    const read = await request(app).get(`/api/portfolios/${portfolio.code}/observations`).set("Cookie", cookie);
    expect(read.body[2]).toMatchObject({
      date: dates[2],
      actualPnl: -999.5,
      hypotheticalPnl: -90.25,
      var99: 1500,
      version: 2,
    });
  });

  it("when a large file restates days spread over several write batches, then each of them gets one new version and every other day stays as it was", async () => {
    const { portfolio, cookie } = await ingestFixture();
    const dates = weekdays("2000-01-03", 11_000, new Set(["2026-12-25"]));
    const first = await uploadCsv(app, cookie, csvFor(portfolio.code, dates.slice(0, 10_990)));
    await request(app).post(`/api/uploads/${first.body.id}/commit`).set("Cookie", cookie).expect(200);

    // Changed days on both sides of the 5,000-row batch edges, and ten new days at the end.
    const changedAt = new Set([10, 4_999, 5_000, 5_001, 9_999, 10_500]);
    const second = await uploadCsv(
      app,
      cookie,
      csvFor(portfolio.code, dates, (i) =>
        changedAt.has(i) ? `-7.5,-6.25,${2000 + i}` : `${-100 * i - 1},${-90 * i},${1000 + i}`,
      ),
      "restated.csv",
    );
    expect(second.body).toMatchObject({ rows: 11_000, newRows: 10, restatements: 6, unchanged: 10_984 });
    const commit = await request(app).post(`/api/uploads/${second.body.id}/commit`).set("Cookie", cookie).expect(200);
    expect(commit.body).toMatchObject({ inserted: 16, restated: 6, unchanged: 10_984 });

    expect(await observationCount(portfolio.id)).toBe(11_006);
    const written = await ObservationModel.findAll({
      where: { portfolioId: portfolio.id, uploadId: second.body.id },
      order: [["businessDate", "ASC"]],
    });
    expect(written.map((o) => [o.businessDate, o.version, o.isCurrent])).toEqual([
      ...[...changedAt].map((i) => [dates[i], 2, true]),
      ...dates.slice(10_990).map((d) => [d, 1, true]),
    ]);
    const retired = await ObservationModel.findAll({
      where: { portfolioId: portfolio.id, isCurrent: false },
      order: [["businessDate", "ASC"]],
    });
    expect(retired.map((o) => [o.businessDate, o.version])).toEqual([...changedAt].map((i) => [dates[i], 1]));
    const read = await request(app)
      .get(`/api/portfolios/${portfolio.code}/observations?from=${dates[5_000]}&to=${dates[5_000]}`)
      .set("Cookie", cookie);
    expect(read.body).toEqual([
      expect.objectContaining({ actualPnl: -7.5, hypotheticalPnl: -6.25, var99: 7000, version: 2 }),
    ]);
    // Every row names a portfolio and an upload that exist (the bulk INSERTs skip the per-row lookups).
    const [[orphans]] = (await sequelize.query(
      `SELECT COUNT(*) AS n FROM observations o LEFT JOIN portfolios p ON p.id = o.portfolio_id LEFT JOIN uploads u ON u.id = o.upload_id
        WHERE o.upload_id IN (:ids) AND (p.id IS NULL OR u.id IS NULL OR p.id <> :portfolioId)`,
      { replacements: { ids: [first.body.id, second.body.id], portfolioId: portfolio.id } },
    )) as [{ n: number }[], unknown];
    expect(Number(orphans.n)).toBe(0);
  });

  it("when rows would name a portfolio the commit does not hold locked, then nothing is sent to the database", async () => {
    const sent: string[] = [];
    const writes = {
      send: (sql: string) => sent.push(sql),
      flush: async () => undefined,
    } as unknown as PipelinedWrites;
    const row = { date: "2026-10-05", actual_pnl: -1, hypothetical_pnl: -1, var_99: 10 };
    await expect(
      queueInsertVersions(
        writes,
        [
          { portfolioId: 7, version: 1, row },
          { portfolioId: 8, version: 1, row },
        ],
        1,
        new Set([7]),
      ),
    ).rejects.toThrow(/portfolio #8, which this commit does not hold locked/);
    expect(sent).toEqual([]);
    await queueInsertVersions(writes, [{ portfolioId: 7, version: 1, row }], 1, new Set([7]));
    expect(sent).toEqual([
      "SET STATEMENT foreign_key_checks = 0 FOR INSERT INTO observations (portfolio_id, business_date, actual_pnl, hypothetical_pnl, var_99, upload_id) VALUES (7,'2026-10-05',-1,-1,10,1)",
    ]);
  });

  it("when the same file is uploaded again after commit, then 409 names the earlier upload and nothing is stored", async () => {
    const { portfolio, cookie } = await ingestFixture();
    const csv = csvFor(portfolio.code, weekdays("2026-09-07", 3));
    const first = await uploadCsv(app, cookie, csv);
    await request(app).post(`/api/uploads/${first.body.id}/commit`).set("Cookie", cookie).expect(200);
    const before = await UploadModel.count();
    const again = await uploadCsv(app, cookie, csv, "same-again.csv");
    expect(again.status).toBe(409);
    expect(again.body.error.message).toContain(`#${first.body.id}`);
    expect(await UploadModel.count()).toBe(before);
  });

  it("when two identical previews are committed at once, then exactly one commits and the other is told it is a duplicate", async () => {
    const { portfolio, cookie } = await ingestFixture();
    const csv = csvFor(portfolio.code, weekdays("2026-08-03", 50));
    const [a, b] = await Promise.all([uploadCsv(app, cookie, csv, "a.csv"), uploadCsv(app, cookie, csv, "b.csv")]);
    expect([a.status, b.status]).toEqual([201, 201]);
    const results = await Promise.all([
      request(app).post(`/api/uploads/${a.body.id}/commit`).set("Cookie", cookie),
      request(app).post(`/api/uploads/${b.body.id}/commit`).set("Cookie", cookie),
    ]);
    expect(results.map((r) => r.status).sort()).toEqual([200, 409]);
    expect(results.find((r) => r.status === 409)!.body.error.message).toMatch(/already committed/);
    expect(await observationCount(portfolio.id)).toBe(50);
  });

  it.each([
    { held: "still holds the preview's rows", start: "2026-06-01", holiday: 2, forget: false },
    { held: "no longer holds the rows", start: "2026-08-03", holiday: 1, forget: true },
  ])(
    "when a day of the preview becomes a holiday before the commit and the server $held, then the commit is refused with 409 and nothing is written",
    async ({ start, holiday, forget }) => {
      const { portfolio, entity, cookie } = await ingestFixture();
      const dates = weekdays(start, 5);
      const preview = await uploadCsv(app, cookie, csvFor(portfolio.code, dates));
      expect(preview.body.invalid).toBe(0);
      if (forget) forgetCheckedRows(preview.body.id);
      await HolidayModel.create({ entityId: entity.id, date: dates[holiday], name: "Unplanned closure" });
      await expectCommitRefused(preview.body.id, cookie, portfolio.id, 409, /reference data changed/);
    },
  );

  it("when the server no longer holds the preview's rows (a restart, another process), then the commit parses the stored file and writes the same rows", async () => {
    const { portfolio, cookie } = await ingestFixture();
    const dates = weekdays("2026-07-06", 8);
    const preview = await uploadCsv(
      app,
      cookie,
      csvFor(portfolio.code, dates, (i) => `${-10 * i - 0.5},${-9 * i},${100 + i}.25`),
    );
    expect(checkedRowsOf(preview.body.id, preview.body.sha256)).toHaveLength(8);
    forgetCheckedRows(preview.body.id);
    const commit = await request(app).post(`/api/uploads/${preview.body.id}/commit`).set("Cookie", cookie);
    expect(commit.body).toMatchObject({ status: "committed", inserted: 8 });
    const stored = await ObservationModel.findAll({
      where: { portfolioId: portfolio.id },
      order: [["businessDate", "ASC"]],
    });
    expect(stored.map((o) => [o.businessDate, o.actualPnl, o.hypotheticalPnl, o.var99])).toEqual(
      dates.map((d, i) => [d, -10 * i - 0.5, -9 * i || 0, 100 + i + 0.25]),
    );
  });

  it("when a preview is discarded, then it cannot be committed and nothing was written", async () => {
    const { portfolio, cookie } = await ingestFixture();
    const res = await uploadCsv(app, cookie, csvFor(portfolio.code, weekdays("2026-07-06", 2)));
    await request(app).delete(`/api/uploads/${res.body.id}`).set("Cookie", cookie).expect(204);
    await expectCommitRefused(res.body.id, cookie, portfolio.id, 409);
    expect((await UploadModel.scope("withContent").findByPk(res.body.id))!.content).toBeNull();
  });

  it("when a file carries the FRTB charges, then they are stored and read back; a negative charge is refused with its line", async () => {
    const { portfolio, cookie } = await ingestFixture();
    const [d1, d2] = weekdays("2026-11-02", 2);
    const header = `${HEADER},ima_drc,sbm,rrao,sa_drc,sa_ga`;
    const bad = await uploadCsv(app, cookie, `${header}\n${portfolio.code},${d1},1,1,10,5,-40,2,3,\n`);
    expect(bad.status).toBe(201);
    expect(bad.body).toMatchObject({ valid: 0, invalid: 1 });
    expect(bad.body.errors).toEqual([
      expect.objectContaining({ line: 2, column: "sbm", message: "sbm cannot be negative" }),
    ]);

    const csv = `${header}\n${portfolio.code},${d1},1,1,10,5,40,2,3,\n${portfolio.code},${d2},1,1,10,0,41.5,0,3,30\n`;
    const res = await uploadCsv(app, cookie, csv);
    expect(res.body).toMatchObject({ valid: 2, invalid: 0 });
    expect((await request(app).post(`/api/uploads/${res.body.id}/commit`).set("Cookie", cookie)).status).toBe(200);
    const stored = await ObservationModel.findOne({ where: { portfolioId: portfolio.id, businessDate: d2 } });
    expect(stored).toMatchObject({ imaDrc: 0, sbm: 41.5, rrao: 0, saDrc: 3, saGa: 30 });
    const read = await request(app).get(`/api/portfolios/${portfolio.code}/observations`).set("Cookie", cookie);
    expect(read.body[0]).toMatchObject({ imaDrc: 5, sbm: 40, rrao: 2, saDrc: 3, saGa: null });
  });

  it("when a file carries the parts of its actual P&L, then each rule set backtests its own P&L and shows the make-up (docs/rules.md#pnl-definition)", async () => {
    const header = `${HEADER},fees_commissions,reserves_adjustments,net_interest_income,intraday_pnl,new_trade_pnl`;
    const [d1, d2, d3] = weekdays("2026-11-02", 3);
    const backtestOf = async (regime: "us" | "eu") => {
      const { entity, portfolio, cookie } = await ingestFixture();
      await entity.update({ regime, pnlBasis: "actual" });
      // d2: actual −95 against VaR 100 (no exception as supplied), with fee income 12, NII 3, intraday −20, new trades 4.
      const csv =
        `${header}\n${portfolio.code},${d1},5,5,100,,,,,\n` +
        `${portfolio.code},${d2},-95,-40,100,12,,3,-20,4\n${portfolio.code},${d3},5,5,100,,,,,\n`;
      const up = await uploadCsv(app, cookie, csv);
      expect(up.body).toMatchObject({ valid: 3, invalid: 0 });
      expect((await request(app).post(`/api/uploads/${up.body.id}/commit`).set("Cookie", cookie)).status).toBe(200);
      const stored = await ObservationModel.findOne({ where: { portfolioId: portfolio.id, businessDate: d2 } });
      expect(stored).toMatchObject({
        actualPnl: -95,
        feesCommissions: 12,
        reservesAdjustments: null,
        intradayPnl: -20,
      });
      const read = await request(app).get(`/api/portfolios/${portfolio.code}/observations`).set("Cookie", cookie);
      // As supplied, with the figure the rule set backtests beside it.
      expect(read.body[1]).toMatchObject({ actualPnl: -95, netInterestIncome: 3, newTradePnl: 4 });
      expect(read.body[1].backtestActualPnl).toBe(regime === "eu" ? -110 : -90);
      return (await request(app).get(`/api/portfolios/${portfolio.code}/backtest`).set("Cookie", cookie)).body;
    };

    // CRR Art. 366(3): fees, commissions and NII out: −95 − 12 − 3 = −110, an overshooting of 10.
    const eu = await backtestOf("eu");
    expect(eu.exceptions.actual).toBe(1);
    expect(eu.exceptionDays[0]).toMatchObject({ date: d2, actualPnl: -110, excessActual: 10 });
    expect(eu.exceptionDays[0].actualMakeUp).toMatchObject({ supplied: -95, backtesting: -110 });
    expect(eu.exceptionDays[0].actualMakeUp.source).toMatch(/366\(3\)/);
    // 12 CFR 217.204(b)(1) (from memory): intraday trading out as well: −95 − 12 − 3 + 20 = −90, no exception.
    const us = await backtestOf("us");
    expect(us.exceptions.actual).toBe(0);
    expect(us.exceptionDays).toEqual([]);
  });

  it("when the template is downloaded, then it has every column in order and its example rows parse", async () => {
    const { cookie } = await ingestFixture();
    const res = await request(app).get("/api/uploads/template.csv").set("Cookie", cookie);
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/text\/csv/);
    expect(res.text.split("\n")[0]).toBe(
      "portfolio,date,actual_pnl,hypothetical_pnl,var_99,var_975,svar_99,var_10d,svar_10d,es_975,ses,rtpl," +
        "ima_drc,sbm,rrao,sa_drc,sa_ga,fees_commissions,reserves_adjustments,net_interest_income,intraday_pnl," +
        "new_trade_pnl",
    );
  });

  it("when the downloaded template is uploaded as it is, then nothing is previewed, restated or stored: it says to put real days in place of the examples", async () => {
    const { portfolio, cookie } = await ingestFixture();
    const template = (await request(app).get("/api/uploads/template.csv").set("Cookie", cookie)).text;
    const lines = template.trim().split(/\r?\n/);
    expect(lines.length).toBeGreaterThan(1);
    for (const line of lines.slice(1)) expect(line.startsWith("example,")).toBe(true);
    const before = await UploadModel.count();
    const res = await uploadCsv(app, cookie, template);
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/only the template's example lines/);
    expect(await UploadModel.count()).toBe(before);

    // With one real day added, the examples are skipped and only that day is previewed, as new.
    const emptyOptional = ",".repeat(lines[0].split(",").length - 5);
    const withDay = `${template.trimEnd()}\n${portfolio.code},2026-11-02,-1,-1,10${emptyOptional}\n`;
    const preview = await uploadCsv(app, cookie, withDay);
    expect(preview.status, JSON.stringify(preview.body)).toBe(201);
    expect(preview.body).toMatchObject({ rows: 1, valid: 1, invalid: 0, newRows: 1, restatements: 0 });
  });

  it("when the preview rows are paged with invalidOnly, then only rows with errors come back, each with its messages", async () => {
    const { portfolio, cookie } = await ingestFixture();
    const csv = `${HEADER}\n${portfolio.code},2026-11-02,-1,-1,10\n${portfolio.code},2026-11-03,-1,-1,-10\n${portfolio.code},2026-11-04,-1,-1,10\n`;
    const res = await uploadCsv(app, cookie, csv);
    const page = await request(app).get(`/api/uploads/${res.body.id}/rows?invalidOnly=true`).set("Cookie", cookie);
    expect(page.status).toBe(200);
    expect(page.body.total).toBe(1);
    expect(page.body.rows[0]).toMatchObject({
      line: 3,
      cells: { var_99: "-10" },
      errors: [{ line: 3, column: "var_99" }],
    });
  });
});

describe("bad input ends in a clear error and nothing written", () => {
  async function expectPreviewError(content: string | Buffer, line: number, column: string, message: RegExp) {
    const { portfolio, cookie } = await ingestFixture();
    const text = typeof content === "string" ? content.replaceAll("PF", portfolio.code) : content;
    const res = await uploadCsv(app, cookie, text);
    expect(res.status).toBe(201);
    expect(res.body.invalid).toBeGreaterThan(0);
    expect(res.body.errors).toEqual(
      expect.arrayContaining([expect.objectContaining({ line, column, message: expect.stringMatching(message) })]),
    );
    await expectCommitRefused(res.body.id, cookie, portfolio.id, 422, /Fix the file/);
  }

  it("a byte-order mark and CRLF line ends are accepted", async () => {
    const { portfolio, cookie } = await ingestFixture();
    const csv = `\uFEFF${HEADER}\r\n${portfolio.code},2026-11-02,-5,-4,10\r\n${portfolio.code},2026-11-03,-5,-4,10\r\n`;
    const res = await uploadCsv(app, cookie, csv);
    expect(res.body).toMatchObject({ rows: 2, valid: 2, invalid: 0 });
  });

  it("an unclosed quote", () =>
    expectPreviewError(
      `${HEADER}\nPF,2026-11-02,-5,-4,10\nPF,2026-11-03,"-5,-4,10\nPF,2026-11-04,-5,-4,10\n`,
      3,
      "—",
      /never closed/,
    ));
  it("NaN", () => expectPreviewError(`${HEADER}\nPF,2026-11-02,NaN,-4,10\n`, 2, "actual_pnl", /not a number/));
  it("1e308", () => expectPreviewError(`${HEADER}\nPF,2026-11-02,1e308,-4,10\n`, 2, "actual_pnl", /exponent/));
  it("1,234.5 (quoted, with a thousands separator)", () =>
    expectPreviewError(`${HEADER}\nPF,2026-11-02,"1,234.5",-4,10\n`, 2, "actual_pnl", /thousands separator/));
  it("a negative VaR", () => expectPreviewError(`${HEADER}\nPF,2026-11-02,-5,-4,-10\n`, 2, "var_99", /positive/));
  it("a weekend date", () =>
    expectPreviewError(`${HEADER}\nPF,2026-11-07,-5,-4,10\n`, 2, "date", /Saturday, not a business day/));
  it("a holiday of the entity's calendar", () =>
    expectPreviewError(`${HEADER}\nPF,2026-12-25,-5,-4,10\n`, 2, "date", /holiday .*Christmas Day/));
  it("an impossible date", () =>
    expectPreviewError(`${HEADER}\nPF,2026-02-30,-5,-4,10\n`, 2, "date", /real calendar date/));
  it("the same date twice in the file", () =>
    expectPreviewError(
      `${HEADER}\nPF,2026-11-02,-5,-4,10\nPF,2026-11-02,-6,-4,10\n`,
      3,
      "date",
      /already appears on line 2/,
    ));
  it("an unknown portfolio", () =>
    expectPreviewError(`${HEADER}\nNOPE-${Date.now()},2026-11-02,-5,-4,10\n`, 2, "portfolio", /Unknown portfolio/));
  it("a row with too few fields", () =>
    expectPreviewError(`${HEADER}\nPF,2026-11-02,-5\n`, 2, "—", /Expected 5 fields/));

  async function expectFileRejected(content: string | Buffer, status: number, message: RegExp, fileName = "daily.csv") {
    const { portfolio, cookie } = await ingestFixture();
    const before = await UploadModel.count();
    const res = await uploadCsv(
      app,
      cookie,
      typeof content === "string" ? content.replaceAll("PF", portfolio.code) : content,
      fileName,
    );
    expect(res.status).toBe(status);
    expect(res.body.error.message).toMatch(message);
    expect(await UploadModel.count()).toBe(before);
    expect(await observationCount(portfolio.id)).toBe(0);
    return res;
  }

  it("an unknown column", async () => {
    const res = await expectFileRejected(`${HEADER},colour\nPF,2026-11-02,-5,-4,10,red\n`, 422, /header row/);
    expect(res.body.error.details.errors).toEqual([
      expect.objectContaining({ line: 1, column: "colour", message: expect.stringMatching(/Unknown column/) }),
    ]);
  });
  it("a missing column", async () => {
    const res = await expectFileRejected(`portfolio,date,actual_pnl,var_99\nPF,2026-11-02,-5,10\n`, 422, /header row/);
    expect(res.body.error.details.errors).toEqual([
      expect.objectContaining({ column: "hypothetical_pnl", message: expect.stringMatching(/missing/) }),
    ]);
  });
  it("a __proto__ header", async () => {
    const res = await expectFileRejected(`${HEADER},__proto__\nPF,2026-11-02,-5,-4,10,{}\n`, 422, /header row/);
    expect(res.body.error.details.errors[0].column).toBe("__proto__");
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });
  it("a binary file renamed .csv", () =>
    expectFileRejected(
      Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0x00, 0x00, 0x00, 0x0d]),
      415,
      /not a text CSV/,
    ));
  it("an empty file", () => expectFileRejected(Buffer.alloc(0), 422, /empty/));
  it("a header with no rows", () => expectFileRejected(`${HEADER}\n`, 422, /no data rows/));
  it("a file that is not .csv", () =>
    expectFileRejected(`${HEADER}\nPF,2026-11-02,-5,-4,10\n`, 415, /Only \.csv/, "daily.xlsx"));
  it("a path in the file name", () =>
    expectFileRejected(`${HEADER}\nPF,2026-11-02,-5,-4,10\n`, 400, /plain name/, "../../etc/daily.csv"));
  it("a file over the limit", () => expectFileRejected(Buffer.alloc(16 * 1024 * 1024 + 10, 0x41), 413, /16 MB/));

  it("two files at once, or an unexpected field", async () => {
    const { cookie } = await ingestFixture();
    const two = await request(app)
      .post("/api/uploads")
      .set("Cookie", cookie)
      .attach("file", Buffer.from("a"), "a.csv")
      .attach("file", Buffer.from("b"), "b.csv");
    expect(two.status).toBe(400);
    const field = await request(app)
      .post("/api/uploads")
      .set("Cookie", cookie)
      .field("note", "hi")
      .attach("file", Buffer.from("a"), "a.csv");
    expect(field.status).toBe(400);
    const wrongName = await request(app)
      .post("/api/uploads")
      .set("Cookie", cookie)
      .attach("upload", Buffer.from("a"), "a.csv");
    expect(wrongName.status).toBe(400);
  });
});

describe("a row with several problems", () => {
  it("when a row has an unknown portfolio and a negative VaR, then both problems are listed against their cells", async () => {
    const { cookie } = await ingestFixture();
    const res = await uploadCsv(app, cookie, `${HEADER}\nNOPE-${Date.now()},2026-11-02,-1,-1,-5\n`);
    expect(res.status).toBe(201);
    expect(res.body.invalid).toBe(1);
    expect(res.body.errors.map((e: { column: string }) => e.column).sort()).toEqual(["portfolio", "var_99"]);
  });
});
