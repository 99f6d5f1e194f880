import { createGuardedRouter } from "../../http/routes";
import { idOf, signedInActor } from "../../http/context";
import { sendDownload } from "../../http/download";
import { draftNotice, listNotices, sendNotice, sentNoticePdf } from "./notices.service";

export function noticesRouter() {
  const r = createGuardedRouter();
  r.get("/api/notices", async (req, res) => {
    res.json(await listNotices(req.query));
  });
  r.put("/api/notices/:id/draft", async (req, res) => {
    res.json(await draftNotice(idOf(req), req.body, signedInActor(req)));
  });
  r.post("/api/notices/:id/send", async (req, res) => {
    res.json(await sendNotice(idOf(req), req.body, signedInActor(req)));
  });
  r.get("/api/notices/:id/notice.pdf", async (req, res) => {
    const pdf = await sentNoticePdf(idOf(req));
    sendDownload(res, {
      fileName: pdf.fileName,
      contentType: "application/pdf",
      bytes: pdf.bytes,
      headers: { "X-Notice-SHA256": pdf.sha256 },
    });
  });
  return r.router;
}
