import { PDFDocument, StandardFonts, rgb, type PDFFont, type PDFPage } from "pdf-lib";
import type { ReportData } from "./summary";

// The standard PDF fonts only cover WinAnsi; anything else is spelled in ASCII rather than failing the whole report.
const REPLACEMENTS: Record<string, string> = { "≥": ">=", "≤": "<=", "→": "->", "−": "-", "\u2009": " " };
export function winAnsi(text: string): string {
  return text.replace(/[^\x20-\x7E\xA0-\xFF\u2013\u2014\u2018\u2019\u201C\u201D\u2022]/g, (c) => REPLACEMENTS[c] ?? "?");
}

const A4: [number, number] = [595.28, 841.89];
const MARGIN = 48;
const INK = rgb(0.11, 0.16, 0.19);
const SOFT = rgb(0.35, 0.4, 0.43);

class Writer {
  page: PDFPage;
  y: number;
  constructor(
    private readonly doc: PDFDocument,
    readonly regular: PDFFont,
    readonly bold: PDFFont,
  ) {
    this.page = doc.addPage(A4);
    this.y = A4[1] - MARGIN;
  }

  ensure(height: number) {
    if (this.y - height < MARGIN) {
      this.page = this.doc.addPage(A4);
      this.y = A4[1] - MARGIN;
    }
  }

  wrap(text: string, font: PDFFont, size: number, width: number): string[] {
    const lines: string[] = [];
    for (const paragraph of winAnsi(text).split("\n")) {
      let line = "";
      for (const word of paragraph.split(/\s+/)) {
        const next = line ? `${line} ${word}` : word;
        if (font.widthOfTextAtSize(next, size) > width && line) {
          lines.push(line);
          line = word;
        } else line = next;
      }
      lines.push(line);
    }
    return lines;
  }

  text(text: string, opts: { size?: number; bold?: boolean; color?: ReturnType<typeof rgb>; x?: number; width?: number; gap?: number } = {}) {
    const size = opts.size ?? 9.5;
    const font = opts.bold ? this.bold : this.regular;
    const x = opts.x ?? MARGIN;
    for (const line of this.wrap(text, font, size, opts.width ?? A4[0] - x - MARGIN)) {
      this.ensure(size * 1.35);
      this.page.drawText(line, { x, y: this.y - size, size, font, color: opts.color ?? INK });
      this.y -= size * 1.35;
    }
    this.y -= opts.gap ?? 2;
  }

  heading(text: string) {
    this.y -= 6;
    this.text(text, { size: 12, bold: true, gap: 4 });
  }

  /** A table row: each cell wraps inside its column, the row is as tall as its tallest cell. */
  row(cells: string[], widths: number[], opts: { bold?: boolean; size?: number } = {}) {
    const size = opts.size ?? 8;
    const font = opts.bold ? this.bold : this.regular;
    const wrapped = cells.map((c, i) => this.wrap(c, font, size, widths[i] - 4));
    const height = Math.max(...wrapped.map((w) => w.length)) * size * 1.3 + 3;
    this.ensure(height);
    let x = MARGIN;
    wrapped.forEach((lines, i) => {
      lines.forEach((line, j) => this.page.drawText(line, { x, y: this.y - size - j * size * 1.3, size, font, color: INK }));
      x += widths[i];
    });
    this.y -= height;
    this.page.drawLine({ start: { x: MARGIN, y: this.y + 1 }, end: { x: A4[0] - MARGIN, y: this.y + 1 }, thickness: 0.3, color: SOFT });
  }
}

/** The evaluation summary as an A4 PDF with selectable text. */
export async function reportPdf(report: ReportData): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  doc.setTitle(winAnsi(`${report.title}: ${report.clientName}`));
  doc.setSubject("Evaluation summary for the medical record");
  doc.setProducer("Kinarc");
  doc.setCreationDate(new Date(`${report.preparedOn}T12:00:00Z`));
  const w = new Writer(doc, await doc.embedFont(StandardFonts.Helvetica), await doc.embedFont(StandardFonts.HelveticaBold));

  w.text(report.clinicName, { size: 10, color: SOFT });
  w.text(report.title, { size: 15, bold: true, gap: 6 });
  w.text(`Client: ${report.clientName}    Born: ${report.dateOfBirth}    Prepared: ${report.preparedOn}`);
  w.text(`Referring physician: ${report.referringPhysician || "-"}`);
  if (report.diagnosisNote) w.text(`Reason for referral: ${report.diagnosisNote}`);

  w.heading("Precautions");
  w.text(report.precautions.length ? report.precautions.join("; ") : "None on file.");

  w.heading("Range and grades");
  const widths = [80, 30, 52, 66, 36, 40, 66, 62, 67];
  w.row(["Motion", "Side", "Best peak", "Reference", "Other side", "Grade", "How obtained", "Signed", "Open in-person tests"], widths, { bold: true });
  for (const r of report.rows) w.row([r.motion, r.side, r.peak, r.reference, r.otherSide, r.grade, r.how, r.signed, r.open], widths);
  if (report.rows.length === 0) w.text("No measurements recorded yet.");

  w.heading("Grip and pinch");
  if (report.strength.length === 0) w.text("No dynamometer or pinch-gauge readings recorded.");
  for (const s of report.strength) w.text(`${s.test}, ${s.side}: ${s.reading}. ${s.norm}.`);

  w.heading("How the measurements were obtained and how accurate they are");
  for (const note of report.accuracy) w.text(`• ${note}`, { gap: 3 });

  w.heading("Cautions");
  for (const c of report.cautions) w.text(`• ${c}`, { gap: 3 });
  return doc.save();
}
