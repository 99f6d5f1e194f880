import { createGuardedRouter } from "../../http/routes";
import { exportFormatOf, idOf, signedInActor } from "../../http/context";
import * as filings from "./filings.service";
import { sendDownload, sendTable } from "../../http/download";
import { filingsTable } from "./filings.tables";

export function filingsRouter() {
  const r = createGuardedRouter();
  r.post("/api/snapshots/:id/filings", async (req, res) => {
    const { filing, delivered } = await filings.fileSnapshot(idOf(req), signedInActor(req));
    // 201: it reached the supervisor (all recipients, or some: `delivery` "partial" and `summary` say
    // which); 202: recorded and kept, waiting for the mail server (the delivery loop sends it).
    res.status(delivered ? 201 : 202).json(filing);
  });
  r.post("/api/filings/:id/deliver", async (req, res) => {
    res.json(await filings.finishFiling(idOf(req), signedInActor(req)));
  });
  r.get("/api/filings", async (req, res) => {
    res.json(await filings.listFilings(signedInActor(req)));
  });
  r.get("/api/filings.:format", async (req, res) => {
    const format = exportFormatOf(req);
    await sendTable(res, filingsTable(await filings.listFilings(signedInActor(req))), format);
  });
  r.get("/api/filings/:id/pack.pdf", async (req, res) => {
    const pack = await filings.filingPack(idOf(req), signedInActor(req));
    sendDownload(res, {
      fileName: pack.fileName,
      contentType: "application/pdf",
      bytes: pack.bytes,
      headers: { "X-Pack-SHA256": pack.sha256 },
    });
  });
  r.post("/api/filings/:id/acknowledge", async (req, res) => {
    res.json(await filings.acknowledgeFiling(idOf(req), signedInActor(req)));
  });
  r.get("/api/filings/:id/verify", async (req, res) => {
    res.json(await filings.verifyFiling(idOf(req), signedInActor(req)));
  });
  return r.router;
}
