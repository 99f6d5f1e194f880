import multer from "multer";
import { createGuardedRouter } from "../../http/routes";
import { idOf, signedInActor } from "../../http/context";
import { BadRequestError, parseInput } from "../../errors";
import { decisionBodySchema, exceptionParamSchema, reviewBodySchema } from "../../../shared/schemas/review";
import { sendDownload } from "../../http/download";
import { addEvidence, EVIDENCE_MAX_BYTES, getEvidence, recordDecision, saveReview } from "./reviews.service";

const evidenceUpload = multer({
  storage: multer.memoryStorage(),
  preservePath: true,
  // Browsers send the file name as raw UTF-8 without a charset; busboy would read it as latin1.
  defParamCharset: "utf8",
  limits: { fileSize: EVIDENCE_MAX_BYTES, files: 1, fields: 0, parts: 1, headerPairs: 50 },
}).single("file");

export function reviewsRouter() {
  const r = createGuardedRouter();
  r.put("/api/portfolios/:code/exceptions/:date/review", async (req, res) => {
    const { code, date } = parseInput(exceptionParamSchema, req.params, "address");
    res.json(await saveReview(code, date, parseInput(reviewBodySchema, req.body), signedInActor(req)));
  });
  r.put("/api/portfolios/:code/exceptions/:date/decision", async (req, res) => {
    const { code, date } = parseInput(exceptionParamSchema, req.params, "address");
    res.json(await recordDecision(code, date, parseInput(decisionBodySchema, req.body), signedInActor(req)));
  });
  r.post("/api/portfolios/:code/exceptions/:date/evidence", evidenceUpload, async (req, res) => {
    const { code, date } = parseInput(exceptionParamSchema, req.params, "address");
    if (!req.file) throw new BadRequestError('Attach the evidence file in the form field "file".');
    res
      .status(201)
      .json(
        await addEvidence(
          code,
          date,
          { originalName: req.file.originalname, bytes: req.file.buffer },
          signedInActor(req),
        ),
      );
  });
  // Always a download, never rendered by the browser: evidence is whatever someone uploaded.
  r.get("/api/evidence/:id", async (req, res) => {
    const file = await getEvidence(idOf(req));
    sendDownload(res, {
      fileName: file.fileName.replace(/[^\w.-]+/g, "_"),
      contentType: "application/octet-stream",
      bytes: file.content,
      headers: { "X-Content-SHA256": file.sha256 },
    });
  });
  return r.router;
}
