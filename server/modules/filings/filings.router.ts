import { createGuardedRouter } from "../../http/routes";
import { signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { idParamSchema } from "../../../shared/schemas/common";
import * as filings from "./filings.service";
import { exportFormatParamSchema } from "../../../shared/schemas/table-export";
import { tableDownload } from "../../kit/table-export";
import { sendDownload } from "../../http/download";
import { filingsTable } from "./filings.tables";

export function filingsRouter() {
  const r = createGuardedRouter();
  r.post("/api/snapshots/:id/filings", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    const { filing, delivered } = await filings.fileSnapshot(id, signedInActor(req));
    // 201: it reached the supervisor (all recipients, or some: `delivery` "partial" and `summary` say
    // which); 202: recorded and kept, waiting for the mail server (the delivery loop sends it).
    res.status(delivered ? 201 : 202).json(filing);
  });
  r.post("/api/filings/:id/deliver", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    res.json(await filings.finishFiling(id, signedInActor(req)));
  });
  r.get("/api/filings", async (req, res) => {
    res.json(await filings.listFilings(signedInActor(req)));
  });
  r.get("/api/filings.:format", async (req, res) => {
    const { format } = parseInput(exportFormatParamSchema, req.params, "address");
    sendDownload(res, await tableDownload(filingsTable(await filings.listFilings(signedInActor(req))), format));
  });
  r.get("/api/filings/:id/pack.pdf", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    const pack = await filings.filingPack(id, signedInActor(req));
    sendDownload(res, {
      fileName: pack.fileName,
      contentType: "application/pdf",
      bytes: pack.bytes,
      headers: { "X-Pack-SHA256": pack.sha256 },
    });
  });
  r.post("/api/filings/:id/acknowledge", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    res.json(await filings.acknowledgeFiling(id, signedInActor(req)));
  });
  r.get("/api/filings/:id/verify", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    res.json(await filings.verifyFiling(id, signedInActor(req)));
  });
  return r.router;
}
