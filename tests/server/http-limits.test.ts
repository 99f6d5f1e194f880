import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sequelize } from "../../server/db/sequelize";
import { UploadModel } from "../../server/models/upload";
import { testApp } from "./helpers";
import { csvFor, ingestFixture, uploadCsv, weekdays } from "./ingest-helpers";

const app = testApp();
afterAll(() => sequelize.close());

let fx: Awaited<ReturnType<typeof ingestFixture>>;
beforeAll(async () => {
  fx = await ingestFixture();
});

describe("file names in UTF-8", () => {
  it("when a browser uploads “Übersicht März.csv” (its name sent as raw UTF-8), then the name is stored and shown as written", async () => {
    const name = "Übersicht März.csv";
    const res = await uploadCsv(app, fx.cookie, csvFor(fx.portfolio.code, weekdays("2019-03-04", 3)), name);
    expect(res.status).toBe(201);
    expect(res.body.fileName).toBe(name);
    expect((await UploadModel.findByPk(res.body.id))!.fileName).toBe(name);
    const shown = await request(app).get(`/api/uploads/${res.body.id}`).set("Cookie", fx.cookie);
    expect(shown.body.fileName).toBe(name);
  });
});

describe("strict integer ids", () => {
  it.each(["1e1", "0x10", "01", "%201", "1.0", "-1", "+1", "0"])(
    "when an id in an address is written %s, then 422 says it is not a plain id (never read as another number)",
    async (id) => {
      const res = await request(app).get(`/api/uploads/${id}`).set("Cookie", fx.cookie);
      expect(res.status).toBe(422);
      expect(res.body.error.code).toBe("validation_failed");
      expect(res.body.error.message).toMatch(/plain digits/);
    },
  );

  it("when an id is written in plain digits, then it is read as that number", async () => {
    const res = await uploadCsv(app, fx.cookie, csvFor(fx.portfolio.code, weekdays("2019-04-01", 2)), "plain.csv");
    expect((await request(app).get(`/api/uploads/${res.body.id}`).set("Cookie", fx.cookie)).status).toBe(200);
  });
});

describe("the host names the server answers to", () => {
  it("when a request names another host (a rebound DNS name), then 421 and nothing else; the configured host is served", async () => {
    const refused = await request(app).get("/api/health").set("Host", "evil.example:3000");
    expect(refused.status).toBe(421);
    expect(refused.body.error.code).toBe("unknown_host");
    expect(refused.headers["x-content-type-options"]).toBe("nosniff");
    expect((await request(app).get("/api/health")).status).toBe(200); // Supertest's 127.0.0.1:<port>
  });

  it("when ALLOWED_HOSTS names the public name, then that name is served and the loopback names are not", async () => {
    const named = testApp({ allowedHosts: ["quartermark.larkspur.test"] });
    expect((await request(named).get("/api/health").set("Host", "quartermark.larkspur.test")).status).toBe(200);
    expect((await request(named).get("/api/health").set("Host", "quartermark.larkspur.test:8443")).status).toBe(200);
    expect((await request(named).get("/api/health")).status).toBe(421);
  });
});
