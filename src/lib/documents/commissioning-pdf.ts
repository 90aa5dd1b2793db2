// The householder's commissioning record as a PDF (pdf-lib, standard fonts, A4). It says what was
// fitted, how it is set up, what was checked and by whom, with the safety cautions.
import { PDFDocument, StandardFonts, rgb, type PDFFont, type PDFPage } from 'pdf-lib';
import type { RecordView } from '../commissioning/record';

const A4: [number, number] = [595.28, 841.89];
const MARGIN = 50;
const INK = rgb(0.08, 0.14, 0.17);
const MUTED = rgb(0.4, 0.46, 0.5);
const TIDE = rgb(0.11, 0.44, 0.42);

/**
 * The standard PDF fonts cover WinAnsi only: write the few symbols outside it in words
 * (° and · are inside it).
 */
export function pdfText(s: string): string {
  return s
    .replace(/kΩ/g, 'kohm')
    .replace(/Ω/g, 'ohm')
    .replace(/[−–—]/g, '-')
    .replace(/≈/g, '~')
    .replace(/×/g, 'x')
    .replace(/⁻¹/g, '^-1')
    .replace(/[‘’]/g, "'")
    .replace(/[“”]/g, '"')
    .replace(/…/g, '...')
    .replace(/[^\x20-\x7e\xa0-\xff]/g, '?');
}

class Writer {
  page!: PDFPage;
  y = 0;
  constructor(
    private doc: PDFDocument,
    private regular: PDFFont,
    private bold: PDFFont,
  ) {
    this.newPage();
  }

  newPage() {
    this.page = this.doc.addPage(A4);
    this.y = A4[1] - MARGIN;
  }

  private room(h: number) {
    if (this.y - h < MARGIN) this.newPage();
  }

  /** Wraps `text` to the page width and writes it. */
  para(
    text: string,
    opts: { size?: number; bold?: boolean; color?: ReturnType<typeof rgb>; indent?: number; gap?: number } = {},
  ) {
    const size = opts.size ?? 10;
    const font = opts.bold ? this.bold : this.regular;
    const width = A4[0] - 2 * MARGIN - (opts.indent ?? 0);
    const words = pdfText(text).split(/\s+/);
    let line = '';
    const lines: string[] = [];
    for (const w of words) {
      const next = line ? `${line} ${w}` : w;
      if (font.widthOfTextAtSize(next, size) > width && line) {
        lines.push(line);
        line = w;
      } else line = next;
    }
    if (line) lines.push(line);
    for (const l of lines) {
      this.room(size + 4);
      this.page.drawText(l, { x: MARGIN + (opts.indent ?? 0), y: this.y - size, size, font, color: opts.color ?? INK });
      this.y -= size + 4;
    }
    this.y -= opts.gap ?? 2;
  }

  heading(text: string) {
    this.room(40);
    this.y -= 8;
    this.para(text, { size: 13, bold: true, color: TIDE, gap: 4 });
  }

  /** A label and its value on one line (the value wraps under itself). */
  row(label: string, value: string) {
    const size = 10;
    this.room(size + 4);
    this.page.drawText(pdfText(label), { x: MARGIN, y: this.y - size, size, font: this.bold, color: MUTED });
    const x = MARGIN + 170;
    const width = A4[0] - MARGIN - x;
    const words = pdfText(value).split(/\s+/);
    let line = '';
    for (const w of words) {
      const next = line ? `${line} ${w}` : w;
      if (this.regular.widthOfTextAtSize(next, size) > width && line) {
        this.page.drawText(line, { x, y: this.y - size, size, font: this.regular, color: INK });
        this.y -= size + 4;
        this.room(size + 4);
        line = w;
      } else line = next;
    }
    this.page.drawText(line, { x, y: this.y - size, size, font: this.regular, color: INK });
    this.y -= size + 6;
  }
}

/** The PDF bytes of a signed commissioning record. */
export async function commissioningPdf(view: RecordView): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  doc.setTitle(`Commissioning record ${view.serial}`);
  doc.setAuthor(view.companyName);
  doc.setCreator('Heatlayer');
  doc.setCreationDate(new Date(view.signedAt));
  const w = new Writer(
    doc,
    await doc.embedFont(StandardFonts.Helvetica),
    await doc.embedFont(StandardFonts.HelveticaBold),
  );

  w.para('Hot-water cylinder commissioning record', { size: 18, bold: true, gap: 2 });
  w.para(`${view.companyName} · record ${view.recordId.slice(0, 8)} · signed ${view.signedAtText}`, {
    color: MUTED,
    gap: 6,
  });

  for (const section of view.sections) {
    w.heading(section.title);
    for (const [label, value] of section.rows) w.row(label, value);
    for (const note of section.notes ?? []) w.para(note, { size: 9, color: MUTED });
  }

  w.heading('Safety');
  for (const caution of view.cautions) w.para(caution, { size: 9 });
  // A plain cross-reference table (no object streams): readable by older viewers, and quicker to write.
  return doc.save({ useObjectStreams: false });
}
