// The WPQ record of one certified qualification: what the welder tested with, what that qualifies,
// the clause behind every limit, how the coupon was examined, and who certified it. Layout is Beadroll's own.
import { formatLength } from '@beadroll/rules';
import type {
  BendExaminationData,
  ExaminationPartData,
  Length,
  QualifiedRangesData,
  VolumetricExaminationData,
  WpqDocumentData,
} from './document-data.js';
import {
  CODE_NAMES,
  STATE_WORDS,
  criteriaName,
  formatDate,
  formatDiameterRange,
  formatFNumbers,
  formatPositions,
  formatThicknessRange,
} from './document-format.js';
import { createDocument, documentBuffer } from './fonts.js';
import { ACCENT, FlowLayout, HAIRLINE, INK, MUTED, WARN, stampPages, type Row } from './pdf-layout.js';

const RESULT_WORDS = {
  accept: 'Accept',
  reject: 'Reject',
  'replace-specimen': 'Replace specimen',
  incomplete: 'Incomplete',
} as const;

const KIND_WORDS = { face: 'Face bend', root: 'Root bend', side: 'Side bend' } as const;

const DISCONTINUITY_WORDS = {
  crack: 'crack',
  porosity: 'porosity',
  slag: 'slag',
  'lack-of-fusion': 'lack of fusion',
  undercut: 'undercut',
  tear: 'tear',
  other: 'other',
} as const;

const cap = (s: string): string => s.charAt(0).toUpperCase() + s.slice(1);

