import { spawn, type ChildProcess } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync, statSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { createInterface } from "node:readline";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { config } from "../../server/config";
import { sendMail } from "../../server/mail/mailer";
import { FilingModel } from "../../server/models/filing";
import { readOutboxMessage } from "../../server/modules/outbox/outbox.service";
import { NotFoundError } from "../../server/errors";
import { filingSchema } from "../../shared/schemas/filing";
import { outboxListSchema, outboxMessageDetailSchema, type OutboxMessage } from "../../shared/schemas/outbox";
import { createTestUser, sessionCookieFor, unique } from "./helpers";
import { approvedQuarter, signOffBook, snapshotApp as app } from "./snapshot-helpers";
import { asBytes } from "./pdf-helpers";

afterAll(() => sequelize.close());

/** The run's mail sink (scripts/test.ts): the folder the outbox reads and the mailer's server writes. */
const sinkDir = process.env.MAIL_SINK_DIR!;
const sha256 = (bytes: Buffer) => createHash("sha256").update(bytes).digest("hex");
/** A name like the sink's own: the moment, then a tag. */
const sinkLikeId = (tag: string) => `${new Date().toISOString().replace(/[:.]/g, "-")}-${tag}-${unique()}`;

let adminCookie: string;
beforeAll(async () => {
  adminCookie = await sessionCookieFor((await createTestUser("admin")).id);
});

async function outboxList() {
  const res = await request(app).get("/api/admin/outbox").set("Cookie", adminCookie);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return outboxListSchema.parse(res.body);
}

function readable(m: OutboxMessage | undefined) {
  if (!m?.readable) throw new Error(`expected a readable message, got ${JSON.stringify(m)}`);
  return m;
}

/** A message through the product's own mailer to the run's sink, with a PDF and a CSV attached. */
async function sendTestMail() {
  const tag = unique();
  const pdf = Buffer.concat([
    Buffer.from("%PDF-1.7\n"),
    Buffer.from(tag.repeat(500)),
    Buffer.from([0, 255, 10, 13, 0x80]),
  ]);
  const csv = Buffer.from("date,loss\n2026-09-30,150\n", "utf8");
  const to = `outbox-${tag}@bank-supervisor.test`;
  const subject = `Larkspur Markets SA: outbox check ${tag}`;
  const messageId = await sendMail({
    to: [to],
    subject,
    text: `Dear colleagues,\n\nThe pack for ${tag} is attached.\nZürich desk: 5 exceptions.`,
    attachments: [
      { filename: "larkspur-q3-pack.pdf", content: pdf, contentType: "application/pdf" },
      { filename: "Exceptions – Q3.csv", content: csv, contentType: "text/csv" },
    ],
  });
  return { tag, to, subject, messageId, pdf, csv };
}

