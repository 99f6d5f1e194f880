import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import * as fontkit from "fontkit";
import PDFDocument from "pdfkit";
import { woffToSfnt } from "./woff-to-sfnt";
import { getRegime } from "../../shared/backtest/regimes";
import { CAUTION } from "../../shared/schemas/common";
import { quarterLabel, quarterStart } from "../../shared/backtest/quarters";
import {
  SIGNED_OFF,
  type AmendmentChange,
  type AmendmentRecord,
  type Snapshot,
  type SnapshotException,
} from "../../shared/schemas/snapshot";
import { causeLabels } from "../../shared/schemas/review";
import { drawPnlVarChart } from "./pack-chart";
import { returnData } from "../../shared/backtest/return-data";
import { INK, MUTED, PackLayout, WARN, amount, amount2, factor, percent, when, type Column } from "./pack-layout";

/**
 * The quarterly pack of one snapshot as a PDF, from its frozen figures: the cover (entity, quarter,
 * determination, status), the determination's formula with its numbers, every exception of the
 * window with its amounts, explanation and the supervisor's decision, the statistical tests in
 * words, the P&L against VaR chart (vectors), the capital inputs and result, the FRTB desks, the
 * seal in a fixed-width font, and the signatories. A pack of a snapshot that is not signed off
 * says DRAFT on every page; an approved one carries the caution; the filed one carries the bank's
 * attestation instead. IBM Plex is embedded from its .woff files (pdfkit's woff2 path drops
 * accented letters), unpacked once (./woff-to-sfnt.ts). The document's dates are the snapshot's
 * own, so the same snapshot always gives the same bytes.
 */

const require = createRequire(import.meta.url);
const fontFile = (pkg: string, name: string) =>
  path.join(path.dirname(require.resolve(`${pkg}/package.json`)), "fonts", "complete", "woff", name);
let fonts: { regular: Buffer; semibold: Buffer; mono: Buffer } | undefined;
/** The weights the pack uses, read and unpacked once per process. */
export function packFonts() {
  fonts ??= {
    regular: woffToSfnt(readFileSync(fontFile("@ibm/plex-sans", "IBMPlexSans-Regular.woff"))),
    semibold: woffToSfnt(readFileSync(fontFile("@ibm/plex-sans", "IBMPlexSans-SemiBold.woff"))),
    mono: woffToSfnt(readFileSync(fontFile("@ibm/plex-mono", "IBMPlexMono-Regular.woff"))),
  };
  return fonts;
}

/**
 * An A4 document in the pack's margins, fonts and drawing kit, dated `created` (so the same record always
 * gives the same bytes), and the promise of its bytes once it ends. The notice uses it too.
 */
export function startPackDocument(info: { Title: string; Author: string; Subject: string; created: Date }) {
  const { created, ...names } = info;
  const doc = new PDFDocument({
    size: "A4",
    margins: { top: 64, bottom: 64, left: 56, right: 56 },
    bufferPages: true,
    info: { ...names, CreationDate: created, ModDate: created },
  });
  const packed = packFonts();
  doc.registerFont("regular", packed.regular);
  doc.registerFont("semibold", packed.semibold);
  doc.registerFont("mono", packed.mono);
  const chunks: Buffer[] = [];
  doc.on("data", (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve) => doc.on("end", () => resolve(Buffer.concat(chunks))));
  return { doc, L: new PackLayout(doc), done };
}

const ZONE_WORDS = { green: "Green", yellow: "Yellow", red: "Red" } as const;

/** A person who signed the snapshot, as the pack names them. */
export interface Signatory {
  /** "Prepared by", "Submitted by", "Approved by". */
  act: string;
  name: string;
  title: string;
  email: string;
  at: string | null;
}

export interface PackExtras {
  signatories?: Signatory[];
}

/**
 * A large word across the page, drawn from the font's glyph outlines as vector paths, so it reads
 * on the page and in print but does not scatter its letters through the page's text (the running
 * head says DRAFT in text).
 */
