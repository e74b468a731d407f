// The welder's wallet card: two ID-1 pages (85.6 × 54 mm), front and back, for a card printer or for
// printing on plain paper and folding. Front: who the welder is and what they are qualified for on the
// issue date. Back: the QR code to the Verify page, which shows today's status.
import type { WalletCardData, WalletCardQualification } from './document-data.js';
import { CODE_NAMES, STATE_WORDS, formatDate } from './document-format.js';
import { FONT_REGULAR, FONT_SEMIBOLD, createDocument, documentBuffer } from './fonts.js';
import { ACCENT, HAIRLINE, INK, MUTED, WARN } from './pdf-layout.js';
import { qrCodePng } from './qr-code.js';

const MM = 72 / 25.4;
/** ISO/IEC 7810 ID-1, landscape. */
export const CARD_SIZE: [number, number] = [85.6 * MM, 54 * MM];

export const CARD_CAUTION =
  "Shows the qualifications on the issue date. Scan the code for today's status. The code edition in force, the company quality manual and the responsible inspector govern.";

const M = 9;

const positionsShort = (q: WalletCardQualification): string => {
  const list = (p: string[]): string => (p.length === 4 ? 'all' : p.length ? p.join(' ') : 'none');
  return `Groove ${list(q.positions.groove)}\nFillet ${list(q.positions.fillet)}`;
};

/** 'F-No. 1–4', 'F-No. 6', 'F-No. 1, 3': consecutive numbers as one run, to fit the card. */
export function fNumbersShort(fNumbers: number[]): string {
  const sorted = [...new Set(fNumbers)].sort((a, b) => a - b);
  if (sorted.length === 0) return 'none';
  const runs: string[] = [];
  let start = sorted[0] ?? 0;
  let prev = start;
  for (const n of [...sorted.slice(1), Number.NaN]) {
    if (n === prev + 1) {
      prev = n;
      continue;
    }
    runs.push(start === prev ? String(start) : `${start}–${prev}`);
    start = n;
    prev = n;
  }
  return `F-No. ${runs.join(', ')}`;
}

type Col = { header: string; width: number; value: (q: WalletCardQualification) => string };

function drawFront(doc: PDFKit.PDFDocument, d: WalletCardData): void {
  const [W, H] = CARD_SIZE;
  const inner = W - 2 * M;
  doc.rect(0, 0, W, 20).fill(ACCENT);
  doc
    .font(FONT_SEMIBOLD)
    .fontSize(7.5)
    .fillColor('#ffffff')
    .text(d.company.name, M, 6.5, { width: inner * 0.66, lineBreak: false, ellipsis: true });
  doc
    .font(FONT_REGULAR)
    .fontSize(5.5)
    .fillColor('#ffffff')
    .text('WELDER QUALIFICATION CARD', M + inner * 0.62, 7.8, {
      width: inner * 0.38,
      align: 'right',
      characterSpacing: 0.4,
      lineBreak: false,
    });

  const stampW = 50;
  doc
    .font(FONT_SEMIBOLD)
    .fontSize(10.5)
    .fillColor(INK)
    .text(d.welder.name, M, 25, { width: inner - stampW - 6, lineBreak: false, ellipsis: true });
  doc
    .font(FONT_REGULAR)
    .fontSize(6)
    .fillColor(MUTED)
    .text(`Home shop: ${d.welder.homeShop}`, M, 38, {
      width: inner - stampW - 6,
      lineBreak: false,
      ellipsis: true,
    });
  doc
    .roundedRect(W - M - stampW, 24, stampW, 22, 2)
    .lineWidth(0.8)
    .strokeColor(INK)
    .stroke();
  doc
    .font(FONT_REGULAR)
    .fontSize(4.8)
    .fillColor(MUTED)
    .text('STAMP', W - M - stampW, 26, { width: stampW, align: 'center', lineBreak: false });
  doc
    .font(FONT_SEMIBOLD)
    .fontSize(10)
    .fillColor(INK)
    .text(d.welder.stamp, W - M - stampW, 32.5, { width: stampW, align: 'center', lineBreak: false });

  const cols: Col[] = [
    { header: 'Code · process', width: 0.2, value: (q) => `${CODE_NAMES[q.code]}\n${q.process}` },
    { header: 'Positions', width: 0.16, value: positionsShort },
    { header: 'Thickness', width: 0.18, value: (q) => q.thickness },
    { header: 'Pipe', width: 0.18, value: (q) => q.diameter },
    { header: 'Filler', width: 0.13, value: (q) => fNumbersShort(q.fNumbers) },
    {
      header: 'Lapses on',
      width: 0.15,
      value: (q) =>
        `${formatDate(q.lapsesOn)}${q.state === 'current' ? '' : ` ${STATE_WORDS[q.state].toLowerCase()}`}`,
    },
  ];
  const xs: number[] = [];
  let x = M;
  for (const c of cols) {
    xs.push(x);
    x += c.width * inner;
  }
  let y = 51;
  doc
    .moveTo(M, y - 1.5)
    .lineTo(W - M, y - 1.5)
    .lineWidth(0.4)
    .strokeColor(HAIRLINE)
    .stroke();
  cols.forEach((c, i) => {
    doc
      .font(FONT_SEMIBOLD)
      .fontSize(4.6)
      .fillColor(MUTED)
      .text(c.header, (xs[i] ?? 0) + 0.5, y, { width: c.width * inner - 1.5, lineBreak: false });
  });
  y += 7;
  const bottom = H - 13;
  const size = 5.2;
  const shown: WalletCardQualification[] = [];
  for (const q of d.qualifications) {
    const h =
      Math.max(
        ...cols.map((c) =>
          doc
            .font(FONT_REGULAR)
            .fontSize(size)
            .heightOfString(c.value(q), { width: c.width * inner - 1.5 }),
        ),
      ) + 1.5;
    const remaining = d.qualifications.length - shown.length - 1;
    // Keep a line free for the "more on the Verify page" note when not everything fits.
    if (y + h > bottom - (remaining > 0 ? 7 : 0)) break;
    cols.forEach((c, i) => {
      const lapsingCol = i === cols.length - 1 && q.state !== 'current';
      doc
        .font(i === 0 ? FONT_SEMIBOLD : FONT_REGULAR)
        .fontSize(size)
        .fillColor(lapsingCol ? WARN : INK)
        .text(c.value(q), (xs[i] ?? 0) + 0.5, y, { width: c.width * inner - 1.5 });
    });
    y += h;
    doc
      .moveTo(M, y - 0.8)
      .lineTo(W - M, y - 0.8)
      .lineWidth(0.25)
      .strokeColor(HAIRLINE)
      .stroke();
    shown.push(q);
  }
  if (d.qualifications.length === 0)
    doc
      .font(FONT_REGULAR)
      .fontSize(size)
      .fillColor(WARN)
      .text('No current qualifications on the issue date.', M, y, { width: inner });
  else if (shown.length < d.qualifications.length)
    doc
      .font(FONT_SEMIBOLD)
      .fontSize(size)
      .fillColor(INK)
      .text(`+ ${d.qualifications.length - shown.length} more — scan the code on the back for all`, M, y, {
        width: inner,
        lineBreak: false,
      });

  doc
    .font(FONT_REGULAR)
    .fontSize(5)
    .fillColor(MUTED)
    .text(`Issued ${formatDate(d.issuedOn)} · status on that date; scan the back for today's`, M, H - 10, {
      width: inner,
      lineBreak: false,
    });
}

