/**
 * The upload preview of restated days (issue 13 item 5): old → new per changed cell, a warning for a day in a
 * signed-off quarter, an explicit confirmation before committing one, and previews that expire.
 */
import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { AuditEventModel } from "../../server/models/audit-event";
import { ObservationModel } from "../../server/models/observation";
import { UploadModel } from "../../server/models/upload";
import { config } from "../../server/config";
import { HEADER, preparedAndSubmitted, signOffBook, snapshotApp as app } from "./snapshot-helpers";
import { uploadCsv } from "./ingest-helpers";

afterAll(() => sequelize.close());

describe("restated days in the preview", () => {
  it("when a file restates days, then the preview lists each changed cell as stored → as in the file; unchanged cells are left out", async () => {
    const book = await signOffBook();
    const i = book.dates.indexOf("2026-09-15");
    const j = book.dates.indexOf("2026-09-16");
    // 2026-09-15: the loss becomes 150 (actual −50 → −150, hypothetical −40 → −140); VaR and SVaR stay.
    // 2026-09-16: only the SVaR changes, 250 → 260. 2026-09-17 is sent as stored: unchanged.
    const k = book.dates.indexOf("2026-09-17");
    const sameDay = book.row(book.dates[k], k);
    const csv = [HEADER, book.row(book.dates[i], i, 150), book.row(book.dates[j], j).replace(/,250$/, ",260"), sameDay];
    const preview = await uploadCsv(app, book.cookie, `${csv.join("\n")}\n`);
    expect(preview.status).toBe(201);
    expect(preview.body).toMatchObject({
      restatements: 2,
      unchanged: 1,
      signedOffRestatements: 0,
      signedOffQuarters: [],
    });
    expect(preview.body.restatedDays).toEqual([
      {
        portfolio: book.portfolio.code,
        date: "2026-09-15",
        changes: [
          { column: "actual_pnl", from: -50, to: -150 },
          { column: "hypothetical_pnl", from: -40, to: -140 },
        ],
        signedOff: null,
      },
      {
        portfolio: book.portfolio.code,
        date: "2026-09-16",
        changes: [{ column: "svar_99", from: 250, to: 260 }],
        signedOff: null,
      },
    ]);
    // The same detail is there when the upload is opened again later.
    const again = await request(app).get(`/api/uploads/${preview.body.id}`).set("Cookie", book.cookie);
    expect(again.body.restatedDays).toEqual(preview.body.restatedDays);
  });

  it("when a day lies in an approved quarter, then the preview warns, the commit without confirmation is 409 with nothing written, and with it the day is restated", async () => {
    const book = await signOffBook();
    const submitted = await preparedAndSubmitted(book);
    const approve = await request(app).post(`/api/snapshots/${submitted.id}/approve`).set("Cookie", book.croCookie);
    expect(approve.status).toBe(200);
    const i = book.dates.indexOf("2026-09-15");
    const preview = await uploadCsv(app, book.cookie, `${[HEADER, book.row(book.dates[i], i, 150)].join("\n")}\n`);
    const quarter = { entity: book.entity.code, quarterEnd: "2026-09-30", status: "approved" };
    expect(preview.body.signedOffRestatements).toBe(1);
    expect(preview.body.signedOffQuarters).toEqual([{ ...quarter, days: 1 }]);
    expect(preview.body.restatedDays[0].signedOff).toEqual(quarter);

    const before = await ObservationModel.count({ where: { portfolioId: book.portfolio.id } });
    const refused = await request(app).post(`/api/uploads/${preview.body.id}/commit`).set("Cookie", book.cookie);
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe("signed_off_restatement");
    expect(refused.body.error.message).toBe(
      `This file restates 1 day in signed-off quarters: ${book.entity.code} Q3 2026 (approved, 1 day). Their snapshots keep the figures as signed off and are marked restated. Confirm that you mean to restate them and commit again; nothing was written.`,
    );
    expect(await ObservationModel.count({ where: { portfolioId: book.portfolio.id } })).toBe(before);
    expect((await UploadModel.findByPk(preview.body.id))!.status).toBe("preview");

    const confirmed = await request(app)
      .post(`/api/uploads/${preview.body.id}/commit`)
      .set("Cookie", book.cookie)
      .send({ confirmSignedOff: true });
    expect(confirmed.status).toBe(200);
    expect(confirmed.body).toMatchObject({ inserted: 1, restated: 1 });
    const audit = await AuditEventModel.findOne({
      where: { action: "upload.commit", target: `upload #${preview.body.id}` },
    });
    expect(JSON.parse(audit!.afterJson!)).toMatchObject({ signedOffRestated: 1 });
  });

  it("when a preview has waited longer than the set time, then it says it expired and its commit is 409 with nothing written", async () => {
    const book = await signOffBook();
    const i = book.dates.indexOf("2026-09-15");
    const preview = await uploadCsv(app, book.cookie, `${[HEADER, book.row(book.dates[i], i, 150)].join("\n")}\n`);
    const made = new Date(preview.body.uploadedAt).getTime();
    expect(new Date(preview.body.expiresAt).getTime() - made).toBe(config.uploads.previewTtlHours * 3_600_000);
    expect(preview.body.expired).toBe(false);

    // The preview was made longer ago than the time a preview waits.
    const longAgo = new Date(Date.now() - (config.uploads.previewTtlHours * 3_600_000 + 60_000));
    await sequelize.query("UPDATE uploads SET created_at = :at WHERE id = :id", {
      replacements: { at: longAgo, id: preview.body.id },
    });
    const read = await request(app).get(`/api/uploads/${preview.body.id}`).set("Cookie", book.cookie);
    expect(read.body).toMatchObject({ status: "preview", expired: true });

    const before = await ObservationModel.count({ where: { portfolioId: book.portfolio.id } });
    const commit = await request(app).post(`/api/uploads/${preview.body.id}/commit`).set("Cookie", book.cookie);
    expect(commit.status).toBe(409);
    expect(commit.body.error.code).toBe("preview_expired");
    expect(commit.body.error.message).toMatch(/expired at .* UTC \(previews wait \d+ hours\)\. Upload the file again/);
    expect(await ObservationModel.count({ where: { portfolioId: book.portfolio.id } })).toBe(before);
  });
});