describe("the development mail outbox", () => {
  it("when Quartermark sends a message, then the outbox lists it newest first with its envelope and each attachment's SHA-256", async () => {
    const first = await sendTestMail();
    const second = await sendTestMail();

    const list = await outboxList();
    expect(list.folder).toBe(path.resolve(sinkDir));
    expect(list.total).toBeGreaterThanOrEqual(list.messages.length);
    const at = (to: string) => list.messages.findIndex((m) => m.readable && m.to.includes(to));
    expect(at(second.to)).toBeGreaterThanOrEqual(0);
    expect(at(second.to)).toBeLessThan(at(first.to)); // newest first

    const message = readable(list.messages[at(first.to)]);
    const file = path.join(sinkDir, `${message.id}.eml`);
    expect(message).toEqual({
      id: expect.stringMatching(/^[A-Za-z0-9_-]+$/),
      readable: true,
      from: `Quartermark <${config.mailFrom}>`,
      to: [first.to],
      subject: first.subject,
      date: expect.stringMatching(/^\d{4}-\d{2}-\d{2}T/),
      messageId: first.messageId,
      size: statSync(file).size,
      storedAt: statSync(file).mtime.toISOString(),
      attachments: [
        {
          index: 0,
          filename: "larkspur-q3-pack.pdf",
          contentType: "application/pdf",
          size: first.pdf.length,
          sha256: sha256(first.pdf),
        },
        {
          index: 1,
          filename: "Exceptions – Q3.csv",
          contentType: "text/csv",
          size: first.csv.length,
          sha256: sha256(first.csv),
        },
      ],
    });
    // The id is the sink's own file: the raw message on disk is the one described.
    expect(readFileSync(file, "utf8")).toContain(first.messageId.replace(/[<>]/g, ""));
  });

  it("when a message is opened, then it carries its plain-text body, and each attachment downloads byte for byte with its type", async () => {
    const sent = await sendTestMail();
    const id = readable((await outboxList()).messages.find((m) => m.readable && m.to.includes(sent.to))).id;

    const res = await request(app).get(`/api/admin/outbox/${id}`).set("Cookie", adminCookie);
    expect(res.status).toBe(200);
    const detail = outboxMessageDetailSchema.parse(res.body);
    if (!detail.readable) throw new Error("expected a readable message");
    expect(detail.text).toContain(`The pack for ${sent.tag} is attached.`);
    expect(detail.text).toContain("Zürich desk: 5 exceptions.");
    expect(detail.attachments.map((a) => a.sha256)).toEqual([sha256(sent.pdf), sha256(sent.csv)]);

    const pdf = await asBytes(request(app).get(`/api/admin/outbox/${id}/attachments/0`).set("Cookie", adminCookie));
    expect(pdf.status).toBe(200);
    expect(pdf.headers["content-type"]).toBe("application/pdf");
    expect(pdf.headers["content-disposition"]).toBe('attachment; filename="larkspur-q3-pack.pdf"');
    expect(pdf.headers["x-attachment-sha256"]).toBe(sha256(sent.pdf));
    expect(Buffer.compare(pdf.body as Buffer, sent.pdf)).toBe(0);

    const csv = await asBytes(request(app).get(`/api/admin/outbox/${id}/attachments/1`).set("Cookie", adminCookie));
    expect(csv.headers["content-type"]).toMatch(/^text\/csv/);
    // A name outside ASCII is sent as RFC 6266's filename*, with a plain fallback.
    expect(csv.headers["content-disposition"]).toBe(
      `attachment; filename="Exceptions ? Q3.csv"; filename*=UTF-8''Exceptions%20%E2%80%93%20Q3.csv`,
    );
    expect(Buffer.compare(csv.body as Buffer, sent.csv)).toBe(0);

    const missing = await request(app).get(`/api/admin/outbox/${id}/attachments/2`).set("Cookie", adminCookie);
    expect(missing.status).toBe(404);
    expect(missing.body.error.message).toMatch(/has no attachment number 2 \(it has 2\)/);
  });

  it("when the CRO files a pack, then its e-mail is in the outbox and the attachment's SHA-256 is the one Filings shows", async () => {
    const book = await signOffBook();
    const supervisor = `outbox-filing-${unique()}@bank-supervisor.test`;
    await book.entity.update({ supervisorEmails: [supervisor], supervisorName: "Ms Rowan Vale" });
    const submitted = await approvedQuarter(book);
    const filed = await request(app)
      .post(`/api/snapshots/${submitted.id}/filings`)
      .set("Cookie", book.croCookie)
      .send({});
    expect(filed.status, JSON.stringify(filed.body)).toBe(201);
    const filing = filingSchema.parse(
      (await request(app).get("/api/filings").set("Cookie", book.croCookie)).body.find(
        (f: { id: number }) => f.id === filed.body.id,
      ),
    );

    const message = readable((await outboxList()).messages.find((m) => m.readable && m.messageId === filing.messageId));
    expect(message.to).toEqual([supervisor]);
    expect(message.subject).toBe(`${book.entity.name}: backtesting pack for Q3 2026`);
    expect(message.attachments).toEqual([
      {
        index: 0,
        filename: filing.fileName,
        contentType: "application/pdf",
        size: expect.any(Number),
        sha256: filing.sha256,
      },
    ]);

    const pack = await asBytes(
      request(app).get(`/api/admin/outbox/${message.id}/attachments/0`).set("Cookie", adminCookie),
    );
    expect(sha256(pack.body as Buffer)).toBe(filing.sha256);
    const stored = await FilingModel.scope("withPack").findByPk(filing.id);
    expect(Buffer.compare(pack.body as Buffer, stored!.packPdf)).toBe(0); // the very bytes the database keeps
  });

  it("when the sink folder holds a broken file, then it is listed as unreadable and the rest of the list still reads", async () => {
    const sent = await sendTestMail();
    const garbage = sinkLikeId("garbage");
    const empty = sinkLikeId("empty");
    const planted = [
      [`${garbage}.eml`, Buffer.from([0x00, 0xff, 0xfe, 0x1b, 0x5b, 0x32, 0x4a, 0x0a, 0x0a, 0x9c])],
      [`${empty}.eml`, Buffer.alloc(0)],
      ["README.txt", Buffer.from("not a message")],
      ["not an id.eml", Buffer.from("From: a@b.test\r\n\r\nhi")],
    ] as const;
    for (const [name, bytes] of planted) writeFileSync(path.join(sinkDir, name), bytes);
    try {
      const list = await outboxList();
      expect(list.messages.find((m) => m.id === garbage)).toEqual({
        id: garbage,
        readable: false,
        size: 10,
        storedAt: expect.any(String),
        problem: "The file has no From or To header: it is not an e-mail message.",
      });
      expect(list.messages.find((m) => m.id === empty)).toMatchObject({
        readable: false,
        size: 0,
        problem: "The file is empty.",
      });
      expect(list.messages.some((m) => m.readable && m.to.includes(sent.to))).toBe(true);
      expect(list.messages.map((m) => m.id)).not.toContain("README");
      expect(list.messages.map((m) => m.id)).not.toContain("not an id");

      const detail = await request(app).get(`/api/admin/outbox/${garbage}`).set("Cookie", adminCookie);
      expect(detail.status).toBe(200);
      expect(detail.body).toMatchObject({
        id: garbage,
        readable: false,
        problem: expect.stringMatching(/not an e-mail message/),
      });
      const attachment = await request(app)
        .get(`/api/admin/outbox/${garbage}/attachments/0`)
        .set("Cookie", adminCookie);
      expect(attachment.status).toBe(404);
      expect(attachment.body.error.message).toMatch(/cannot be read/);
    } finally {
      for (const [name] of planted) rmSync(path.join(sinkDir, name), { force: true });
    }
  });
});

