import { createGuardedRouter } from "../../http/routes";
import { signedInActor } from "../../http/context";
import { parseInput } from "../../errors";
import { idParamSchema } from "../../../shared/schemas/common";
import { sendDownload } from "../../http/download";
import { draftNotice, listNotices, sendNotice, sentNoticePdf } from "./notices.service";

export function noticesRouter() {
  const r = createGuardedRouter();
  r.get("/api/notices", async (req, res) => {
    res.json(await listNotices(req.query));
  });
  r.put("/api/notices/:id/draft", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    res.json(await draftNotice(id, req.body, signedInActor(req)));
  });
  r.post("/api/notices/:id/send", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    res.json(await sendNotice(id, req.body, signedInActor(req)));
  });
  r.get("/api/notices/:id/notice.pdf", async (req, res) => {
    const { id } = parseInput(idParamSchema, req.params, "address");
    const pdf = await sentNoticePdf(id);
    sendDownload(res, {
      fileName: pdf.fileName,
      contentType: "application/pdf",
      bytes: pdf.bytes,
      headers: { "X-Notice-SHA256": pdf.sha256 },
    });
  });
  return r.router;
}
