import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import PDFDocument from "pdfkit";
import { woffToSfnt } from "./woff-to-sfnt";
import { getRegime } from "../../shared/backtest/regimes";
import { CAUTION } from "../../shared/schemas/common";
import { quarterLabel, quarterStart } from "../../shared/backtest/quarters";
import { SIGNED_OFF, type Snapshot } from "../../shared/schemas/snapshot";

/**
 * The quarterly pack of one snapshot as a PDF: where the entity stands at the quarter end, the
 * exceptions behind it, the seal (inputs hash, hash chain) and the sign-off record, with the
 * caution on every page. IBM Plex Sans is embedded from its .woff files (pdfkit's woff2 path drops
 * accented letters), unpacked once (./woff-to-sfnt.ts). The document's dates are the snapshot's
 * own, so the same snapshot always gives the same text.
 */

const require = createRequire(import.meta.url);
const FONT_DIR = path.join(path.dirname(require.resolve("@ibm/plex-sans/package.json")), "fonts", "complete", "woff");
let fonts: { regular: Buffer; semibold: Buffer } | undefined;
/** The two weights the pack uses, read and unpacked once per process. */
function packFonts() {
  fonts ??= {
    regular: woffToSfnt(readFileSync(path.join(FONT_DIR, "IBMPlexSans-Regular.woff"))),
    semibold: woffToSfnt(readFileSync(path.join(FONT_DIR, "IBMPlexSans-SemiBold.woff"))),
  };
  return fonts;
}

const INK = "#1b2638";
const MUTED = "#66728a";
const RULE = "#d9d4c7";
const ZONE_WORDS = { green: "Green", yellow: "Yellow", red: "Red" } as const;

const amount = (v: number | null, currency: string) =>
  v === null ? "—" : `${v.toLocaleString("en-GB", { minimumFractionDigits: 0, maximumFractionDigits: 0 })} ${currency}`;
const factor = (v: number) => v.toFixed(2);
const percent = (v: number) => `${(v * 100).toFixed(2)}%`;
const when = (iso: string | null) => (iso ? `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC` : "—");

export function snapshotPackFileName(s: Snapshot): string {
  return `quartermark-${s.entity.toLowerCase()}-${s.quarterEnd}-pack.pdf`;
}

