import { createGuardedRouter } from "../../http/routes";
import { entityCodeOf, exportFormatOf, idOf, signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import {
  createSnapshotSchema,
  returnInputsBodySchema,
  returnSnapshotSchema,
  snapshotActionSchema,
  snapshotListQuerySchema,
} from "../../../shared/schemas/snapshot";
import * as snapshots from "./snapshots.service";
import { getSnapshot, listSnapshots, snapshotPack } from "./snapshots.read";
import { verifyEntityChain, verifySnapshot } from "./snapshots.chain";
import { sendDownload, sendTable } from "../../http/download";
import { getSnapshotReturn, setReturnInputs } from "./snapshots.return";
import { prepareAmendment } from "./snapshots.amendments";
import { currenciesByEntity } from "../../kit/lookups";
import { returnTable, snapshotsTable } from "./snapshots.tables";

export function snapshotsRouter() {
  const r = createGuardedRouter();
  r.get("/api/snapshots", async (req, res) => {
    res.json(await listSnapshots(parseInput(snapshotListQuerySchema, req.query, "query"), signedInActor(req)));
  });
  r.post("/api/snapshots", async (req, res) => {
    const body = parseInput(createSnapshotSchema, req.body);
    const { created, snapshot } =
      body.amends === undefined
        ? await snapshots.prepareSnapshot(body, signedInActor(req))
        : await prepareAmendment({ ...body, amends: body.amends }, signedInActor(req));
    res.status(created ? 201 : 200).json(snapshot);
  });
  r.get("/api/snapshots.:format", async (req, res) => {
    const format = exportFormatOf(req);
    const query = parseInput(snapshotListQuerySchema, req.query, "query");
    const rows = await listSnapshots(query, signedInActor(req));
    await sendTable(res, snapshotsTable(rows, await currenciesByEntity(), query.entity), format);
  });
  r.get("/api/snapshots/:id", async (req, res) => {
    res.json(await getSnapshot(idOf(req), signedInActor(req)));
  });
  r.get("/api/snapshots/:id/pack.pdf", async (req, res) => {
    const pack = await snapshotPack(idOf(req), signedInActor(req));
    sendDownload(res, { fileName: pack.fileName, contentType: "application/pdf", bytes: pack.bytes });
  });
  r.get("/api/snapshots/:id/return", async (req, res) => {
    res.json(await getSnapshotReturn(idOf(req), signedInActor(req)));
  });
  r.put("/api/snapshots/:id/return-inputs", async (req, res) => {
    res.json(await setReturnInputs(idOf(req), parseInput(returnInputsBodySchema, req.body ?? {}), signedInActor(req)));
  });
  r.post("/api/snapshots/:id/submit", async (req, res) => {
    const id = idOf(req);
    res.json(await snapshots.submitSnapshot(id, parseInput(snapshotActionSchema, req.body ?? {}), signedInActor(req)));
  });
  r.post("/api/snapshots/:id/approve", async (req, res) => {
    const id = idOf(req);
    res.json(await snapshots.approveSnapshot(id, parseInput(snapshotActionSchema, req.body ?? {}), signedInActor(req)));
  });
  r.get("/api/snapshots/:id/return.:format", async (req, res) => {
    const id = idOf(req);
    const format = exportFormatOf(req);
    const actor = signedInActor(req);
    const snapshot = await getSnapshot(id, actor);
    await sendTable(res, returnTable(snapshot.entity, await getSnapshotReturn(id, actor)), format);
  });
  r.post("/api/snapshots/:id/return", async (req, res) => {
    const id = idOf(req);
    res.json(await snapshots.returnSnapshot(id, parseInput(returnSnapshotSchema, req.body ?? {}), signedInActor(req)));
  });
  r.get("/api/snapshots/:id/verify", async (req, res) => {
    res.json(await verifySnapshot(idOf(req), signedInActor(req)));
  });
  r.get("/api/entities/:code/chain/verify", async (req, res) => {
    res.json(await verifyEntityChain(entityCodeOf(req)));
  });
  return r.router;
}
