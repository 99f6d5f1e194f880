import type { Response } from "express";
import { createGuardedRouter } from "../../http/routes";
import { signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { filingIdParamSchema } from "../../../shared/schemas/filing";
import { snapshotIdParamSchema } from "../../../shared/schemas/snapshot";
import * as filings from "./filings.service";

function sendPdf(res: Response, fileName: string, bytes: Buffer, sha256?: string) {
  res.setHeader("Content-Type", "application/pdf");
  res.setHeader("Content-Disposition", `attachment; filename="${fileName}"`);
  if (sha256) res.setHeader("X-Pack-SHA256", sha256);
  res.send(bytes);
}

export function filingsRouter() {
  const r = createGuardedRouter();
  r.get("/api/snapshots/:id/pack.pdf", async (req, res) => {
    const { id } = parseInput(snapshotIdParamSchema, req.params, "address");
    const pack = await filings.snapshotPack(id, signedInActor(req));
    sendPdf(res, pack.fileName, pack.bytes);
  });
  r.post("/api/snapshots/:id/filings", async (req, res) => {
    const { id } = parseInput(snapshotIdParamSchema, req.params, "address");
    const { filing, delivered } = await filings.fileSnapshot(id, signedInActor(req));
    // 201: it reached the supervisor (all recipients, or some: `delivery` "partial" and `summary` say
    // which); 202: recorded and kept, waiting for the mail server (the delivery loop sends it).
    res.status(delivered ? 201 : 202).json(filing);
  });
  r.post("/api/filings/:id/deliver", async (req, res) => {
    const { id } = parseInput(filingIdParamSchema, req.params, "address");
    res.json(await filings.finishFiling(id, signedInActor(req)));
  });
  r.get("/api/filings", async (req, res) => {
    res.json(await filings.listFilings(signedInActor(req)));
  });
  r.get("/api/filings/:id/pack.pdf", async (req, res) => {
    const { id } = parseInput(filingIdParamSchema, req.params, "address");
    const pack = await filings.filingPack(id, signedInActor(req));
    sendPdf(res, pack.fileName, pack.bytes, pack.sha256);
  });
  r.post("/api/filings/:id/acknowledge", async (req, res) => {
    const { id } = parseInput(filingIdParamSchema, req.params, "address");
    res.json(await filings.acknowledgeFiling(id, signedInActor(req)));
  });
  r.get("/api/filings/:id/verify", async (req, res) => {
    const { id } = parseInput(filingIdParamSchema, req.params, "address");
    res.json(await filings.verifyFiling(id, signedInActor(req)));
  });
  return r.router;
}