export async function renderSnapshotPack(s: Snapshot): Promise<Buffer> {
  const f = s.figures;
  const signedOff = SIGNED_OFF.has(s.status);
  const created = new Date(s.approvedAt ?? s.preparedAt);
  const doc = new PDFDocument({
    size: "A4",
    margins: { top: 56, bottom: 64, left: 56, right: 56 },
    bufferPages: true,
    info: {
      Title: `${s.entity} ${quarterLabel(s.quarterEnd)} backtesting pack`,
      Author: "Quartermark",
      Subject: `Backtesting and capital multiplier, quarter ending ${s.quarterEnd}`,
      CreationDate: created,
      ModDate: created,
    },
  });
  doc.registerFont("regular", packFonts().regular);
  doc.registerFont("semibold", packFonts().semibold);
  const chunks: Buffer[] = [];
  doc.on("data", (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve) => doc.on("end", () => resolve(Buffer.concat(chunks))));

  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;
  const heading = (text: string) => {
    doc.moveDown(0.8).font("semibold").fontSize(11).fillColor(INK).text(text, left);
    doc
      .moveTo(left, doc.y + 2)
      .lineTo(left + width, doc.y + 2)
      .lineWidth(0.5)
      .strokeColor(RULE)
      .stroke();
    doc.moveDown(0.4);
  };
  /** Rows of label → value in two columns. */
  const pairs = (rows: [string, string][]) => {
    for (const [label, value] of rows) {
      const y = doc.y;
      doc.font("regular").fontSize(9).fillColor(MUTED).text(label, left, y, { width: 190 });
      doc
        .font("semibold")
        .fontSize(9.5)
        .fillColor(INK)
        .text(value, left + 200, y, { width: width - 200 });
      doc.moveDown(0.25);
    }
  };

  // Where it stands.
  doc.font("regular").fontSize(8.5).fillColor(MUTED).text("QUARTERMARK · QUARTERLY BACKTESTING PACK", left);
  doc.moveDown(0.3).font("semibold").fontSize(18).fillColor(INK).text(`${s.entityName} (${s.entity})`);
  doc
    .font("regular")
    .fontSize(12)
    .text(`${quarterLabel(s.quarterEnd)}: ${quarterStart(s.quarterEnd)} to ${s.quarterEnd}`);
  doc
    .moveDown(0.4)
    .fontSize(9.5)
    .fillColor(signedOff ? INK : "#9a3b2f");
  doc.text(
    signedOff
      ? `Signed off: approved by ${s.approvedBy} on ${when(s.approvedAt)}${s.status === "filed" ? "; filed with the supervisor" : ""}.`
      : `Not signed off (${s.status}): these figures are a working copy and must not be filed.`,
  );

  heading("Where the entity stands at the quarter end");
  pairs([
    [
      "Rule set",
      `${getRegime(f.regime).label}, exceptions counted on ${f.pnlBasis === "max" ? "the higher of actual and hypothetical P&L" : `${f.pnlBasis} P&L`}`,
    ],
    ["Top-of-house portfolio", f.portfolio],
    [
      "Backtesting window",
      `${f.window.start ?? "—"} to ${f.window.end ?? "—"}, ${f.window.observations} observations${f.window.complete ? "" : " (short window: provisional)"}`,
    ],
    ["Exceptions (actual / hypothetical)", `${f.exceptions.actual} / ${f.exceptions.hypothetical}`],
    [
      "Counted exceptions",
      `${f.exceptions.counted}${f.exceptions.excluded ? ` (${f.exceptions.excluded} disregarded with the supervisor's approval)` : ""}`,
    ],
    ["Expected if the model is right", `${f.expected.toFixed(2)} (observations × ${(1 - 0.99).toFixed(2)})`],
    ["P(X ≤ counted), binomial", percent(f.cumulativeProbability)],
    ["Traffic-light zone", `${ZONE_WORDS[f.zone]}${f.zoneLabel.toLowerCase() !== f.zone ? ` (${f.zoneLabel})` : ""}`],
    ["Plus factor", factor(f.plusFactor)],
    ["Qualitative addend", factor(f.qualitativeAddend)],
    ["Multiplier", factor(f.multiplier)],
    ["Capital requirement", amount(f.capital, f.currency)],
    ["Capital add-on from the plus factor", amount(f.addOn, f.currency)],
  ]);
  if (f.capitalNote) doc.font("regular").fontSize(8.5).fillColor(MUTED).text(f.capitalNote, left, doc.y, { width });

  // Why.
  heading("Exception days in the window");
  doc
    .font("regular")
    .fontSize(9.5)
    .fillColor(INK)
    .text(f.exceptionDates.length ? f.exceptionDates.join(" · ") : "None.", left, doc.y, { width });
  if (f.desks.length) {
    heading("Trading desks (FRTB)");
    pairs(
      f.desks.map((d) => [
        d.portfolio,
        `${d.exceptions99} at 99%, ${d.exceptions975} at 97.5%: ${d.passes ? "passes" : "fails"} backtesting; P&L attribution ${d.plaZone ? d.plaZone : "not available"}`,
      ]),
    );
  }
  if (s.restatedAfterSignOff) {
    heading("Changed after sign-off");
    doc
      .font("regular")
      .fontSize(9.5)
      .fillColor("#9a3b2f")
      .text(`${s.restatedAfterSignOff.detail} The figures above are as approved.`, left, doc.y, { width });
  }

  // The seal and the record.
  heading("Seal and sign-off record");
  pairs([
    ["Inputs SHA-256", s.inputsSha256],
    ["Engine version", s.engineVersion],
    ["Snapshot hash", s.hash ?? "— (not signed off)"],
    ["Previous snapshot hash", s.hash ? (s.prevHash ?? "none: the first signed-off quarter of the entity") : "—"],
  ]);
  doc.moveDown(0.3);
  for (const e of s.history) {
    doc
      .font("regular")
      .fontSize(9)
      .fillColor(INK)
      .text(`${when(e.at)} · ${e.by} · ${e.action}${e.comment ? `: ${e.comment}` : ""}`, left, doc.y, { width });
  }

  // The caution and the page numbers on every page.
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const bottom = doc.page.height - doc.page.margins.bottom;
    doc.page.margins.bottom = 0; // writing in the margin must not start a new page
    doc.font("regular").fontSize(7.5).fillColor(MUTED);
    doc.text(CAUTION, left, bottom + 18, { width: width - 60 });
    doc.text(`Page ${i - range.start + 1} of ${range.count}`, left + width - 60, bottom + 18, {
      width: 60,
      align: "right",
    });
  }
  doc.end();
  return done;
}
