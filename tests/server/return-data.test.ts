import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { SnapshotModel } from "../../server/models/snapshot";
import { AuditEventModel } from "../../server/models/audit-event";
import { snapshotReturnSchema, type SnapshotReturn } from "../../shared/schemas/snapshot";
import { approve, type Book, prepare, Q3, signOffBook, snapshotApp as app, submit, verify } from "./snapshot-helpers";

afterAll(() => sequelize.close());

/*
 * The fixed dataset (snapshot-helpers signOffBook): 400 business days to 30 September 2026, a
 * one-day VaR of 100 on even and 101 on odd positions, a one-day stressed VaR of 250, no 10-day
 * figures (so the capital measures are the one-day ones × √10, CRR Art. 365(1)), and five
 * exceptions inside the last 250 days. Each expected value below is computed here from those rows,
 * not by the engine.
 */
const SQRT10 = Math.sqrt(10);
const var99At = (book: Book, i: number) => 100 + (i % 2);
const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
const round2 = (v: number) => Math.round(v * 100) / 100;

function field(ret: SnapshotReturn, key: string) {
  const f = ret.fields.find((x) => x.key === key);
  if (!f) throw new Error(`no field ${key} in ${ret.fields.map((x) => x.key).join(", ")}`);
  return f;
}

async function draftOf(book: Book) {
  const draft = await prepare(book);
  expect(draft.status, JSON.stringify(draft.body)).toBe(201);
  return draft.body as { id: number; version: number };
}

async function returnOf(id: number, cookie: string): Promise<SnapshotReturn> {
  const res = await request(app).get(`/api/snapshots/${id}/return`).set("Cookie", cookie);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return snapshotReturnSchema.parse(res.body);
}

