import type PDFDocument from "pdfkit";

/** The pack's drawing kit: colours, number formats, headings, label/value pairs, tables and a page-break check. */

export const INK = "#1b2638";
export const MUTED = "#5e6a81";
export const RULE = "#d9d4c7";
export const WARN = "#9a3b2f";
export const ACCENT = "#2f5d8a";

type Doc = InstanceType<typeof PDFDocument>;

export const amount = (v: number | null | undefined, currency?: string) =>
  v == null
    ? "—"
    : `${v.toLocaleString("en-GB", { minimumFractionDigits: 0, maximumFractionDigits: 0 })}${currency ? ` ${currency}` : ""}`;
/** An amount with its cents, as a return reports it. */
export const amount2 = (v: number) => v.toLocaleString("en-GB", { minimumFractionDigits: 2, maximumFractionDigits: 2 });
export const factor = (v: number) => v.toFixed(2);
export const percent = (v: number) => `${(v * 100).toFixed(2)}%`;
export const when = (iso: string | null) => (iso ? `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC` : "—");

/** A sha256 in groups of eight, so a line can only break between groups. */
export const hashGroups = (hex: string) => hex.match(/.{1,8}/g)!.join(" ");

export interface Column {
  header: string;
  width: number;
  align?: "left" | "right";
}

export class PackLayout {
  readonly left: number;
  readonly width: number;
  constructor(readonly doc: Doc) {
    this.left = doc.page.margins.left;
    this.width = doc.page.width - this.left - doc.page.margins.right;
  }

  get bottom() {
    return this.doc.page.height - this.doc.page.margins.bottom;
  }

  /**
   * Once every page exists: on each, `head` draws what goes at the top, then the footer and
   * "Page n of N" go at the bottom, in the margin.
   */
  stampPages(footer: string, head: () => void) {
    const { doc, left, width } = this;
    const range = doc.bufferedPageRange();
    for (let i = range.start; i < range.start + range.count; i++) {
      doc.switchToPage(i);
      const bottom = this.bottom;
      doc.page.margins.bottom = 0; // writing in the margin must not start a new page
      doc.page.margins.top = 0;
      head();
      doc.text(footer, left, bottom + 18, { width: width - 70 });
      doc.text(`Page ${i - range.start + 1} of ${range.count}`, left + width - 60, bottom + 18, {
        width: 60,
        align: "right",
      });
    }
  }

  /** A line across the text width at `y` (the current line by default). */
  rule(lineWidth: number, colour: string, y = this.doc.y) {
    this.doc
      .moveTo(this.left, y)
      .lineTo(this.left + this.width, y)
      .lineWidth(lineWidth)
      .strokeColor(colour)
      .stroke();
  }

  /** Starts a new page when less than `height` points are left on this one. */
  room(height: number) {
    if (this.doc.y + height > this.bottom) this.doc.addPage();
  }

  heading(text: string, keepWith = 60) {
    const { doc } = this;
    this.room(keepWith + 30);
    doc.moveDown(0.8).font("semibold").fontSize(11.5).fillColor(INK).text(text, this.left);
    this.rule(0.5, RULE, doc.y + 2);
    doc.moveDown(0.5);
  }

  paragraph(text: string, options: { colour?: string; size?: number; font?: string } = {}) {
    const { doc } = this;
    doc
      .font(options.font ?? "regular")
      .fontSize(options.size ?? 9.5)
      .fillColor(options.colour ?? INK);
    this.room(doc.heightOfString(text, { width: this.width }));
    doc.text(text, this.left, doc.y, { width: this.width });
    doc.moveDown(0.3);
  }

  /** Rows of label → value in two columns. */
  pairs(rows: [string, string][], labelWidth = 190) {
    const { doc } = this;
    for (const [label, value] of rows) {
      doc.font("semibold").fontSize(9.5);
      const h = Math.max(
        doc.heightOfString(value, { width: this.width - labelWidth - 10 }),
        doc.font("regular").fontSize(9).heightOfString(label, { width: labelWidth }),
      );
      this.room(h + 4);
      const y = doc.y;
      doc.font("regular").fontSize(9).fillColor(MUTED).text(label, this.left, y, { width: labelWidth });
      doc
        .font("semibold")
        .fontSize(9.5)
        .fillColor(INK)
        .text(value, this.left + labelWidth + 10, y, { width: this.width - labelWidth - 10 });
      doc.y = y + h + 3;
    }
  }

  /** A label over a sha256 in the fixed-width font, grouped so no group is ever split. */
  hash(label: string, hex: string | null, otherwise: string) {
    const { doc } = this;
    this.room(30);
    doc.font("regular").fontSize(9).fillColor(MUTED).text(label, this.left, doc.y, { width: this.width });
    if (hex) doc.font("mono").fontSize(9).fillColor(INK).text(hashGroups(hex), this.left, doc.y, { width: this.width });
    else doc.font("semibold").fontSize(9.5).fillColor(INK).text(otherwise, this.left, doc.y, { width: this.width });
    doc.moveDown(0.35);
  }

  /**
   * A table: a header row, then each row's cells (wrapped in their column), and under a row an
   * optional full-width note (an exception's explanation). The header repeats on a new page.
   */
  table(columns: Column[], rows: { cells: string[]; note?: string; noteColour?: string }[]) {
    const { doc } = this;
    const pad = 3;
    const drawHeader = () => {
      const y = doc.y;
      doc.font("semibold").fontSize(8).fillColor(MUTED);
      const h = Math.max(...columns.map((c) => doc.heightOfString(c.header, { width: c.width - pad * 2 })));
      let x = this.left;
      for (const c of columns) {
        doc.text(c.header, x + pad, y, { width: c.width - pad * 2, align: c.align ?? "left" });
        x += c.width;
      }
      doc.y = y + h + 2;
      this.rule(0.75, INK);
      doc.y += 3;
    };
    this.room(40);
    drawHeader();
    for (const row of rows) {
      doc.font("regular").fontSize(8.5);
      const cellHeight = Math.max(
        ...row.cells.map((t, i) => doc.heightOfString(t, { width: columns[i].width - pad * 2 })),
      );
      const noteHeight = row.note ? doc.fontSize(8.5).heightOfString(row.note, { width: this.width - 24 }) + 2 : 0;
      if (doc.y + cellHeight + noteHeight + 6 > this.bottom) {
        doc.addPage();
        drawHeader();
      }
      const y = doc.y;
      let x = this.left;
      doc.font("regular").fontSize(8.5).fillColor(INK);
      row.cells.forEach((t, i) => {
        doc.text(t, x + pad, y, { width: columns[i].width - pad * 2, align: columns[i].align ?? "left" });
        x += columns[i].width;
      });
      doc.y = y + cellHeight + 1;
      if (row.note) {
        doc
          .font("regular")
          .fontSize(8.5)
          .fillColor(row.noteColour ?? MUTED)
          .text(row.note, this.left + 18, doc.y, { width: this.width - 24 });
      }
      doc.y += 3;
      this.rule(0.4, RULE);
      doc.y += 3;
    }
  }
}
