import { createGuardedRouter } from "../../http/routes";
import { parseInput } from "../../errors";
import { outboxAttachmentParamSchema, outboxIdParamSchema } from "../../../shared/schemas/outbox";
import * as outbox from "./outbox.service";
import { sendDownload } from "../../http/download";

/** The development mail outbox: what the local SMTP sink received, read back for the administrator. */
export function outboxRouter() {
  const r = createGuardedRouter();
  r.get("/api/admin/outbox", async (_req, res) => {
    res.json(await outbox.listOutbox());
  });
  r.get("/api/admin/outbox/:id", async (req, res) => {
    const { id } = parseInput(outboxIdParamSchema, req.params, "address");
    res.json(await outbox.readOutboxMessage(id));
  });
  r.get("/api/admin/outbox/:id/attachments/:index", async (req, res) => {
    const { id, index } = parseInput(outboxAttachmentParamSchema, req.params, "address");
    const attachment = await outbox.readOutboxAttachment(id, index);
    sendDownload(res, {
      fileName: attachment.filename,
      contentType: attachment.contentType,
      bytes: attachment.bytes,
      headers: { "X-Attachment-SHA256": attachment.sha256 },
    });
  });
  return r.router;
}
