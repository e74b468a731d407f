import { describe, expect, it } from 'vitest';
import type { WalletCardQualification } from './document-data.js';
import { exampleCard, VERIFY_URL } from './__fixtures__/harrow-point.js';
import { decodeQr, pageScreenshot, pdfImages, readPdf } from './__fixtures__/read-pdf.js';
import { qrCodePng } from './qr-code.js';
import { CARD_CAUTION, fNumbersShort, renderWalletCardPdf } from './wallet-card-pdf.js';

describe('renderWalletCardPdf', () => {
  it('prints the welder, stamp, company and home shop on the front', async () => {
    const { pages } = await readPdf(await renderWalletCardPdf(exampleCard()));
    for (const s of [
      'Harrow Point Fabrication',
      'Tamsin Vell-Arroyo',
      'ST-12',
      'Home shop: North Yard',
      'Issued 2 Jun 2025',
    ])
      expect(pages[0]).toContain(s);
  });

  it('lists each current qualification in short form', async () => {
    const { pages } = await readPdf(await renderWalletCardPdf(exampleCard()));
    const front = pages[0] ?? '';
    for (const s of [
      'ASME IX SMAW',
      'Groove all Fillet all',
      'up to 0.436 in',
      '1 in OD and over',
      'F-No. 1–4',
      '30 Nov 2025',
    ])
      expect(front).toContain(s);
    for (const s of [
      'AWS D1.1 FCAW',
      'Groove F H V Fillet F H V',
      '1/8 in to 3/4 in',
      '24 in OD and over',
      'F-No. 6',
      '20 Jun 2025 lapsing',
    ])
      expect(front).toContain(s);
    for (const s of [
      'ISO 9606-1 GTAW',
      'Groove F H Fillet F H',
      '3 mm to 8 mm',
      '500 mm OD and',
      '4 Oct 2025',
    ])
      expect(front).toContain(s);
  });

  it('prints the verify URL and the caution on the back', async () => {
    const { pages } = await readPdf(await renderWalletCardPdf(exampleCard()));
    expect(pages[1]).toContain(VERIFY_URL);
    expect(pages[1]).toContain(CARD_CAUTION);
    expect(CARD_CAUTION).toContain(
      'The code edition in force, the company quality manual and the responsible inspector govern.',
    );
  });

  it('is two ID-1 pages, 85.6 × 54 mm (ISO/IEC 7810)', async () => {
    const { mediaBoxes } = await readPdf(await renderWalletCardPdf(exampleCard()));
    expect(mediaBoxes).toHaveLength(2);
    for (const [w, h] of mediaBoxes) {
      expect((w * 25.4) / 72).toBeCloseTo(85.6, 1);
      expect((h * 25.4) / 72).toBeCloseTo(54, 1);
    }
  });

  it('embeds a QR code that decodes to the verify URL, as generated, as stored in the PDF and as rendered', async () => {
    expect(decodeQr(await qrCodePng(VERIFY_URL))).toBe(VERIFY_URL);
    const pdf = await renderWalletCardPdf(exampleCard());
    const images = await pdfImages(pdf);
    expect(images).toHaveLength(1);
    expect(images[0]?.page).toBe(2);
    expect(decodeQr(images[0]?.png ?? new Uint8Array())).toBe(VERIFY_URL);
    expect(decodeQr(await pageScreenshot(pdf, 2, 3))).toBe(VERIFY_URL);
  });

  it('embeds Source Sans 3 and no other font', async () => {
    const { fonts } = await readPdf(await renderWalletCardPdf(exampleCard()));
    expect(fonts.length).toBeGreaterThan(0);
    for (const f of fonts) expect(f).toMatch(/^[A-Z]{6}\+SourceSans3-(Regular|SemiBold)$/);
  });

  it('says how many more qualifications the Verify page has when they do not all fit', async () => {
    const base = exampleCard();
    const one = base.qualifications[0] as WalletCardQualification;
    const many = Array.from({ length: 9 }, (_, i): WalletCardQualification => ({
      ...one,
      lapsesOn: `2025-1${i % 3}-0${i + 1}`,
    }));
    const { pages } = await readPdf(await renderWalletCardPdf({ ...base, qualifications: many }));
    expect(pages).toHaveLength(2);
    const shown = (pages[0]?.match(/ASME IX SMAW/g) ?? []).length;
    expect(shown).toBeGreaterThan(0);
    expect(shown).toBeLessThan(9);
    expect(pages[0]).toContain(`+ ${9 - shown} more — scan the code on the back for all`);
  });

  it('says so when the welder has no current qualification', async () => {
    const { pages } = await readPdf(await renderWalletCardPdf(exampleCard({ qualifications: [] })));
    expect(pages[0]).toContain('No current qualifications on the issue date.');
  });
});

describe('fNumbersShort', () => {
  it('joins consecutive F-Numbers into a run', () => {
    expect(fNumbersShort([4, 1, 2, 3])).toBe('F-No. 1–4');
    expect(fNumbersShort([1, 3, 4, 6])).toBe('F-No. 1, 3–4, 6');
    expect(fNumbersShort([6])).toBe('F-No. 6');
    expect(fNumbersShort([])).toBe('none');
  });
});
