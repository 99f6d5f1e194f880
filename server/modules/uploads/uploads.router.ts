import multer from "multer";
import { createGuardedRouter } from "../../http/routes";
import { signedInActor } from "../../http/context";
import { BadRequestError, parseInput } from "../../errors";
import { UPLOAD_MAX_BYTES, uploadRowsQuerySchema } from "../../../shared/schemas/upload";
import { idParamSchema } from "../../../shared/schemas/common";
import * as uploads from "./uploads.service";
import { commitUpload } from "./upload-commit";
import { templateCsv, uploadStorage } from "./upload-files";
import { getUploadRows } from "./upload-rows";
import { sendDownload } from "../../http/download";

// Every limit set (multer defaults to unlimited); mounted on the upload route only. The storage
// keeps the file in memory and checks it while it arrives.
const single = multer({
  storage: uploadStorage(),
  preservePath: true, // keep folders in the name so that such a name is refused, not silently cut
  limits: { fileSize: UPLOAD_MAX_BYTES, files: 1, fields: 0, parts: 1, headerPairs: 50 },
}).single("file");

export function uploadsRouter() {
  const r = createGuardedRouter();

  r.get("/api/uploads/template.csv", (_req, res) => {
    sendDownload(res, {
      fileName: "quartermark-daily-template.csv",
      contentType: "text/csv; charset=utf-8",
      bytes: templateCsv(),
    });
  });

  r.post("/api/uploads", single, async (req, res) => {
    if (!req.file) throw new BadRequestError('Attach the CSV file in the form field "file".');
    const {
      originalname: originalName,
      buffer: bytes,
      received,
    } = req.file as Express.Multer.File & Pick<uploads.IncomingFile, "received">;
    res.status(201).json(await uploads.previewUpload({ originalName, bytes, received }, signedInActor(req)));
  });

  r.get("/api/uploads", async (_req, res) => {
    res.json(await uploads.listUploads());
  });
  r.get("/api/uploads/:id", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    res.json(await uploads.getUpload(id));
  });
  r.get("/api/uploads/:id/rows", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    res.json(await getUploadRows(id, parseInput(uploadRowsQuerySchema, req.query, "query")));
  });
  r.post("/api/uploads/:id/commit", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    res.json(await commitUpload(id, signedInActor(req)));
  });
  r.delete("/api/uploads/:id", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    await uploads.discardUpload(id, signedInActor(req));
    res.status(204).end();
  });
  return r.router;
}