function drawWatermark(doc: PDFKit.PDFDocument, word: string) {
  const font = fontkit.create(packFonts().semibold) as fontkit.Font;
  const run = font.layout(word);
  const size = 130;
  const scale = size / font.unitsPerEm;
  const advance = run.glyphs.reduce((sum, _g, i) => sum + run.positions[i].xAdvance, 0) * scale;
  doc.save();
  doc.rotate(-40, { origin: [doc.page.width / 2, doc.page.height / 2] });
  doc.fillColor(WARN).fillOpacity(0.1);
  let x = (doc.page.width - advance) / 2;
  const baseline = doc.page.height / 2 + (font.capHeight * scale) / 2;
  run.glyphs.forEach((g, i) => {
    doc.save();
    doc.translate(x, baseline).scale(scale, -scale);
    doc.path(g.path.toSVG()).fill();
    doc.restore();
    x += run.positions[i].xAdvance * scale;
  });
  doc.restore();
  doc.fillOpacity(1);
}

export function snapshotPackFileName(s: Snapshot): string {
  return `quartermark-${s.entity.toLowerCase()}-${s.quarterEnd}${s.amendment ? `-amendment-${s.id}` : ""}-pack.pdf`;
}

/** A value of the before/after table as the pack prints it. */
function changedValue(c: AmendmentChange, v: AmendmentChange["before"]): string {
  if (v === null) return "—";
  if (typeof v === "string") return c.key === "zone" && v in ZONE_WORDS ? ZONE_WORDS[v as keyof typeof ZONE_WORDS] : v;
  return c.unit === "amount" ? amount2(v) : c.unit === "factor" ? factor(v) : String(v);
}

/**
 * An amendment's own section: why it was made, the filed snapshot it amends (filing date, who filed
 * it, its hash unbroken), its capital impact and the before/after of every figure that changed,
 * all read from the record frozen when the amendment was prepared.
 */
function drawAmendment(L: PackLayout, a: AmendmentRecord, cur: string) {
  const o = a.original;
  L.heading("What this amendment changes", 140);
  L.paragraph(
    `This pack amends the filing of ${o.filedAt ? when(o.filedAt) : "an earlier date"}${o.filedBy ? ` by ${o.filedBy}` : ""} (snapshot #${o.snapshotId}${o.filingId ? `, filing #${o.filingId}` : ""}). That filing and its pack stand unchanged; this one corrects it after data inside the quarter was restated.`,
  );
  if (a.reason) L.paragraph(`Why: ${a.reason}`, { colour: MUTED, size: 8.5 });
  L.hash("Original snapshot hash (the filed snapshot this pack amends)", o.hash, "—");
  if (o.packSha256) L.hash("SHA-256 of the original filed pack", o.packSha256, "—");
  const impact = a.capitalImpact;
  L.pairs([
    ["Capital requirement as filed", impact.before === null ? "—" : `${amount2(impact.before)} ${cur}`],
    ["Capital requirement as amended", impact.after === null ? "—" : `${amount2(impact.after)} ${cur}`],
    [
      "Capital impact",
      impact.change === null
        ? "Not available: one side has no capital figure."
        : `${impact.change > 0 ? "+" : ""}${amount2(impact.change)} ${cur} (${impact.change > 0 ? "an increase" : impact.change < 0 ? "a decrease" : "no change"})`,
    ],
  ]);
  L.paragraph(`Before and after, ${a.changes.length} figure${a.changes.length === 1 ? "" : "s"} changed:`, {
    font: "semibold",
  });
  if (a.changes.length === 0) L.paragraph("No figure changed.", { colour: MUTED });
  else
    L.table(
      [
        { header: "Figure", width: 170 },
        { header: "Template row", width: 100 },
        { header: "Before (as filed)", width: (L.width - 270) / 2, align: "right" },
        { header: "After (amended)", width: (L.width - 270) / 2, align: "right" },
      ],
      a.changes.map((c) => ({
        cells: [c.label, c.templateRow ?? "—", changedValue(c, c.before), changedValue(c, c.after)],
      })),
    );
  L.paragraph(`Exceptions added, removed or changed: ${a.exceptions.length || "none"}.`, { font: "semibold" });
  if (a.exceptions.length)
    L.table(
      [
        { header: "Date", width: 70 },
        { header: "Change", width: 70 },
        { header: "What changed", width: L.width - 140 },
      ],
      a.exceptions.map((e) => ({ cells: [e.date, e.change.charAt(0).toUpperCase() + e.change.slice(1), e.detail] })),
    );
}

