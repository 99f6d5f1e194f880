import { startPackDocument } from "./snapshot-pack";
import { INK, MUTED, WARN, amount2, when } from "./pack-layout";
import type { Notice } from "../../shared/schemas/notice";

/**
 * The overshooting notice as the supervisor receives it (docs/rules.md#overshooting-notice): one page
 * with the entity, the day, the amounts on each series against VaR, the excess, the cause so far in
 * the analyst's words, who drafted and who sent it, and the bank's attestation line on every page. It
 * is a document the bank sends, so it carries the attestation, not the screens' decision-support
 * caution (as the filed pack does). Same fonts and drawing kit as the pack.
 */
export function noticePdfFileName(n: Pick<Notice, "entity" | "portfolio" | "date">): string {
  return `quartermark-${n.entity.toLowerCase()}-${n.date}-overshooting-notice.pdf`;
}

const SERIES_WORDS = {
  actual: "actual P&L",
  hypothetical: "hypothetical P&L",
  both: "actual and hypothetical P&L",
} as const;

export async function renderNoticePdf(
  n: Notice & { sentAt: string; sentBy: string },
  extras: { supervisorName: string | null },
): Promise<Buffer> {
  const created = new Date(n.sentAt);
  const { doc, L, done } = startPackDocument({
    Title: `${n.entity} overshooting notice ${n.date}`,
    Author: n.entityName,
    Subject: `Overshooting of ${n.portfolio} on ${n.date} (CRR Art. 366(5))`,
    created,
  });
  const { left, width } = L;
  const money = (v: number | null) => (v === null ? "—" : `${amount2(v)} ${n.currency}`);

  doc.font("regular").fontSize(8.5).fillColor(MUTED).text("OVERSHOOTING NOTICE · CRR ARTICLE 366(5)", left);
  doc.moveDown(0.3).font("semibold").fontSize(18).fillColor(INK).text(`${n.entityName} (${n.entity})`);
  doc.font("regular").fontSize(12).text(`Overshooting of ${n.portfolio} on ${n.date}`);
  doc
    .moveDown(0.5)
    .fontSize(9.5)
    .fillColor(INK)
    .text(
      `To ${extras.supervisorName ?? "the competent authority"}: ${n.entityName} notifies an overshooting that its ` +
        `back-testing programme revealed on ${n.revealedOn}. The daily loss on ${SERIES_WORDS[n.series]} exceeded ` +
        `the one-day value-at-risk measure of the same day.`,
      left,
      doc.y,
      { width },
    );

  L.heading("The overshooting");
  L.pairs([
    ["Business day", n.date],
    ["Portfolio", `${n.portfolio} (top of house)`],
    ["Actual P&L", money(n.actualPnl)],
    ["Hypothetical P&L", money(n.hypotheticalPnl)],
    ["Value at risk (99%, one day)", money(n.var99)],
    ["Loss beyond VaR", money(n.excess)],
    ["Overshooting on", SERIES_WORDS[n.series]],
  ]);

  L.heading("Cause so far");
  L.paragraph(n.cause || "—");

  L.heading("Timing");
  L.pairs([
    ["Revealed by the back-testing on", n.revealedOn],
    ["Due by (five working days)", n.dueOn],
    ["Sent on", when(n.sentAt)],
  ]);
  if (n.late) L.paragraph(`This notice is sent after its due day, ${n.dueOn}.`, { colour: WARN, font: "semibold" });

  L.heading("Attestation", 110);
  L.paragraph(
    `${n.entityName} sends this notice as its record of the overshooting above. The cause was drafted by ` +
      `${n.draftedBy ?? "—"} on ${when(n.draftedAt)} and the notice was sent by ${n.sentBy}, chief risk officer, ` +
      `on ${when(n.sentAt)} to ${n.recipients.join(", ")}.`,
  );

  const footer = `Sent by ${n.entityName}: overshooting notice of ${n.date}, attested under “Attestation” in this notice.`;
  L.stampPages(footer, () =>
    doc
      .font("regular")
      .fontSize(7.5)
      .fillColor(MUTED)
      .text(`${n.entity} · overshooting notice · ${n.portfolio} · ${n.date}`, left, 32, { width, lineBreak: false }),
  );
  doc.end();
  return done;
}
