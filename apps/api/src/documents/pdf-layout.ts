// A small flow layout over pdfkit: a cursor that moves down the page, tables whose rows are measured
// before they are drawn (so a row never splits and the header repeats on the next page), and page
// furniture added once every page exists.
import { FONT_REGULAR, FONT_SEMIBOLD } from './fonts.js';

export const INK = '#1d232b';
export const MUTED = '#5a6572';
export const HAIRLINE = '#c7ccd3';
export const SHADE = '#eef1f4';
export const ACCENT = '#1f5f8b';
export const WARN = '#8a1f1f';

export type TextStyle = { size: number; bold?: boolean; color?: string };

export type Cell = string | { text: string; bold?: boolean; color?: string };
export type Row = { cells: Cell[]; shade?: boolean } | { span: Cell; shade?: boolean };
export type Column = { header: string; share: number };

const cellText = (c: Cell): string => (typeof c === 'string' ? c : c.text);

export class FlowLayout {
  readonly left: number;
  readonly right: number;
  readonly width: number;
  readonly top: number;
  readonly bottom: number;
  y: number;

  constructor(
    readonly doc: PDFKit.PDFDocument,
    private readonly onNewPage: (layout: FlowLayout) => void,
  ) {
    const { margins, width, height } = doc.page;
    this.left = margins.left;
    this.right = width - margins.right;
    this.width = this.right - this.left;
    this.top = margins.top;
    this.bottom = height - margins.bottom;
    this.y = this.top;
  }

  style(s: TextStyle): PDFKit.PDFDocument {
    return this.doc
      .font(s.bold ? FONT_SEMIBOLD : FONT_REGULAR)
      .fontSize(s.size)
      .fillColor(s.color ?? INK);
  }

  private readonly lineHeights = new Map<string, number>();

  heightOf(text: string, s: TextStyle, width: number): number {
    const doc = this.style(s);
    // Text that fits on one line is one line high whatever it says: measured once per style, since
    // laying out every cell of a long table again was most of the time a large report took.
    if (text !== '' && !text.includes('\n') && doc.widthOfString(text) <= width) {
      const key = `${s.size}|${s.bold ? 1 : 0}`;
      let h = this.lineHeights.get(key);
      if (h === undefined) this.lineHeights.set(key, (h = doc.heightOfString('Hg', { width, lineGap: 1 })));
      return h;
    }
    return doc.heightOfString(text, { width, lineGap: 1 });
  }

  newPage(): void {
    this.doc.addPage();
    this.y = this.top;
    this.onNewPage(this);
  }

  /** Starts a new page unless `height` still fits below the cursor. */
  ensure(height: number): void {
    if (this.y + height > this.bottom) this.newPage();
  }

  gap(height: number): void {
    this.y += height;
  }

  /** Text across the full width (or from `x` over `width`), moving the cursor below it. */
  text(text: string, s: TextStyle, opts: { x?: number; width?: number; keep?: boolean } = {}): void {
    const x = opts.x ?? this.left;
    const width = opts.width ?? this.right - x;
    const h = this.heightOf(text, s, width);
    if (opts.keep !== false) this.ensure(h);
    this.style(s).text(text, x, this.y, { width, lineGap: 1 });
    this.y += h;
  }

  rule(color = HAIRLINE, weight = 0.6): void {
    this.doc
      .save()
      .moveTo(this.left, this.y)
      .lineTo(this.right, this.y)
      .lineWidth(weight)
      .strokeColor(color)
      .stroke()
      .restore();
  }

  /** A section title with a short accent bar; kept with at least `keepWith` points of what follows. */
  heading(title: string, keepWith = 60): void {
    this.ensure(22 + keepWith);
    this.gap(10);
    this.doc
      .save()
      .rect(this.left, this.y + 1, 3, 11)
      .fill(ACCENT)
      .restore();
    this.style({ size: 11, bold: true }).text(title, this.left + 9, this.y, { lineBreak: false });
    this.y += 18;
  }

  /** A table whose rows never split across pages; the header row repeats after each break. */
  table(columns: Column[], rows: Row[], s: TextStyle = { size: 8.5 }): void {
    const pad = 3.5;
    const total = columns.reduce((sum, c) => sum + c.share, 0);
    const widths = columns.map((c) => (c.share / total) * this.width);
    const xs = widths.map((_, i) => this.left + widths.slice(0, i).reduce((a, b) => a + b, 0));
    const headStyle: TextStyle = { size: s.size - 0.5, bold: true, color: MUTED };

    const cellStyle = (c: Cell): TextStyle =>
      typeof c === 'string' ? s : { size: s.size, bold: c.bold, color: c.color };
    const rowHeight = (row: Row): number =>
      'span' in row
        ? this.heightOf(cellText(row.span), cellStyle(row.span), this.width - 2 * pad) + 2 * pad
        : Math.max(
            ...row.cells.map((c, i) => this.heightOf(cellText(c), cellStyle(c), (widths[i] ?? 0) - 2 * pad)),
          ) +
          2 * pad;
    const headHeight =
      Math.max(...columns.map((c, i) => this.heightOf(c.header, headStyle, (widths[i] ?? 0) - 2 * pad))) +
      2 * pad;

    const drawHead = (): void => {
      this.doc.save().rect(this.left, this.y, this.width, headHeight).fill(SHADE).restore();
      columns.forEach((c, i) => {
        this.style(headStyle).text(c.header, (xs[i] ?? 0) + pad, this.y + pad, {
          width: (widths[i] ?? 0) - 2 * pad,
          lineGap: 1,
        });
      });
      this.y += headHeight;
      this.rule(HAIRLINE);
    };

    const first = rows[0];
    this.ensure(headHeight + (first ? rowHeight(first) : 0));
    drawHead();
    for (const row of rows) {
      const h = rowHeight(row);
      if (this.y + h > this.bottom) {
        this.newPage();
        drawHead();
      }
      if (row.shade) this.doc.save().rect(this.left, this.y, this.width, h).fill('#f7f8fa').restore();
      if ('span' in row) {
        this.style(cellStyle(row.span)).text(cellText(row.span), this.left + pad, this.y + pad, {
          width: this.width - 2 * pad,
          lineGap: 1,
        });
      } else {
        row.cells.forEach((c, i) => {
          const text = cellText(c);
          const width = (widths[i] ?? 0) - 2 * pad;
          const doc = this.style(cellStyle(c));
          // A cell that fits on one line is written without the line wrapper (same place, less work).
          const oneLine = text !== '' && !text.includes('\n') && doc.widthOfString(text) <= width;
          doc.text(text, (xs[i] ?? 0) + pad, this.y + pad, { width, lineGap: 1, lineBreak: !oneLine });
        });
      }
      this.y += h;
      this.rule(HAIRLINE, 0.4);
    }
  }
}

/**
 * Writes the same furniture (header line, footer, page numbers) on every page once all pages exist.
 * The document must be created with `bufferPages: true`.
 */
export function stampPages(doc: PDFKit.PDFDocument, draw: (page: number, pages: number) => void): void {
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    // Writing inside the bottom margin would otherwise make pdfkit open a new page.
    const bottom = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    draw(i - range.start + 1, range.count);
    doc.page.margins.bottom = bottom;
  }
}