/** The supervisor's decision on an exclusion, in words. */
function decisionWords(e: SnapshotException): string {
  const ref = [e.decisionReference ? `reference ${e.decisionReference}` : null, e.decisionDate]
    .filter(Boolean)
    .join(", ");
  switch (e.exclusionStatus) {
    case "approved":
      return `Exclusion approved by the supervisor (${ref}).`;
    case "rejected":
      return `Exclusion rejected by the supervisor (${ref}).`;
    case "requested":
      return "Exclusion requested; no supervisor decision yet.";
    default:
      return "No exclusion requested.";
  }
}

export async function renderSnapshotPack(s: Snapshot, extras: PackExtras = {}): Promise<Buffer> {
  const f = s.figures;
  const rules = getRegime(f.regime);
  const signedOff = SIGNED_OFF.has(s.status);
  const filed = s.status === "filed";
  const created = new Date(s.approvedAt ?? s.preparedAt);
  const { doc, L, done } = startPackDocument({
    Title: `${s.entity} ${quarterLabel(s.quarterEnd)} backtesting pack${s.amendment ? ` (amendment of snapshot #${s.amendment.amends})` : ""}`,
    Author: "Quartermark",
    Subject: `Backtesting and capital multiplier, quarter ending ${s.quarterEnd}`,
    created,
  });
  const { left, width } = L;
  const cur = f.currency;
  const basisWords = f.pnlBasis === "max" ? "the higher of actual and hypothetical P&L" : `${f.pnlBasis} P&L`;

  // ── Cover: where the entity stands ────────────────────────────────────────────────────────
  const amendment = s.amendment;
  doc
    .font("regular")
    .fontSize(8.5)
    .fillColor(MUTED)
    .text(`QUARTERMARK · QUARTERLY BACKTESTING PACK${amendment ? " · AMENDMENT" : ""}`, left);
  if (amendment) {
    doc
      .moveDown(0.3)
      .font("semibold")
      .fontSize(13)
      .fillColor(WARN)
      .text(`Amendment of snapshot #${amendment.amends}, filed ${amendment.original.filedAt?.slice(0, 10) ?? "—"}`);
  }
  doc.moveDown(0.3).font("semibold").fontSize(18).fillColor(INK).text(`${s.entityName} (${s.entity})`);
  doc
    .font("regular")
    .fontSize(12)
    .text(`${quarterLabel(s.quarterEnd)}: ${quarterStart(s.quarterEnd)} to ${s.quarterEnd}`);
  doc
    .moveDown(0.4)
    .fontSize(9.5)
    .fillColor(signedOff ? INK : WARN);
  const signatories = extras.signatories ?? [];
  const nameOf = (email: string | null) => {
    const p = signatories.find((x) => x.email === email);
    return p ? `${p.name} (${p.title})` : (email ?? "—");
  };
  doc.text(
    signedOff
      ? `Signed off: approved by ${nameOf(s.approvedBy)} on ${when(s.approvedAt)}${filed ? "; filed with the supervisor" : ""}.`
      : `Not signed off (${s.status}): these figures are a working copy and must not be filed.`,
    left,
    doc.y,
    { width },
  );

  if (amendment) drawAmendment(L, amendment, cur);

  const effectiveFrom = f.determination?.effectiveFrom;
  L.heading("Determination at the quarter end");
  L.pairs([
    ["Status", `${s.status.charAt(0).toUpperCase()}${s.status.slice(1)} (snapshot #${s.id})`],
    ["Rule set", `${rules.label}, exceptions counted on ${basisWords}`],
    [
      "Determined on",
      `${f.asOf}, the last business day of the quarter, over ${f.window.observations} observations (${f.window.start ?? "—"} to ${f.window.end ?? "—"})${f.window.complete ? "" : ": a short window, so provisional"}`,
    ],
    [
      "Counted exceptions",
      `${f.exceptions.counted}${f.exceptions.excluded ? ` (${f.exceptions.excluded} disregarded with the supervisor's approval)` : ""}; actual ${f.exceptions.actual}, hypothetical ${f.exceptions.hypothetical}`,
    ],
    ["Traffic-light zone", `${ZONE_WORDS[f.zone]}${f.zoneLabel.toLowerCase() !== f.zone ? ` (${f.zoneLabel})` : ""}`],
    [
      "Multiplier in force",
      `${factor(f.multiplier)}${effectiveFrom ? ` from ${effectiveFrom} until the next determination` : ""}`,
    ],
    ["Capital requirement", amount(f.capital, cur)],
  ]);

  // ── The determination, formula filled in ────────────────────────────────────────────────
  L.heading("How the multiplier follows from the count");
  L.paragraph(
    `Counted exceptions: ${f.exceptions.counted} in ${f.window.observations} observations on ${basisWords}. If the model is right, ${f.expected.toFixed(2)} are expected (${f.window.observations} × 0.01). The probability of ${f.exceptions.counted} or fewer under the binomial distribution is ${percent(f.cumulativeProbability)}, which puts the count in the ${ZONE_WORDS[f.zone].toLowerCase()} zone (${rules.zoneBoundariesCitation}).`,
  );
  const base = f.determination?.baseMultiplier;
  const floor = f.settings?.multiplierFloor ?? null;
  const formula = (name: string, addend: number, result: number) =>
    base === undefined
      ? `${name} = ${factor(result)} (plus factor ${factor(f.plusFactor)}, addend ${factor(addend)})`
      : `${name} = ${floor !== null ? "max(" : ""}base ${factor(base)} + plus factor ${factor(f.plusFactor)} + qualitative addend ${factor(addend)}${floor !== null ? `, floor ${factor(floor)})` : ""} = ${factor(result)}`;
  L.paragraph(formula("Multiplier m_c", f.qualitativeAddend, f.multiplier), { font: "semibold" });
  if (f.multiplierSvar !== undefined && rules.capitalFormula === "var-svar") {
    L.paragraph(
      formula("Stressed multiplier m_s", f.settings?.qualitativeAddendSvar ?? f.qualitativeAddend, f.multiplierSvar),
      { font: "semibold" },
    );
  }
  L.paragraph(
    `The plus factor for ${f.exceptions.counted} exceptions: ${rules.plusFactorsCitation}.${f.settings ? ` Supervisory settings: ${f.settings.reference}, in force from ${f.settings.effectiveFrom}.` : ""}`,
    { colour: MUTED, size: 8.5 },
  );

  // ── Exceptions ─────────────────────────────────────────────────────────────────────────────
  L.heading(`Exceptions in the window (${f.exceptionDates.length})`);
  if (!f.exceptionDetail) {
    L.paragraph(f.exceptionDates.length ? f.exceptionDates.join(" · ") : "None.");
    L.paragraph(
      "This snapshot was prepared before the pack kept each exception's amounts; prepare it again to see them.",
      {
        colour: MUTED,
        size: 8.5,
      },
    );
  } else if (f.exceptionDetail.length === 0) {
    L.paragraph("No exceptions in the window.");
  } else {
    L.paragraph(
      `An exception is a day whose loss exceeds the one-day 99% VaR; the excess is the loss beyond VaR. Amounts in ${cur}.`,
      { colour: MUTED, size: 8.5 },
    );
    const columns: Column[] = [
      { header: "Date", width: 60 },
      { header: "Actual P&L", width: 60, align: "right" },
      { header: "Hypothetical P&L", width: 64, align: "right" },
      { header: "VaR 99%", width: 54, align: "right" },
      { header: "Excess (actual)", width: 56, align: "right" },
      { header: "Excess (hyp.)", width: 56, align: "right" },
      { header: "Exception on", width: 56 },
      { header: "Cause", width: width - 406 },
    ];
    L.table(
      columns,
      f.exceptionDetail.map((e) => ({
        cells: [
          e.date,
          amount(e.actualPnl),
          amount(e.hypotheticalPnl),
          amount(e.var99),
          e.actual ? amount(e.excessActual) : "—",
          e.hypothetical ? amount(e.excessHypothetical) : "—",
          `${[e.actual ? "actual" : null, e.hypothetical ? "hyp." : null].filter(Boolean).join(", ")}${e.excluded ? " (excluded)" : ""}`,
          e.cause ? causeLabels[e.cause] : "Not reviewed",
        ],
        note: `${e.narrative ? `Explanation: ${e.narrative}` : "No explanation recorded when the figures were prepared."} Supervisor: ${decisionWords(e)}`,
        noteColour: e.narrative ? INK : WARN,
      })),
    );
  }

  // ── Tests ──────────────────────────────────────────────────────────────────────────────────
  L.heading("Statistical tests, in plain words");
  if (!f.tests) {
    L.paragraph("This snapshot was prepared before the pack kept the statistical tests.", { colour: MUTED });
  } else {
    const t = f.tests;
    const line = (name: string, question: string, o: typeof t.kupiec) =>
      L.pairs(
        [[name, `${question} ${o.verdict} (statistic ${o.statistic.toFixed(2)}, p-value ${o.pValue.toFixed(3)})`]],
        150,
      );
    L.paragraph(`On ${t.series} P&L over the window, each at the 5% significance level:`, { colour: MUTED, size: 8.5 });
    line("Number of exceptions (Kupiec)", "Does the exception rate match 1%?", t.kupiec);
    line("Clustering (Christoffersen)", "Does an exception make one the next day more likely?", t.independence);
    line("Number and timing together", "Both questions at once:", t.conditionalCoverage);
    L.pairs(
      [
        [
          "Traffic light",
          `${f.exceptions.counted} counted exceptions against ${f.expected.toFixed(2)} expected: P(X ≤ ${f.exceptions.counted}) = ${percent(f.cumulativeProbability)}, ${ZONE_WORDS[f.zone].toLowerCase()} zone.`,
        ],
      ],
      150,
    );
  }

  // ── Chart ──────────────────────────────────────────────────────────────────────────────────
  L.heading("Daily P&L against VaR over the window", 260);
  if (f.days) drawPnlVarChart(L, f.days, f.exceptionDetail ?? [], cur);
  else L.paragraph("This snapshot was prepared before the pack kept the window's daily figures.", { colour: MUTED });

  // ── Capital ────────────────────────────────────────────────────────────────────────────────
  L.heading("Capital inputs and result");
  const c = f.capitalDetail;
  if (c === undefined && f.capital !== null) {
    // A snapshot prepared before the pack kept the formula's inputs: the result alone.
    L.pairs([["Capital requirement", amount(f.capital, cur)]]);
  } else if (!c) {
    L.paragraph(f.capitalNote ?? "No capital figure.", { colour: MUTED });
  } else if (c.formula === "es-ses") {
    L.pairs([
      ["Figures of the day (t−1)", c.previousDate],
      ["Averaged over", `${c.averagedObservations} business days`],
      ["IMCC (ES) previous / 60-day average", `${amount(c.esPrev, cur)} / ${amount(c.esAvg60, cur)}`],
      ["SES previous / 60-day average", `${amount(c.sesPrev, cur)} / ${amount(c.sesAvg60, cur)}`],
    ]);
    L.paragraph(
      `Requirement = max(IMCC_t−1 + SES_t−1, m_c × IMCC_avg + SES_avg) = max(${amount(c.esPrev)} + ${amount(c.sesPrev)}, ${factor(f.multiplier)} × ${amount(c.esAvg60)} + ${amount(c.sesAvg60)}) = ${amount(f.capital, cur)} (the ${c.binding === "average" ? "average" : "previous day's"} side binds).`,
      { font: "semibold" },
    );
  } else {
    const ms = f.multiplierSvar ?? f.multiplier;
    L.pairs([
      ["Figures of the day (t−1)", c.previousDate],
      ["Averaged over", `${c.averagedObservations} business days`],
      ["VaR (10-day, 99%) previous / 60-day average", `${amount(c.varPrev, cur)} / ${amount(c.varAvg60, cur)}`],
      [
        "Stressed VaR previous / average",
        `${amount(c.svarPrev, cur)} / ${amount(c.svarAvg60, cur)}${c.svarWeeks !== null ? ` (over ${c.svarWeeks} weekly measures)` : ""}`,
      ],
    ]);
    L.paragraph(
      `Requirement = max(VaR_t−1, m_c × VaR_avg) + max(sVaR_t−1, m_s × sVaR_avg) = max(${amount(c.varPrev)}, ${factor(f.multiplier)} × ${amount(c.varAvg60)}) + max(${amount(c.svarPrev)}, ${factor(ms)} × ${amount(c.svarAvg60)}) = ${amount(c.varTerm)} + ${amount(c.svarTerm)} = ${amount(f.capital, cur)}`,
      { font: "semibold" },
    );
  }
  if (f.capital !== null) L.pairs([["Of which the plus factor adds", amount(f.addOn, cur)]]);
  if (f.frtb) {
    const a = f.frtb;
    L.paragraph(
      `Aggregate capital (MAR33.45) = min(IMA_G,A + surcharge + C_U, SA all desks) + max(0, IMA_G,A − SA_G,A) = min(${amount(a.imaGA)} + ${amount(a.surcharge)} + ${amount(a.cU)}, ${amount(a.saAll)}) + max(0, ${amount(a.imaGA)} − ${amount(a.saGA)}) = ${amount(a.acrTotal, cur)}`,
      { font: "semibold" },
    );
    L.pairs([
      ["C_A (IMCC and SES)", amount(a.ca, cur)],
      ["Default risk charge", amount(a.drc, cur)],
      ["IMA_G,A (C_A + DRC)", amount(a.imaGA, cur)],
      ["C_U (desks out of the model)", amount(a.cU, cur)],
      ["Surcharge for amber desks", `${amount(a.surcharge, cur)} (k = ${a.k})`],
    ]);
    for (const n of a.notes) L.paragraph(n, { colour: MUTED, size: 8.5 });
  } else if (f.frtbNote) L.paragraph(f.frtbNote, { colour: MUTED, size: 8.5 });
  if (c) {
    L.paragraph(`Formula: ${rules.capitalCitation}.`, { colour: MUTED, size: 8.5 });
    for (const w of c.warnings) L.paragraph(w, { colour: WARN, size: 8.5 });
  }

  // ── Desks ──────────────────────────────────────────────────────────────────────────────────
  if (f.desks.length) {
    L.heading("Trading desks (FRTB): backtesting and P&L attribution");
    L.table(
      [
        { header: "Desk", width: 110 },
        { header: "Exceptions at 99%", width: 62, align: "right" },
        { header: "Exceptions at 97.5%", width: 66, align: "right" },
        { header: "Backtesting", width: 60 },
        { header: "P&L attribution", width: 62 },
        { header: "What follows", width: width - 360 },
      ],
      f.desks.map((d) => ({
        cells: [
          d.portfolio,
          String(d.exceptions99),
          String(d.exceptions975),
          d.passes ? "Passes" : "Fails",
          d.plaZone ? `${d.plaZone.charAt(0).toUpperCase()}${d.plaZone.slice(1)}` : "Not available",
          !d.passes || d.plaZone === "red"
            ? "Capital on the standardised approach (MAR32)"
            : d.plaZone === "amber"
              ? "Internal model, with the capital surcharge (MAR33.45)"
              : d.plaZone === "green"
                ? "Internal model"
                : "Internal model if P&L attribution is shown",
        ],
      })),
    );
  }

  // ── Return data ────────────────────────────────────────────────────────────────────────────
  L.heading("Return data", 80);
  const ret = returnData(f, s.quarterEnd);
  L.paragraph(
    `What the quarter's supervisory return and disclosure take from this snapshot, with the template row where the standard names one. Amounts in ${cur}; “not entered” is a value the product does not hold and the analyst has not entered yet.`,
    { colour: MUTED, size: 8.5 },
  );
  L.table(
    [
      { header: "Template row", width: 92 },
      { header: "Field", width: 190 },
      { header: "Value", width: 72, align: "right" },
      { header: "Source", width: width - 354 },
    ],
    ret.fields.map((x) => ({
      cells: [
        x.templateRow ?? "—",
        x.label,
        x.value === null
          ? x.analystInput
            ? "not entered"
            : "—"
          : x.unit === "amount"
            ? amount2(x.value)
            : x.unit === "factor"
              ? factor(x.value)
              : String(x.value),
        x.source,
      ],
    })),
  );

  if (s.restatedAfterSignOff) {
    L.heading("Changed after sign-off");
    L.paragraph(`${s.restatedAfterSignOff.detail} The figures above are as approved.`, { colour: WARN });
  }

  // ── Seal ───────────────────────────────────────────────────────────────────────────────────
  L.heading("Seal", 120);
  L.hash("Snapshot hash (SHA-256 chain signature)", s.hash, "None yet: the snapshot is not signed off.");
  L.hash(
    "Previous snapshot hash",
    s.hash ? s.prevHash : null,
    s.hash ? "None: the first signed-off quarter of the entity." : "—",
  );
  L.hash("Inputs SHA-256 (the window's daily data, approved exclusions, settings)", s.inputsSha256, "—");
  L.pairs([["Engine version", s.engineVersion]]);

  // ── Signatories ────────────────────────────────────────────────────────────────────────────
  L.heading("Signatories", 110);
  if (signatories.length === 0) L.paragraph("No one has signed yet.", { colour: MUTED });
  else
    L.table(
      [
        { header: "", width: 80 },
        { header: "Name", width: 130 },
        { header: "Title", width: 130 },
        { header: "Date", width: width - 340 },
      ],
      signatories.map((p) => ({ cells: [p.act, p.name, p.title, when(p.at)] })),
    );

  // ── Attestation (filed) or the caution ─────────────────────────────────────────────────────
  if (filed) {
    const preparer = signatories.find((p) => p.act === "Prepared by");
    const approver = signatories.find((p) => p.act === "Approved by");
    const who = (p?: Signatory) => (p ? `${p.name}, ${p.title}` : "—");
    L.heading("Attestation", 130);
    L.paragraph(
      `${s.entityName} files this pack as its record of the backtesting of its internal market-risk model for ${quarterLabel(s.quarterEnd)}. The figures were prepared by ${who(preparer)}, and approved by ${who(approver)} on ${when(s.approvedAt)}; they were computed by Quartermark engine ${s.engineVersion} from the data sealed by the inputs hash above, and have not changed since approval.${amendment ? ` This pack amends the filing of snapshot #${amendment.amends}, which stands unchanged; its before and after is under “What this amendment changes”.` : ""}`,
    );
    L.pairs([
      ...(amendment
        ? ([
            [
              "Amends",
              `Snapshot #${amendment.amends}, filed ${when(amendment.original.filedAt)}${amendment.original.filedBy ? ` by ${amendment.original.filedBy}` : ""}`,
            ],
          ] as [string, string][])
        : []),
      ["Prepared by", who(preparer)],
      ["Approved by", who(approver)],
      ["Engine version", s.engineVersion],
      [
        "Rules applied",
        `${rules.label}: ${rules.citation}; zones ${rules.zoneBoundariesCitation}; plus factor ${rules.plusFactorsCitation}; capital ${rules.capitalCitation}${f.settings ? `; supervisory settings ${f.settings.reference}` : ""}.`,
      ],
    ]);
  }

  L.heading("Sign-off record", 60);
  for (const e of s.history) {
    L.paragraph(`${when(e.at)} · ${nameOf(e.by)} · ${e.action}${e.comment ? `: ${e.comment}` : ""}`, { size: 9 });
  }

  // ── Every page: DRAFT, the running head, the caution or the filed line, the page number ────
  const footer = filed
    ? `Filed record of ${s.entityName}, ${quarterLabel(s.quarterEnd)}, snapshot #${s.id}: attested under “Attestation” in this pack.`
    : CAUTION;
  L.stampPages(footer, () => {
    if (!signedOff) drawWatermark(doc, "DRAFT");
    doc
      .font("regular")
      .fontSize(7.5)
      .fillColor(signedOff ? MUTED : WARN)
      .text(
        `${signedOff ? "" : "DRAFT · "}${amendment ? `AMENDMENT of snapshot #${amendment.amends} · ` : ""}${s.entity} · ${quarterLabel(s.quarterEnd)} backtesting pack · snapshot #${s.id}`,
        left,
        32,
        { width, lineBreak: false },
      );
    doc.font("regular").fontSize(7.5).fillColor(MUTED);
  });
  doc.end();
  return done;
}