describe("what the outbox refuses", () => {
  // A message outside the sink that a path trick would reach if the outbox followed it.
  const outside = mkdtempSync(path.join(tmpdir(), "qm-outside-"));
  const secretSubject = `Outside the outbox ${unique()}`;
  writeFileSync(
    path.join(outside, "secret.eml"),
    `From: someone@elsewhere.test\r\nTo: admin@larkspur.test\r\nSubject: ${secretSubject}\r\n\r\nnot for the outbox\r\n`,
  );
  afterAll(() => rmSync(outside, { recursive: true, force: true }));

  it.each(["analyst", "cro", "treasury", "regulator"] as const)(
    "when the %s asks for the outbox, a message or an attachment, then it is refused (403) and nothing is shown",
    async (role) => {
      const sent = await sendTestMail();
      const id = readable((await outboxList()).messages.find((m) => m.readable && m.to.includes(sent.to))).id;
      const cookie = await sessionCookieFor((await createTestUser(role)).id);
      for (const url of ["/api/admin/outbox", `/api/admin/outbox/${id}`, `/api/admin/outbox/${id}/attachments/0`]) {
        const res = await request(app).get(url).set("Cookie", cookie);
        expect(res.status, url).toBe(403);
        expect(res.body.error.code).toBe("forbidden");
        expect(JSON.stringify(res.body)).not.toContain(sent.tag);
      }
      expect((await request(app).get("/api/admin/outbox")).status).toBe(401);
    },
  );

  it.each([
    ["a parent folder (..)", "/api/admin/outbox/.."],
    ["an encoded slash", "/api/admin/outbox/..%2F..%2F..%2Fetc%2Fpasswd"],
    [
      "an encoded slash to the planted file",
      `/api/admin/outbox/..%2F${encodeURIComponent(path.relative(sinkDir, path.join(outside, "secret")))}`,
    ],
    ["an encoded backslash", "/api/admin/outbox/..%5C..%5Csecret"],
    ["an absolute path", `/api/admin/outbox/${encodeURIComponent(path.join(outside, "secret"))}`],
    ["a file name with its dot", "/api/admin/outbox/secret.eml"],
    ["an attachment under a parent folder", "/api/admin/outbox/..%2Fsecret/attachments/0"],
  ])(
    "when the id is %s, then it is refused as not an id (422) and nothing outside the sink is read",
    async (_what, url) => {
      const res = await request(app).get(url).set("Cookie", adminCookie);
      expect(res.status).toBe(422);
      expect(res.body.error.code).toBe("validation_failed");
      expect(JSON.stringify(res.body)).not.toContain(secretSubject);
    },
  );

  it("when a path climbs out of the outbox's address, then no outbox route answers it", async () => {
    const res = await request(app).get("/api/admin/outbox/../../../etc/passwd").set("Cookie", adminCookie);
    expect(res.status).toBe(404);
    expect(JSON.stringify(res.body)).not.toMatch(/root:/);
  });

  it("when the service itself is handed a path for an id, then it still refuses (a second guard behind the address schema)", async () => {
    await expect(readOutboxMessage(`../${path.basename(outside)}/secret`)).rejects.toBeInstanceOf(NotFoundError);
    await expect(readOutboxMessage(path.join(outside, "secret"))).rejects.toBeInstanceOf(NotFoundError);
  });

  it("when the sink folder holds a symbolic link to a message elsewhere, then the outbox neither lists nor opens it", async () => {
    const link = sinkLikeId("link");
    symlinkSync(path.join(outside, "secret.eml"), path.join(sinkDir, `${link}.eml`));
    try {
      const list = await outboxList();
      expect(list.messages.map((m) => m.id)).not.toContain(link);
      expect(JSON.stringify(list)).not.toContain(secretSubject);
      for (const url of [`/api/admin/outbox/${link}`, `/api/admin/outbox/${link}/attachments/0`]) {
        const res = await request(app).get(url).set("Cookie", adminCookie);
        expect(res.status, url).toBe(404);
        expect(JSON.stringify(res.body)).not.toContain(secretSubject);
      }
    } finally {
      rmSync(path.join(sinkDir, `${link}.eml`), { force: true });
    }
  });
});