function drawBack(doc: PDFKit.PDFDocument, d: WalletCardData, qr: Buffer | null): void {
  const [W, H] = CARD_SIZE;
  const inner = W - 2 * M;
  const qrSize = 96;
  const qrX = M - 4;
  const qrY = 6;
  if (qr) doc.image(qr, qrX, qrY, { width: qrSize, height: qrSize });
  else
    doc
      .rect(qrX + 8, qrY + 8, qrSize - 16, qrSize - 16)
      .lineWidth(0.5)
      .strokeColor(MUTED)
      .stroke()
      .font(FONT_REGULAR)
      .fontSize(6)
      .fillColor(MUTED)
      .text('No verify link issued', qrX + 12, qrY + qrSize / 2 - 8, { width: qrSize - 24, align: 'center' });
  const tx = qrX + qrSize + 6;
  const tw = W - M - tx;
  doc.font(FONT_SEMIBOLD).fontSize(8).fillColor(INK).text("Check today's status", tx, 12, { width: tw });
  doc
    .font(FONT_REGULAR)
    .fontSize(5.6)
    .fillColor(INK)
    .text(`${d.welder.name}, stamp ${d.welder.stamp}`, tx, doc.y + 2, { width: tw });
  doc
    .font(FONT_REGULAR)
    .fontSize(5.6)
    .fillColor(MUTED)
    .text(`Issued ${formatDate(d.issuedOn)} by ${d.company.name}`, tx, doc.y + 1, { width: tw });
  doc
    .font(FONT_REGULAR)
    .fontSize(5.2)
    .fillColor(INK)
    .text(CARD_CAUTION, tx, doc.y + 5, { width: tw, lineGap: 0.3 });

  const urlY = qrY + qrSize + 2;
  doc
    .font(FONT_REGULAR)
    .fontSize(5.6)
    .fillColor(INK)
    .text(
      d.verifyUrl ?? 'No verify link was issued for this welder when this card was printed.',
      M,
      urlY,
      d.verifyUrl ? { width: inner, align: 'left', link: d.verifyUrl } : { width: inner, align: 'left' },
    );
  doc
    .font(FONT_SEMIBOLD)
    .fontSize(5)
    .fillColor(ACCENT)
    .text('BEADROLL', M, H - 10, { characterSpacing: 1.2, lineBreak: false });
  doc
    .font(FONT_REGULAR)
    .fontSize(5)
    .fillColor(MUTED)
    .text('If found, return to the company named on the front.', M + 40, H - 10, {
      width: inner - 40,
      align: 'right',
      lineBreak: false,
    });
}

/** The wallet card as a two-page PDF: page 1 the front, page 2 the back, each 85.6 × 54 mm. */
export async function renderWalletCardPdf(d: WalletCardData): Promise<Buffer> {
  const qr = d.verifyUrl ? await qrCodePng(d.verifyUrl) : null;
  const doc = createDocument({
    size: CARD_SIZE,
    margins: { top: 0, bottom: 0, left: 0, right: 0 },
    info: {
      Title: `Wallet card — ${d.welder.name} (${d.welder.stamp})`,
      Author: d.company.name,
      Creator: 'Beadroll',
    },
  });
  return documentBuffer(doc, () => {
    drawFront(doc, d);
    doc.addPage({ size: CARD_SIZE, margins: { top: 0, bottom: 0, left: 0, right: 0 } });
    drawBack(doc, d, qr);
  });
}
