import multer from "multer";
import type { RequestHandler } from "express";
import { config } from "../../config";
import { createGuardedRouter } from "../../http/routes";
import { exportFormatOf, idOf, signedInActor } from "../../http/context";
import { BadRequestError, ServerBusyError, parseInput } from "../../errors";
import { Semaphore, SemaphoreRefusal } from "../../semaphore";
import { UPLOAD_MAX_BYTES, commitUploadBodySchema, uploadRowsQuerySchema } from "../../../shared/schemas/upload";
import * as uploads from "./uploads.service";
import { commitUpload } from "./upload-commit";
import { templateCsv, uploadStorage } from "./upload-files";
import { getUploadRows } from "./upload-rows";
import { sendDownload, sendTable } from "../../http/download";
import { uploadsTable } from "./uploads.tables";

// Every limit set (multer defaults to unlimited); mounted on the upload route only. The storage
// keeps the file in memory and checks it while it arrives.
const single = multer({
  storage: uploadStorage(),
  preservePath: true, // keep folders in the name so that such a name is refused, not silently cut
  // Browsers send the file name as raw UTF-8 without a charset; busboy would read it as latin1.
  defParamCharset: "utf8",
  limits: { fileSize: UPLOAD_MAX_BYTES, files: 1, fields: 0, parts: 1, headerPairs: 50 },
}).single("file");

/** Over this, an upload is large: it takes a turn before its body is read (or sent without a length). */
export const LARGE_UPLOAD_BYTES = 1024 * 1024;

export interface UploadLimits {
  /** The turns large uploads take (per server process). */
  gate: Semaphore;
  largeFileBytes: number;
}

export function defaultUploadLimits(): UploadLimits {
  return {
    gate: new Semaphore(config.uploads.concurrency, config.uploads.queue),
    largeFileBytes: LARGE_UPLOAD_BYTES,
  };
}

/**
 * Large uploads take turns: a file is received, hashed, packed and parsed while it arrives, which
 * holds it in memory several times over, so only a few run at once and the rest wait (their
 * bytes stay in the client's socket meanwhile). One more than the queue holds, or one that waited
 * too long, is refused at once with 503 and Retry-After.
 */
function takeTurn({ gate, largeFileBytes }: UploadLimits): RequestHandler {
  return async (req, res, next) => {
    const length = Number(req.get("content-length"));
    if (req.get("content-length") !== undefined && Number.isFinite(length) && length <= largeFileBytes) return next();
    let release: () => void;
    try {
      release = await gate.acquire(config.uploads.queueWaitMs);
    } catch (err) {
      if (!(err instanceof SemaphoreRefusal)) throw err;
      throw new ServerBusyError(
        `Other large files are being checked right now (${gate.holders} checking, ${gate.waiters} waiting), so yours was not started.`,
        15,
      );
    }
    res.once("close", release);
    next();
  };
}

export function uploadsRouter(limits: UploadLimits = defaultUploadLimits()) {
  const r = createGuardedRouter();

  r.get("/api/uploads/template.csv", (_req, res) => {
    sendDownload(res, {
      fileName: "quartermark-daily-template.csv",
      contentType: "text/csv; charset=utf-8",
      bytes: templateCsv(),
    });
  });

  r.post("/api/uploads", takeTurn(limits), single, async (req, res) => {
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
  r.get("/api/uploads.:format", async (req, res) => {
    const format = exportFormatOf(req);
    await sendTable(res, uploadsTable(await uploads.listUploads()), format);
  });
  r.get("/api/uploads/:id", async (req, res) => {
    res.json(await uploads.getUpload(idOf(req)));
  });
  r.get("/api/uploads/:id/rows", async (req, res) => {
    res.json(await getUploadRows(idOf(req), parseInput(uploadRowsQuerySchema, req.query, "query")));
  });
  r.post("/api/uploads/:id/commit", async (req, res) => {
    res.json(await commitUpload(idOf(req), signedInActor(req), parseInput(commitUploadBodySchema, req.body ?? {})));
  });
  r.delete("/api/uploads/:id", async (req, res) => {
    await uploads.discardUpload(idOf(req), signedInActor(req));
    res.status(204).end();
  });
  return r.router;
}