/** A size as typed, with its unit when the typed text has none ('3/16' → '3/16 in'). */
function sizeWithUnit(dc: { sizeText: string; size?: Length }): string {
  if (!dc.size || /[a-z"]/i.test(dc.sizeText)) return dc.sizeText;
  return formatLength(dc.size);
}

/** The caution every WPQ carries (DESIGN.md, Safety and authority). */
export function wpqCaution(companyName: string, rulesVersion: string): string {
  return (
    `The code edition in force, ${companyName}'s quality manual and the responsible inspector govern. ` +
    `The qualified ranges on this record were computed by Beadroll (rules version ${rulesVersion}) from the ` +
    'values recorded for the coupon, each with the clause it rests on; they support those authorities and do not replace them.'
  );
}

function clausesFor(ranges: QualifiedRangesData, ...variables: string[]): string {
  const clauses = ranges.limits.filter((l) => variables.includes(l.variable)).map((l) => l.clause);
  return [...new Set(clauses)].join('; ') || '—';
}

function couponForm(d: WpqDocumentData): string {
  const c = d.coupon;
  if (c.form === 'plate') return `Plate, ${formatLength(c.thickness)} thick`;
  const parts = ['Pipe'];
  if (c.nps) parts.push(`NPS ${c.nps}${c.schedule ? ` Sch ${c.schedule}` : ''}`);
  const size = [
    c.outsideDiameter ? `OD ${formatLength(c.outsideDiameter, { fractions: false })}` : null,
    `wall ${formatLength(c.thickness, { fractions: false })}`,
  ].filter(Boolean);
  return `${parts.join(', ')}\n${size.join(', ')}`;
}

function variableRows(d: WpqDocumentData): Row[] {
  const { coupon: c, ranges: r, qualification: q } = d;
  const rows: Row[] = [];
  const add = (variable: string, tested: string, qualified: string, clause: string): void => {
    rows.push({ cells: [{ text: variable, bold: true }, tested, qualified, { text: clause, color: MUTED }] });
  };
  add('Welding process', q.process, `${q.process} only`, '—');
  if (q.process === 'GMAW')
    add(
      'Transfer mode',
      q.transferMode ? cap(q.transferMode) : 'not recorded',
      r.transferModes?.length ? r.transferModes.map(cap).join(', ') : '—',
      clausesFor(r, 'transferMode'),
    );
  const weldsQualified = [
    r.positions.groove.length ? 'groove' : null,
    r.positions.fillet.length ? 'fillet' : null,
  ]
    .filter(Boolean)
    .join(' and ');
  // The positions clause is printed once, on the test position row below.
  add('Weld type', cap(c.weld), weldsQualified ? `${cap(weldsQualified)} welds` : 'none', '—');
  add(
    'Test position',
    `${c.position} (${c.form})`,
    `Groove: ${formatPositions(r.positions.groove)}\nFillet: ${formatPositions(r.positions.fillet)}`,
    clausesFor(r, 'positions'),
  );
  add('Coupon and pipe diameter', couponForm(d), formatDiameterRange(r), clausesFor(r, 'diameter'));
  const deposited = c.depositedThickness
    ? `${formatLength(c.depositedThickness)} deposited${c.layers !== undefined ? `, ${c.layers} layer${c.layers === 1 ? '' : 's'}` : ''}`
    : `${formatLength(c.thickness)} coupon${c.layers !== undefined ? `, ${c.layers} layer${c.layers === 1 ? '' : 's'}` : ''}`;
  add('Weld metal thickness', deposited, formatThicknessRange(r), clausesFor(r, 'thickness'));
  add(
    'Backing',
    c.backing ? 'With backing' : 'Without backing',
    r.backing.length === 2
      ? 'With and without backing'
      : r.backing.includes('with')
        ? 'With backing only'
        : 'Without backing only',
    clausesFor(r, 'backing'),
  );
  add(
    'Filler metal',
    c.fNumber !== undefined ? `F-No. ${c.fNumber}` : 'F-No. not recorded',
    formatFNumbers(r.fNumbers),
    clausesFor(r, 'fNumber'),
  );
  add(
    'Base metal',
    c.pNumbers.length ? c.pNumbers.map((p) => `P-No. ${p}`).join(' to ') : 'not recorded',
    'Not computed by Beadroll',
    '—',
  );
  add(
    'Vertical progression',
    c.progression ? cap(c.progression) : 'not applicable',
    r.progression ? `${r.progression.map(cap).join(' and ')} only` : 'Not applicable',
    clausesFor(r, 'progression'),
  );
  return rows;
}

function bendRows(test: BendExaminationData): Row[] {
  const rows: Row[] = [];
  test.specimens.forEach((s, i) => {
    const label = s.label ?? `S${i + 1}`;
    const result = { text: RESULT_WORDS[s.result], bold: true, color: s.result === 'accept' ? INK : WARN };
    const head = [{ text: label, bold: true }, KIND_WORDS[s.kind]];
    if (s.discontinuities.length === 0) rows.push({ cells: [...head, 'None seen', '', '', '', result] });
    s.discontinuities.forEach((dc, j) => {
      rows.push({
        cells: [
          ...(j === 0 ? head : ['', '']),
          sizeWithUnit(dc),
          dc.location === 'corner' ? 'Corner' : 'Surface',
          dc.type ? DISCONTINUITY_WORDS[dc.type] : '—',
          dc.fusionRelated ? 'Yes' : 'No',
          j === 0 ? result : '',
        ],
      });
    });
    for (const reason of s.reasons)
      rows.push({
        span: { text: `${label} — ${reason.clause}: ${reason.message}`, color: WARN },
        shade: true,
      });
  });
  return rows;
}

function drawExamination(l: FlowLayout, d: WpqDocumentData): void {
  const { visual, test } = d.examination;
  const rows = test?.method === 'bend' ? bendRows(test) : [];
  // Keep a short examination (the usual two to six specimens) on one page with its heading.
  l.heading('Examination', Math.min(5 * 14 + (rows.length + 2) * 16 + 24, 300));
  const facts: Array<[string, string]> = [
    ['Visual examination', `${RESULT_WORDS[visual.result]}${visual.remarks ? ` — ${visual.remarks}` : ''}`],
    ['Examiner', `${d.coupon.examiner.name}, certificate ${d.coupon.examiner.certificateNumber}`],
  ];
  if (d.coupon.labReportNumber) facts.push(['Lab report', d.coupon.labReportNumber]);
  if (test?.method === 'bend') {
    facts.push(['Bend tests judged to', `${criteriaName(test.criteria)} acceptance criteria`]);
  } else if (test) {
    const v: VolumetricExaminationData = test;
    facts.push([
      v.method === 'radiography' ? 'Radiography' : 'Ultrasonic examination',
      `${RESULT_WORDS[v.result]}, report ${v.reportNumber}`,
    ]);
    if (v.remarks) facts.push(['Remarks', v.remarks]);
  }
  for (const f of d.examination.visualFindings ?? []) facts.push(['Visual finding', f]);
  drawFacts(l, facts);
  for (const part of d.examination.parts ?? []) drawPart(l, part);
  if (test?.method === 'bend') {
    l.gap(6);
    l.table(
      [
        { header: 'Specimen', share: 9 },
        { header: 'Kind', share: 12 },
        { header: 'Discontinuity size', share: 18 },
        { header: 'Location', share: 10 },
        { header: 'Type', share: 13 },
        { header: 'Slag or fusion cause seen', share: 13 },
        { header: 'Specimen result', share: 13 },
      ],
      rows,
      { size: 8 },
    );
  }
  const result = d.examination.result ?? test?.result;
  if (result) {
    l.gap(test?.method === 'bend' ? 6 : 4);
    const rule = d.examination.parts?.length
      ? ' (every part of the examination must pass)'
      : test?.method === 'bend'
        ? ' (every specimen must pass)'
        : '';
    l.text(`Coupon result: ${RESULT_WORDS[result]}${rule}`, {
      size: 9.5,
      bold: true,
      color: result === 'accept' ? INK : WARN,
    });
  }
}

/** One part of the examination as performed: its verdict and criteria, what was found, its reasons. */
function drawPart(l: FlowLayout, part: ExaminationPartData): void {
  l.gap(4);
  drawFacts(l, [
    [part.name, `${RESULT_WORDS[part.result]}${part.judgedBy ? ` — judged by ${part.judgedBy}` : ''}`],
    ...part.findings.map((f): [string, string] => ['', f]),
  ]);
  for (const r of part.reasons)
    l.text(`${part.name} — ${r.clause}: ${r.message}`, { size: 8.5, color: WARN });
}

/** Label/value pairs in two columns of labels and values. */
function drawFacts(l: FlowLayout, facts: Array<[string, string]>): void {
  const labelWidth = 130;
  for (const [label, value] of facts) {
    const h = Math.max(l.heightOf(value, { size: 9 }, l.width - labelWidth), 12);
    l.ensure(h + 2);
    const y = l.y;
    l.style({ size: 8.5, color: MUTED }).text(label, l.left, y + 0.5, {
      width: labelWidth - 8,
      lineBreak: false,
    });
    l.style({ size: 9 }).text(value, l.left + labelWidth, y, { width: l.width - labelWidth, lineGap: 1 });
    l.y = y + h + 2;
  }
}

/** A row of small-caps labels over values, for the identity block. */
/** Labelled values in a grid, `perRow` to a row (the WPQ record's and the weld record's head). */
export function drawFieldGrid(l: FlowLayout, fields: Array<[string, string]>, perRow: number): void {
  const w = l.width / perRow;
  for (let i = 0; i < fields.length; i += perRow) {
    const chunk = fields.slice(i, i + perRow);
    const h = Math.max(...chunk.map(([, v]) => l.heightOf(v, { size: 10, bold: true }, w - 8))) + 13;
    l.ensure(h);
    const y = l.y;
    chunk.forEach(([label, value], j) => {
      const x = l.left + j * w;
      l.style({ size: 7, color: MUTED }).text(label.toUpperCase(), x, y, {
        width: w - 8,
        characterSpacing: 0.5,
        lineBreak: false,
      });
      l.style({ size: 10, bold: true }).text(value, x, y + 10, { width: w - 8, lineGap: 1 });
    });
    l.y = y + h + 4;
  }
}

function drawFirstHeader(l: FlowLayout, d: WpqDocumentData): void {
  drawDocumentHeader(l, 'Welder performance qualification record', d.company.name, `Record ${d.qualification.number}`);
}

/** The first page's head of a Beadroll record: the mark, the title, the company and the record's reference. */
export function drawDocumentHeader(l: FlowLayout, title: string, company: string, reference: string): void {
  const { doc } = l;
  const top = l.y;
  l.style({ size: 8, bold: true, color: ACCENT }).text('BEADROLL', l.left, top, {
    characterSpacing: 2,
    lineBreak: false,
  });
  l.style({ size: 17, bold: true }).text(title, l.left, top + 12, {
    width: l.width * 0.62,
  });
  const rightWidth = l.width * 0.36;
  const rx = l.right - rightWidth;
  l.style({ size: 11, bold: true }).text(company, rx, top + 2, { width: rightWidth, align: 'right' });
  const after = doc.y;
  l.style({ size: 8.5, color: MUTED }).text(reference, rx, after + 1, {
    width: rightWidth,
    align: 'right',
  });
  l.y = Math.max(doc.y, top + 36) + 8;
  doc.save().rect(l.left, l.y, l.width, 2).fill(ACCENT).restore();
  l.y += 10;
}

function drawContinuationHeader(l: FlowLayout, d: WpqDocumentData): void {
  l.style({ size: 8, color: MUTED }).text(
    `WPQ record ${d.qualification.number} · ${d.welder.name}, stamp ${d.welder.stamp} · ${d.company.name} (continued)`,
    l.left,
    l.y,
    { width: l.width, lineBreak: false },
  );
  l.y += 14;
  l.rule(HAIRLINE);
  l.y += 6;
}

function drawCertification(l: FlowLayout, d: WpqDocumentData): void {
  const q = d.qualification;
  const statement =
    `${d.company.name} certifies that ${d.welder.name} (stamp ${d.welder.stamp}) welded the coupon described on this record ` +
    `to WPS ${q.wps.number} revision ${q.wps.revision}, that it was examined with the results shown, and that the welder is ` +
    'qualified within the ranges shown, as long as continuity is kept.';
  const blockHeight = l.heightOf(statement, { size: 9 }, l.width) + 90;
  l.heading('Certification', blockHeight);
  l.text(statement, { size: 9 });
  l.gap(8);
  drawFieldGrid(
    l,
    [
      ['Certified by', `${q.certifiedBy.name}, ${q.certifiedBy.title}`],
      ['Certified on', formatDate(q.certifiedOn)],
    ],
    2,
  );
  l.gap(22);
  const { doc } = l;
  const half = l.width / 2;
  doc
    .save()
    .moveTo(l.left, l.y)
    .lineTo(l.left + half - 24, l.y)
    .moveTo(l.left + half, l.y)
    .lineTo(l.right - 60, l.y)
    .lineWidth(0.7)
    .strokeColor(INK)
    .stroke()
    .restore();
  l.style({ size: 7.5, color: MUTED }).text('Signature', l.left, l.y + 3, { lineBreak: false });
  l.style({ size: 7.5, color: MUTED }).text('Date', l.left + half, l.y + 3, { lineBreak: false });
  l.y += 14;
}

function drawCaution(l: FlowLayout, d: WpqDocumentData): void {
  drawCautionBox(l, wpqCaution(d.company.name, d.rulesVersion));
}

/** The framed "Who decides" note that closes every Beadroll record. */
export function drawCautionBox(l: FlowLayout, text: string): void {
  const pad = 8;
  const h = l.heightOf(text, { size: 8.5 }, l.width - 2 * pad - 6) + 2 * pad + 12;
  l.gap(12);
  l.ensure(h);
  const { doc } = l;
  doc
    .save()
    .rect(l.left, l.y, l.width, h)
    .lineWidth(0.8)
    .strokeColor(ACCENT)
    .stroke()
    .rect(l.left, l.y, 4, h)
    .fill(ACCENT)
    .restore();
  l.style({ size: 8.5, bold: true, color: ACCENT }).text('Who decides', l.left + pad + 6, l.y + pad, {
    lineBreak: false,
  });
  l.style({ size: 8.5 }).text(text, l.left + pad + 6, l.y + pad + 12, {
    width: l.width - 2 * pad - 6,
    lineGap: 1,
  });
  l.y += h;
}

/** The WPQ record as a PDF (Letter or A4, portrait). */
export function renderWpqPdf(d: WpqDocumentData): Promise<Buffer> {
  const q = d.qualification;
  // A WPQ says the welder is qualified; it must never be printed for a coupon that did not pass.
  if (
    d.examination.visual.result !== 'accept' ||
    (d.examination.result ?? d.examination.test?.result) !== 'accept'
  )
    return Promise.reject(
      new RangeError(
        'A WPQ record is issued only for a coupon that passed the visual examination and its bend or volumetric test',
      ),
    );
  const doc = createDocument({
    size: d.paper ?? 'LETTER',
    margins: { top: 44, bottom: 60, left: 46, right: 46 },
    bufferPages: true,
    info: {
      Title: `WPQ record ${q.number} — ${d.welder.name} (${d.welder.stamp})`,
      Author: d.company.name,
      Creator: 'Beadroll',
      Subject: `${CODE_NAMES[q.code]} ${q.process} welder performance qualification`,
    },
  });
  return documentBuffer(doc, () => {
    const l = new FlowLayout(doc, (layout) => drawContinuationHeader(layout, d));
    drawFirstHeader(l, d);

    const process = q.process === 'GMAW' && q.transferMode ? `GMAW (${q.transferMode})` : q.process;
    const fields: Array<[string, string]> = [
      ['Welder', d.welder.name],
      ['Stamp', d.welder.stamp],
      ['Code', CODE_NAMES[q.code]],
      ['Process', process],
      ['WPS', `${q.wps.number} rev ${q.wps.revision}`],
      ['Coupon tested on', formatDate(d.coupon.testedOn)],
      ['Shop', d.coupon.shopName],
      ['Certified on', formatDate(q.certifiedOn)],
    ];
    drawFieldGrid(l, fields, 4);
    if (d.status) {
      const s = d.status;
      const words =
        s.state === 'revoked'
          ? `${STATE_WORDS[s.state]} — this qualification may not be used`
          : s.state === 'lapsed'
            ? `${STATE_WORDS[s.state]} since ${formatDate(s.lapsesOn)} — a renewal test is needed`
            : `${STATE_WORDS[s.state]} — lapses on ${formatDate(s.lapsesOn)} unless continuity is logged`;
      l.text(`Status on ${formatDate(s.asOf)}: ${words}`, {
        size: 9,
        bold: true,
        color: s.state === 'current' ? INK : WARN,
      });
    }

    l.heading('Variables: as tested and as qualified', 90);
    l.table(
      [
        { header: 'Variable', share: 20 },
        { header: 'Actual value (tested)', share: 27 },
        { header: 'Range qualified', share: 30 },
        { header: 'Clause', share: 23 },
      ],
      variableRows(d),
      { size: 9 },
    );

    l.heading('Basis of each limit', 50);
    l.table(
      [
        { header: 'Clause', share: 22 },
        { header: 'What the clause sets', share: 78 },
      ],
      d.ranges.limits.map((lim) => ({ cells: [{ text: lim.clause, bold: true }, lim.text] })),
      { size: 8.5 },
    );

    drawExamination(l, d);
    drawCertification(l, d);
    drawCaution(l, d);

    stampPages(doc, (page, pages) => {
      // pdftotext boxes a 7 pt line about 10 pt tall: 11 pt between lines keeps them apart.
      const y = doc.page.height - 42;
      const y0 = y - (d.verifyUrl ? 11 : 0);
      doc
        .save()
        .moveTo(l.left, y0 - 6)
        .lineTo(l.right, y0 - 6)
        .lineWidth(0.4)
        .strokeColor(HAIRLINE)
        .stroke()
        .restore();
      // Each footer line is drawn at its own y and never wraps: the verify link has a line of its own,
      // in a size that fits the width, so it cannot run into the line below.
      l.style({ size: 7, color: MUTED }).text(`Beadroll rules version ${d.rulesVersion} · Record ${q.number}`, l.left, y0, {
        width: l.width - 70,
        lineBreak: false,
      });
      if (d.verifyUrl) {
        const line = `Check today's status: ${d.verifyUrl}`;
        let size = 7;
        l.style({ size, color: MUTED });
        while (size > 4.5 && doc.widthOfString(line) > l.width) l.style({ size: (size -= 0.25), color: MUTED });
        doc.text(line, l.left, y, { lineBreak: false });
      }
      l.style({ size: 7, color: MUTED }).text(`Page ${page} of ${pages}`, l.right - 70, y0, {
        width: 70,
        align: 'right',
        lineBreak: false,
      });
      l.style({ size: 6.5, color: MUTED }).text(
        'The code edition in force, the company quality manual and the responsible inspector govern this record.',
        l.left,
        y + 11,
        { width: l.width, lineBreak: false },
      );
    });
  });
}