/** The app in a child process with `env` over this run's environment; stopped by `close`. */
async function appWith(env: Record<string, string>): Promise<{ url: string; close: () => void }> {
  const tsx = path.join(config.projectRoot, "node_modules", ".bin", "tsx");
  const child: ChildProcess = spawn(tsx, [path.join(import.meta.dirname, "support", "serve-app.ts")], {
    cwd: config.projectRoot,
    // A free port of its own: the loopback name on any port.
    env: { ...process.env, LOG_LEVEL: "error", ALLOWED_HOSTS: "127.0.0.1", ...env },
    stdio: ["ignore", "pipe", "inherit"],
  });
  const port = await new Promise<number>((resolve, reject) => {
    child.once("exit", (code) => reject(new Error(`the app exited (${code}) before it listened`)));
    createInterface({ input: child.stdout! }).once("line", (line) => resolve(JSON.parse(line).port));
  });
  return { url: `http://127.0.0.1:${port}`, close: () => child.kill("SIGTERM") };
}

describe("where the outbox exists", () => {
  it.each([
    [
      "NODE_ENV=production",
      { NODE_ENV: "production", MAIL_SINK_DIR: sinkDir },
      /^The mail outbox exists only in development; this server runs with NODE_ENV=production/,
    ],
    [
      "no sink folder configured",
      { NODE_ENV: "development", MAIL_SINK_DIR: "" },
      /^The mail outbox exists only in development; no local mail sink folder is configured/,
    ],
  ])(
    "when Quartermark runs with %s, then every outbox route answers 404 with a clear message",
    async (_what, env, message) => {
      const sent = await sendTestMail();
      const id = readable((await outboxList()).messages.find((m) => m.readable && m.to.includes(sent.to))).id;
      const server = await appWith(env);
      try {
        // The same admin session works there (the audit log answers), so the 404 is the outbox's refusal.
        expect((await request(server.url).get("/api/audit-events").set("Cookie", adminCookie)).status).toBe(200);
        for (const url of ["/api/admin/outbox", `/api/admin/outbox/${id}`, `/api/admin/outbox/${id}/attachments/0`]) {
          const res = await request(server.url).get(url).set("Cookie", adminCookie);
          expect(res.status, url).toBe(404);
          expect(res.body.error).toEqual({ code: "outbox_unavailable", message: expect.stringMatching(message) });
          expect(JSON.stringify(res.body)).not.toContain(sent.tag);
        }
      } finally {
        server.close();
      }
    },
  );
});