describe("the return data of an EU snapshot (C 24.00 MKR IM, EU MR3)", () => {
  it("when read, then each C 24.00 column of row 010 holds the figure computed independently from the daily rows", async () => {
    const book = await signOffBook();
    const draft = await draftOf(book);
    const ret = await returnOf(draft.id, book.cookie);
    expect(ret.regime).toBe("eu");
    const n = book.dates.length;
    const last60 = Array.from({ length: 60 }, (_, k) => var99At(book, n - 60 + k));
    const varPrev = var99At(book, n - 1) * SQRT10;
    const varAvg = mean(last60) * SQRT10;
    const svar = 250 * SQRT10;
    // CRR Art. 366 Table 1 (docs/rules.md#eu-crr, from memory): 5 overshootings → addend 0.40 on 3.
    const mc = 3.4;
    // C 24.00 c030: m_c × average of the previous 60 working days (CRR Art. 364(1)(a)(ii), 365(1)).
    expect(field(ret, "varAverageTimesMc")).toMatchObject({
      templateRow: "C 24.00 r010 c030",
      value: round2(mc * varAvg),
      unit: "amount",
      currency: "EUR",
    });
    // C 24.00 c040: previous day's VaR (CRR Art. 364(1)(a)(i)).
    expect(field(ret, "varPrevious")).toMatchObject({ templateRow: "C 24.00 r010 c040", value: round2(varPrev) });
    // C 24.00 c050 / c060: m_s × stressed VaR average; latest stressed VaR (CRR Art. 364(1)(b)).
    expect(field(ret, "svarAverageTimesMs")).toMatchObject({
      templateRow: "C 24.00 r010 c050",
      value: round2(mc * svar),
    });
    expect(field(ret, "svarLatest")).toMatchObject({ templateRow: "C 24.00 r010 c060", value: round2(svar) });
    // C 24.00 c140–c160: overshootings in the last 250 working days, m_c, m_s.
    expect(field(ret, "overshootings")).toMatchObject({ templateRow: "C 24.00 r010 c140", value: 5, unit: "count" });
    expect(field(ret, "multiplierVar")).toMatchObject({ templateRow: "C 24.00 r010 c150", value: mc, unit: "factor" });
    expect(field(ret, "multiplierSvar")).toMatchObject({ templateRow: "C 24.00 r010 c160", value: mc });
    // C 24.00 c070–c110 (IRC, CTP) are not held by the product: null until the analyst enters them,
    // and so are c120 own funds and c130 total risk exposure amount, which need them.
    for (const key of ["ircAverage", "ircLatest", "ctpFloor", "ctpAverage", "ctpLatest"]) {
      expect(field(ret, key)).toMatchObject({ value: null, source: "Analyst input: not entered yet" });
    }
    expect(field(ret, "ownFundsRequirement")).toMatchObject({ templateRow: "C 24.00 r010 c120", value: null });
    expect(field(ret, "ownFundsRequirement").source).toMatch(/needs IRC, CTP/);
    expect(field(ret, "totalRiskExposureAmount")).toMatchObject({ templateRow: "C 24.00 r010 c130", value: null });

    // EU MR3 rows 1–8: VaR and stressed VaR (10-day, 99%) over the quarter, 1 July to 30 September 2026.
    const quarter = book.dates.map((d, i) => ({ d, i })).filter(({ d }) => d >= "2026-07-01" && d <= Q3);
    const qVar = quarter.map(({ i }) => var99At(book, i) * SQRT10);
    expect(field(ret, "disclosureVarMax")).toMatchObject({
      templateRow: "EU MR3 row 1",
      value: round2(Math.max(...qVar)),
    });
    expect(field(ret, "disclosureVarMean")).toMatchObject({ templateRow: "EU MR3 row 2", value: round2(mean(qVar)) });
    expect(field(ret, "disclosureVarMin")).toMatchObject({
      templateRow: "EU MR3 row 3",
      value: round2(Math.min(...qVar)),
    });
    expect(field(ret, "disclosureVarEnd")).toMatchObject({ templateRow: "EU MR3 row 4", value: round2(qVar.at(-1)!) });
    expect(field(ret, "disclosureSvarMax")).toMatchObject({ templateRow: "EU MR3 row 5", value: round2(svar) });
    expect(field(ret, "disclosureSvarEnd")).toMatchObject({ templateRow: "EU MR3 row 8", value: round2(svar) });
    expect(field(ret, "disclosureVarMax").source).toContain(`the ${quarter.length} business days from 2026-07-01`);

    // The back-testing disclosure: the 250 days of the window and each exception with its cause.
    expect(ret.backtesting!.days).toHaveLength(250);
    expect(ret.backtesting!.exceptions.map((e) => e.date)).toEqual(book.exceptionDays);
    expect(ret.backtesting!.exceptions[0]).toMatchObject({ actual: -150, hypothetical: -140, cause: null });
  });

  it("when the analyst enters IRC and CTP, then own funds and the total risk exposure amount follow (CRR Art. 364, 92(4)), and approval freezes them", async () => {
    const book = await signOffBook();
    const draft = await draftOf(book);
    const values = { ircAverage: 1000, ircLatest: 1200, ctpFloor: 50, ctpAverage: 40, ctpLatest: 30 };
    const put = await request(app)
      .put(`/api/snapshots/${draft.id}/return-inputs`)
      .set("Cookie", book.cookie)
      .send({ values, version: draft.version });
    expect(put.status, JSON.stringify(put.body)).toBe(200);
    expect(put.body.figures.analystInputs).toEqual(values);
    expect(
      await AuditEventModel.count({ where: { action: "snapshot.return-inputs", target: `snapshot #${draft.id}` } }),
    ).toBe(1);

    const ret = await returnOf(draft.id, book.cookie);
    const n = book.dates.length;
    const varAvg = mean(Array.from({ length: 60 }, (_, k) => var99At(book, n - 60 + k))) * SQRT10;
    const varTerm = Math.max(var99At(book, n - 1) * SQRT10, 3.4 * varAvg);
    const svarTerm = Math.max(250 * SQRT10, 3.4 * 250 * SQRT10);
    // CRR Art. 364(2)(b): IRC the higher of last and 12-week average; 364(3): CTP the highest of last, average, floor.
    const total = varTerm + svarTerm + 1200 + 50;
    expect(field(ret, "ircLatest")).toMatchObject({
      templateRow: "C 24.00 r010 c080",
      value: 1200,
      source: "Analyst input on the snapshot",
    });
    expect(field(ret, "ownFundsRequirement").value).toBeCloseTo(round2(total), 2);
    // C 24.00 c130: 12.5 × own funds requirements (CRR Art. 92(4)).
    expect(field(ret, "totalRiskExposureAmount").value).toBeCloseTo(round2(12.5 * round2(total)), 2);

    // Preparing again keeps the values; submitting and approving seals them; after that they are refused.
    const again = await prepare(book);
    expect(again.body.figures.analystInputs).toEqual(values);
    const submitted = await submit(draft.id, book.cookie, { version: again.body.version });
    expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);
    const approved = await approve(draft.id, book.croCookie, { version: submitted.body.version });
    expect(approved.status, JSON.stringify(approved.body)).toBe(200);
    const late = await request(app)
      .put(`/api/snapshots/${draft.id}/return-inputs`)
      .set("Cookie", book.cookie)
      .send({ values: { ircLatest: 1 }, version: approved.body.version });
    expect(late.status).toBe(409);
    expect(late.body.error.message).toMatch(/frozen/);
    expect(JSON.parse((await SnapshotModel.findByPk(draft.id))!.figuresJson).analystInputs).toEqual(values);
    const verified = await verify(draft.id, book.cookie);
    expect(verified.body.valid).toBe(true);
    expect(await returnOf(draft.id, book.croCookie)).toEqual(ret);
  });

  it("when a value is negative, not a number, or not one the rule set asks for, then it is refused in words and nothing is written", async () => {
    const book = await signOffBook();
    const draft = await draftOf(book);
    for (const [values, field] of [
      [{ ircLatest: -5 }, "values.ircLatest"],
      [{ ircLatest: "lots" }, "values.ircLatest"],
      [{ specificRiskDebt: 10 }, "values.specificRiskDebt"],
    ] as const) {
      const res = await request(app)
        .put(`/api/snapshots/${draft.id}/return-inputs`)
        .set("Cookie", book.cookie)
        .send({ values, version: draft.version });
      expect(res.status, JSON.stringify(res.body)).toBe(422);
      expect(Object.keys(res.body.error.details.fields)).toContain(field);
    }
    const row = (await SnapshotModel.findByPk(draft.id))!;
    expect(row.version).toBe(draft.version);
    expect(JSON.parse(row.figuresJson).analystInputs).toBeUndefined();
  });
});

