/**
 * What every Vanbay PDF shares: the sheet sizes and margins, the daylight swatches, Space Grotesk,
 * the small primitives (type, labels, rules), the page break that repeats a running head, and the
 * footer with page numbers. Each document (invoice, estimate, diagnostic report) extends
 * SheetLayout and draws only its own sections.
 */
import PDFDocument from 'pdfkit';
import { FONT_BOLD, FONT_REGULAR, registerFonts } from './fonts';

export type Paper = 'letter' | 'a4';

/** Vanbay's daylight swatches (tailwind.config.ts): printed paper is read like the van door in sun. */
export const COLOUR = {
  ink: '#111417',
  soft: '#3b4148',
  rule: '#6a7079',
  ground: '#f3f0e8',
  coolant: '#0a5563',
  onCoolant: '#ffffff',
  pass: '#0f5424',
  fail: '#8f0e17',
} as const;

/** Sheet sizes in PostScript points: ISO 216 A4 is 210 × 297 mm, ANSI Letter 8.5 × 11 in (from memory). */
const SHEET: Record<Paper, string> = { letter: 'LETTER', a4: 'A4' };

const MARGIN = { top: 44, side: 48, bottom: 44 } as const;
/** Room kept at the foot of every page for the footer line and the page number. */
const FOOTER_ROOM = 30;

export interface SheetText {
  /** The PDF's own title, author and subject; its dates are when the document was made. */
  title: string;
  author: string;
  subject: string;
  generatedAt: Date;
  /** The head of every page after the first: the business and "Invoice 0042 (continued)". */
  business: string;
  continued: string;
  /** The footer's words beside the page number; null for none. */
  footer: string | null;
}

export abstract class SheetLayout {
  protected readonly doc: PDFKit.PDFDocument;
  protected readonly left: number = MARGIN.side;
  protected readonly width: number;
  /** Where the footer's room begins: nothing is drawn below it but the footer. */
  protected readonly bottom: number;
  protected y: number = MARGIN.top;
  private readonly sheet: SheetText;

  constructor(paper: Paper, sheet: SheetText) {
    this.sheet = sheet;
    this.doc = new PDFDocument({
      size: SHEET[paper],
      margins: { top: MARGIN.top, left: MARGIN.side, right: MARGIN.side, bottom: MARGIN.bottom },
      bufferPages: true,
      info: {
        Title: sheet.title,
        Author: sheet.author,
        Subject: sheet.subject,
        CreationDate: sheet.generatedAt,
        ModDate: sheet.generatedAt,
      },
    });
    registerFonts(this.doc);
    this.width = this.doc.page.width - 2 * MARGIN.side;
    this.bottom = this.doc.page.height - MARGIN.bottom - FOOTER_ROOM;
  }

  /** The document's own sections, top to bottom; the footers follow on every page. */
  protected abstract draw(): void;

  render(): Promise<Buffer> {
    const chunks: Buffer[] = [];
    const done = new Promise<Buffer>((resolve, reject) => {
      this.doc.on('data', (chunk: Buffer) => chunks.push(chunk));
      this.doc.on('end', () => resolve(Buffer.concat(chunks)));
      this.doc.on('error', reject);
    });
    this.draw();
    this.footers();
    this.doc.end();
    return done;
  }

  protected font(bold: boolean, size: number, colour: string = COLOUR.ink): PDFKit.PDFDocument {
    return this.doc
      .font(bold ? FONT_BOLD : FONT_REGULAR)
      .fontSize(size)
      .fillColor(colour);
  }

  /** A small spaced capital label over a block; answers where the block may begin. */
  protected label(text: string, x: number, y: number, width: number): number {
    this.font(true, 7.5, COLOUR.soft).text(text.toUpperCase(), x, y, { width, characterSpacing: 0.9 });
    return this.doc.y + 3;
  }

  protected rule(y: number, colour: string, lineWidth: number, x = this.left, width = this.width): void {
    this.doc
      .moveTo(x, y)
      .lineTo(x + width, y)
      .lineWidth(lineWidth)
      .strokeColor(colour)
      .stroke();
  }

  /** Starts a new page when `height` more points would run into the footer; true when it did. */
  protected ensureRoom(height: number): boolean {
    if (this.y + height <= this.bottom) return false;
    this.doc.addPage();
    this.y = MARGIN.top;
    this.font(true, 9).text(this.sheet.business, this.left, this.y, { width: this.width / 2 });
    this.font(false, 9, COLOUR.soft).text(this.sheet.continued, this.left + this.width / 2, this.y, {
      width: this.width / 2,
      align: 'right',
    });
    this.y = this.doc.y + 6;
    this.rule(this.y, COLOUR.coolant, 1.5);
    this.y += 14;
    return true;
  }

  private footers(): void {
    const range = this.doc.bufferedPageRange();
    for (let index = range.start; index < range.start + range.count; index += 1) {
      this.doc.switchToPage(index);
      // Writing below the bottom margin would make pdfkit open a page; the footer lives there.
      this.doc.page.margins.bottom = 0;
      const y = this.doc.page.height - MARGIN.bottom - 10;
      this.rule(y - 8, COLOUR.rule, 0.5);
      if (this.sheet.footer) {
        this.font(false, 8.5, COLOUR.soft).text(this.sheet.footer, this.left, y, {
          width: this.width - 90,
          lineBreak: false,
          ellipsis: '…',
        });
      }
      this.font(false, 8.5, COLOUR.soft).text(
        `Page ${index - range.start + 1} of ${range.count}`,
        this.left + this.width - 90,
        y,
        { width: 90, align: 'right', lineBreak: false },
      );
    }
  }
}
