import { qualifiedRanges, RULES_VERSION } from '@beadroll/rules';
import { describe, expect, it } from 'vitest';
import type { WpqDocumentData } from './document-data.js';
import { exampleWpq, manySpecimens, VERIFY_URL } from './__fixtures__/harrow-point.js';
import { readPdf } from './__fixtures__/read-pdf.js';
import { renderWpqPdf } from './wpq-pdf.js';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';

type Word = { text: string; page: number; xMin: number; yMin: number; xMax: number; yMax: number };

/** Every word with its box, as poppler's pdftotext -bbox reads the file. */
function wordBoxes(pdf: Buffer): Word[] {
  const dir = mkdtempSync(path.join(tmpdir(), 'wpq-'));
  try {
    const file = path.join(dir, 'wpq.pdf');
    writeFileSync(file, pdf);
    const html = execFileSync('pdftotext', ['-bbox', file, '-'], { encoding: 'utf8' });
    const words: Word[] = [];
    let page = 0;
    for (const line of html.split('\n')) {
      if (line.includes('<page ')) page += 1;
      const m = /<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">(.*)<\/word>/.exec(line);
      if (m) words.push({ page, xMin: +m[1]!, yMin: +m[2]!, xMax: +m[3]!, yMax: +m[4]!, text: m[5]! });
    }
    return words;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const render = async (d: WpqDocumentData = exampleWpq()) => readPdf(await renderWpqPdf(d));

/** A 10 mm plate coupon recorded in millimetres (ISO 9606-1, GMAW), to check nothing is converted. */
function metricPlate(): WpqDocumentData {
  const base = exampleWpq();
  return {
    ...base,
    qualification: { ...base.qualification, code: 'iso-9606-1', process: 'GMAW', transferMode: 'spray' },
    coupon: {
      ...base.coupon,
      form: 'plate',
      nps: undefined,
      schedule: undefined,
      outsideDiameter: undefined,
      thickness: { value: 10, unit: 'mm' },
      depositedThickness: { value: 10, unit: 'mm' },
      position: '1G',
      progression: undefined,
      fNumber: undefined,
    },
    examination: {
      visual: { result: 'accept' },
      test: { method: 'radiography', result: 'accept', reportNumber: 'RT-25-118', remarks: 'No indications' },
    },
    ranges: qualifiedRanges({
      code: 'iso-9606-1',
      process: 'GMAW',
      transferMode: 'spray',
      form: 'plate',
      weld: 'groove',
      position: '1G',
      thickness: { value: 10, unit: 'mm' },
      depositedThickness: { value: 10, unit: 'mm' },
      backing: false,
    }),
  };
}

describe('renderWpqPdf', () => {
  it('names the company, the welder, the stamp and the record', async () => {
    const pdf = await render();
    expect(pdf.pages[0]).toContain('Welder performance qualification record');
    for (const s of [
      'Harrow Point Fabrication',
      'Tamsin Vell-Arroyo',
      'ST-12',
      'Record WPQ-2025-0147',
      'ASME IX',
      'SMAW',
      'HPF-S101 rev 3',
      'North Yard',
      '12 Mar 2025',
    ])
      expect(pdf.text).toContain(s);
  });

  it('prints each variable as tested beside the range it qualifies', async () => {
    const { text } = await render();
    expect(text).toContain('Actual value (tested)');
    expect(text).toContain('Range qualified');
    // tested
    for (const s of [
      '6G (pipe)',
      'Pipe, NPS 2 Sch 80',
      'OD 2.375 in, wall 0.218 in',
      '0.218 in deposited, 3 layers',
      'Without backing',
      'F-No. 4',
      'P-No. 1 to P-No. 1',
      'Uphill',
    ])
      expect(text).toContain(s);
    // qualified
    for (const s of [
      'Groove: F, H, V, O (all)',
      'Fillet: F, H, V, O (all)',
      'up to 0.436 in',
      '1 in OD and over',
      'F-No. 1, 2, 3, 4',
      'With and without backing',
      'Uphill only',
    ])
      expect(text).toContain(s);
  });

  it('names the clause behind every limit, with the reason', async () => {
    const d = exampleWpq();
    const { text } = await render(d);
    for (const limit of d.ranges.limits) {
      expect(text).toContain(limit.clause);
      expect(text).toContain(limit.text);
    }
  });

  it('prints the bend specimens with each discontinuity as the examiner typed it', async () => {
    const { text } = await render();
    for (const s of [
      'Visual examination Accept',
      'Brannoc Lisle, certificate EX-4471',
      'LR-25-0392',
      'ASME IX acceptance criteria',
      'F1 Face bend 1/32 in Surface porosity No Accept',
      'R1 Root bend 1/16 in Surface slag Yes Accept',
      '3/16 Corner crack No',
      'F2 Face bend None seen',
      'Coupon result: Accept',
    ])
      expect(text).toContain(s);
  });

  it('prints lengths in millimetres when they were recorded in millimetres, and the GMAW transfer mode', async () => {
    const { text } = await render(metricPlate());
    for (const s of [
      'Plate, 10 mm thick',
      '10 mm deposited',
      '3 mm to 20 mm',
      '500 mm OD and over',
      'Transfer mode',
      'Spray, Globular, Pulse',
      'ISO 9606-1 material thickness and outside diameter',
    ])
      expect(text).toContain(s);
    expect(text).not.toMatch(/0\.39\d* in|19\.68/); // 10 mm and 500 mm never shown in inches
  });

  it('prints a radiography examination with its report number instead of bend specimens', async () => {
    const { text } = await render(metricPlate());
    expect(text).toContain('Radiography Accept, report RT-25-118');
    expect(text).toContain('No indications');
    expect(text).not.toContain('Specimen result');
  });

  it('carries the certification block, the rules version and the caution that the code edition in force governs', async () => {
    const { text, pages } = await render();
    for (const s of [
      'Odile Fenwright, QA Manager',
      '18 Mar 2025',
      'Signature',
      `Beadroll rules version ${RULES_VERSION}`,
      VERIFY_URL,
    ])
      expect(text).toContain(s);
    expect(text).toContain(
      "The code edition in force, Harrow Point Fabrication's quality manual and the responsible inspector govern.",
    );
    expect(text).toContain('they support those authorities and do not replace them');
    for (const page of pages)
      expect(page).toContain(
        'The code edition in force, the company quality manual and the responsible inspector govern this record.',
      );
  });

  it("shows today's status when given", async () => {
    const { text } = await render();
    expect(text).toContain('Status on 2 Jun 2025: Current — lapses on 30 Nov 2025');
  });

  it('embeds Source Sans 3 and no other font', async () => {
    const { fonts } = await render();
    expect(fonts.length).toBeGreaterThan(0);
    for (const f of fonts) expect(f).toMatch(/^[A-Z]{6}\+SourceSans3-(Regular|SemiBold)$/);
  });

  it('prints on Letter by default and on A4 when the company asks', async () => {
    expect((await render()).mediaBoxes[0]).toEqual([612, 792]);
    expect((await render({ ...exampleWpq(), paper: 'A4' })).mediaBoxes[0]).toEqual([595.28, 841.89]);
  });

  it('runs a coupon with 12 specimens over several pages without losing a line', async () => {
    const base = exampleWpq();
    const specimens = manySpecimens(12);
    const { pages, text } = await render({
      ...base,
      examination: {
        ...base.examination,
        test: { method: 'bend', criteria: 'aws-d1.1', result: 'accept', specimens },
      },
    });
    expect(pages.length).toBeGreaterThanOrEqual(2);
    pages.forEach((page, i) => expect(page).toContain(`Page ${i + 1} of ${pages.length}`));
    pages
      .slice(1)
      .forEach((page) => expect(page).toContain('WPQ record WPQ-2025-0147 · Tamsin Vell-Arroyo, stamp ST-12'));
    for (const s of specimens) {
      expect(text).toContain(s.label);
      for (const dc of s.discontinuities) expect(text).toContain(dc.sizeText);
    }
    expect(text.match(/ 2 mm Corner crack No/g)).toHaveLength(12);
    expect(text).toContain('B08 — AWS D1.1 4.9.3.3: Corner crack of 5/16 in exceeds 1/4 in');
    expect(text).toContain('Replace specimen');
    expect(pages.at(-1)).toContain('Odile Fenwright, QA Manager');
    expect(pages.at(-1)).toContain('The code edition in force');
  });

  it('refuses to print a WPQ for a coupon that did not pass', async () => {
    const base = exampleWpq();
    const failed: WpqDocumentData = {
      ...base,
      examination: {
        ...base.examination,
        test: { method: 'radiography', result: 'reject', reportNumber: 'RT-1' },
      },
    };
    await expect(renderWpqPdf(failed)).rejects.toThrow(/only for a coupon that passed/);
  });

  it('prints the footer on separate lines: the whole verify link on one line, no word over another (issue 10 item 8)', async () => {
    const base = exampleWpq();
    const long = `${VERIFY_URL}${'x'.repeat(40)}`;
    const pdf = await renderWpqPdf({
      ...base,
      verifyUrl: long,
      examination: { ...base.examination, test: { method: 'bend', criteria: 'aws-d1.1', result: 'accept', specimens: manySpecimens(12) } },
    });
    const words = wordBoxes(pdf);
    const pages = Math.max(...words.map((w) => w.page));
    expect(pages).toBeGreaterThanOrEqual(2);
    for (let p = 1; p <= pages; p += 1) {
      const footer = words.filter((w) => w.page === p && w.yMin > 720);
      const url = footer.filter((w) => long.includes(w.text) && w.text.length > 10);
      expect(url.map((w) => w.text).join(''), `page ${p}`).toBe(long);
      for (const a of footer)
        for (const b of footer) {
          if (a === b) continue;
          const overlap = a.xMin < b.xMax - 0.5 && b.xMin < a.xMax - 0.5 && a.yMin < b.yMax - 0.5 && b.yMin < a.yMax - 0.5;
          expect(overlap, `page ${p}: "${a.text}" over "${b.text}"`).toBe(false);
        }
    }
  });

  it('names the record by its WPQ number, never by its id, and prints each clause once per variable row', async () => {
    const d = exampleWpq();
    const { text } = await render(d);
    expect(text).toContain('WPQ-2025-0147');
    expect(text).not.toContain(d.qualification.id);
    expect(text).toMatch(/Weld type Groove Groove and fillet welds —/);
  });
});