describe("the return data of a US snapshot (FFIEC 102)", () => {
  it("when read, then items 1 to 7 hold the VaR-based and stressed VaR-based figures computed independently, and the specific risk add-ons wait for the analyst", async () => {
    const book = await signOffBook();
    await book.entity.update({ regime: "us" });
    const draft = await draftOf(book);
    const ret = await returnOf(draft.id, book.cookie);
    expect(ret.regime).toBe("us");
    const n = book.dates.length;
    const varPrev = var99At(book, n - 1) * SQRT10;
    const varAvg = mean(Array.from({ length: 60 }, (_, k) => var99At(book, n - 60 + k))) * SQRT10;
    // 12 CFR 217.204(b) Table 1 (docs/rules.md#us-rule, from memory): 5 exceptions → 3.40.
    const factor = 3.4;
    // Every weekly stressed measure is 250 × √10, so the most recent one and the 12-week average agree.
    const svar = 250 * SQRT10;
    expect(field(ret, "varPrevious")).toMatchObject({ templateRow: "FFIEC 102 item 1", value: round2(varPrev) });
    expect(field(ret, "varAverage")).toMatchObject({ templateRow: "FFIEC 102 item 2", value: round2(varAvg) });
    expect(field(ret, "multiplier")).toMatchObject({ templateRow: "FFIEC 102 item 3", value: factor });
    expect(field(ret, "varRequirement")).toMatchObject({
      templateRow: "FFIEC 102 item 4",
      value: round2(Math.max(varPrev, factor * varAvg)),
    });
    expect(field(ret, "svarLatest")).toMatchObject({ templateRow: "FFIEC 102 item 5", value: round2(svar) });
    expect(field(ret, "svarAverageTimesFactor")).toMatchObject({
      templateRow: "FFIEC 102 item 6",
      value: round2(factor * svar),
    });
    expect(field(ret, "svarRequirement")).toMatchObject({
      templateRow: "FFIEC 102 item 7",
      value: round2(factor * svar),
    });
    expect(field(ret, "specificRiskDebt")).toMatchObject({ templateRow: "FFIEC 102 item 8", value: null });
    expect(field(ret, "specificRiskEquity")).toMatchObject({ templateRow: "FFIEC 102 item 9", value: null });
    expect(field(ret, "exceptions")).toMatchObject({ value: 5, unit: "count" });
    // EU MR3 rows are an EU template: a US entity's disclosure figures carry no row.
    expect(field(ret, "disclosureVarMax").templateRow).toBeUndefined();
  });
});
