/**
 * Overshooting notices of the demo's EU entity (docs/rules.md#overshooting-notice). The daily-data
 * seed committed the history through the upload service, which opened a notice for each overshooting
 * of the last 250 business days. Here the analyst drafts the oldest and the CRO sends it to the
 * (fictional) supervisor through the local mail sink, as they would on the Notices screen; the others
 * stay open, for the demo to draft and send.
 */
import { EntityModel } from "../server/models/entity";
import { OvershootingNoticeModel } from "../server/models/overshooting-notice";
import { PortfolioModel } from "../server/models/portfolio";
import { draftNotice, sendNotice } from "../server/modules/notices/notices.service";
import { demoActor } from "./demo/actor";

export async function up(): Promise<void> {
  const analyst = await demoActor("analyst@larkspur.test");
  const cro = await demoActor("cro@larkspur.test");
  for (const entity of await EntityModel.findAll({ where: { regime: "eu" }, order: [["code", "ASC"]] })) {
    const books = await PortfolioModel.findAll({ where: { entityId: entity.id }, attributes: ["id"] });
    const open = await OvershootingNoticeModel.findAll({
      where: { portfolioId: books.map((b) => b.id), status: "open" },
      order: [["businessDate", "ASC"]],
    });
    // One sent and at least one open: only when the data revealed two or more.
    if (open.length < 2 || entity.supervisorEmails.length === 0) continue;
    const drafted = await draftNotice(
      open[0].id,
      {
        cause:
          "Loss on rates positions after an unexpected central bank decision moved the EUR curve beyond the " +
          "historical scenarios of the VaR window. The desk review of the positions is under way.",
        version: open[0].version,
      },
      analyst,
    );
    await sendNotice(drafted.id, { version: drafted.version }, cro);
  }
}
