/** The audit log names its targets and people in words (issue 13 item 7); the signed text stays as recorded. */
import request from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { createTestUser, sessionCookieFor } from "./helpers";
import { prepare, signOffBook, snapshotApp as app, uploadAndCommit, HEADER } from "./snapshot-helpers";
import { editUser } from "./support/user-edits";

afterAll(() => sequelize.close());

describe("the audit log in words", () => {
  it("when a snapshot is prepared and a file committed, then the log names the entity and quarter, the file, and the person", async () => {
    const book = await signOffBook();
    const draft = await prepare(book);
    expect(draft.status).toBe(201);
    const i = book.dates.indexOf("2026-09-15");
    await uploadAndCommit(book.cookie, [HEADER, book.row(book.dates[i], i, 150)].join("\n"));
    const admin = await sessionCookieFor((await createTestUser("admin", { name: "Ada Auditor" })).id);

    const prepared = await request(app).get("/api/audit-events?action=snapshot.prepare&limit=200").set("Cookie", admin);
    const event = prepared.body.items.find((e: { target: string }) => e.target === `snapshot #${draft.body.id}`);
    expect(event).toMatchObject({
      target: `snapshot #${draft.body.id}`, // as signed
      targetWords: `${book.entity.code} Q3 2026 snapshot`,
      actorName: "Test analyst",
    });

    const commits = await request(app).get("/api/audit-events?action=upload.commit&limit=200").set("Cookie", admin);
    const commit = commits.body.items.find((e: { actorEmail: string }) => e.actorEmail === book.analyst.email);
    expect(commit.targetWords).toMatch(/^upload #\d+ \(daily-[a-z0-9]+\.csv\)$/);
  });

  it("when the target is a person's e-mail, then the words are their name", async () => {
    const admin = await createTestUser("admin", { name: "Ines Example" });
    const cookie = await sessionCookieFor(admin.id);
    const person = await createTestUser("analyst", { name: "Nadia Fern" });
    await editUser(cookie, person.id, { name: "Nadia Fern-Ash", version: 1 });
    const res = await request(app).get("/api/audit-events?action=user.update&limit=200").set("Cookie", cookie);
    const event = res.body.items.find((e: { target: string }) => e.target === person.email);
    expect(event).toMatchObject({ targetWords: "Nadia Fern-Ash", actorName: "Ines Example" });
  });

  it("when any signed-in person reads the people directory, then each e-mail comes with its name, and nothing else", async () => {
    const person = await createTestUser("analyst", { name: "Olu Directory" });
    const treasury = await sessionCookieFor((await createTestUser("treasury")).id);
    const res = await request(app).get("/api/people").set("Cookie", treasury);
    expect(res.status).toBe(200);
    expect(res.body).toContainEqual({ email: person.email, name: "Olu Directory" });
    expect(Object.keys(res.body[0]).sort()).toEqual(["email", "name"]);
  });
});
