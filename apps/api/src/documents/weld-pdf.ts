// The auditor's answer for one production weld, and the summary of a job: who made each weld, whether
// each welder was qualified for the joint and in continuity on the day welded, the reasons and clauses
// when not, and the proof chain (the WPQ with its coupon and limits, the continuity evidence that kept it
// in force that day, any revocation) — in the typography of the WPQ record.
import type { QualifiedOnAnswer, Weld } from '@beadroll/rules';
import { weldCheckWords as checkText, weldDispositionNames, weldExaminationWords as examinationText, weldJointWords as jointText, weldLayerNames } from '@beadroll/rules';
import { toCsv } from '../lib/csv.js';
import { formatDate } from './document-format.js';
import { createDocument, documentBuffer } from './fonts.js';
import { FlowLayout, HAIRLINE, INK, MUTED, WARN, stampPages, type Row } from './pdf-layout.js';
import { drawCautionBox, drawDocumentHeader, drawFieldGrid, wpqCaution } from './wpq-pdf.js';

export interface WeldDocumentData {
  company: { name: string };
  weld: Weld;
  /** The qualified-on answer of each pass, by pass id. */
  proof: Map<string, QualifiedOnAnswer>;
  printedOn: string;
}

export interface JobSummaryData {
  company: { name: string };
  job: string;
  welds: Weld[];
  printedOn: string;
  rulesVersion: string;
}

function footer(doc: PDFKit.PDFDocument, l: FlowLayout, line: string): void {
  stampPages(doc, (page, pages) => {
    const y = doc.page.height - 42;
    doc.save().moveTo(l.left, y - 6).lineTo(l.right, y - 6).lineWidth(0.4).strokeColor(HAIRLINE).stroke().restore();
    l.style({ size: 7, color: MUTED }).text(line, l.left, y, { width: l.width - 70, lineBreak: false });
    l.style({ size: 7, color: MUTED }).text(`Page ${page} of ${pages}`, l.right - 70, y, { width: 70, align: 'right', lineBreak: false });
    l.style({ size: 6.5, color: MUTED }).text(
      'The code edition in force, the company quality manual and the responsible inspector govern this record.',
      l.left,
      y + 11,
      { width: l.width, lineBreak: false },
    );
  });
}

const STATE_WORDS: Record<string, string> = {
  'in-force': 'In force',
  'not-yet-qualified': 'Not yet qualified',
  superseded: 'Superseded',
  revoked: 'Revoked',
  lapsed: 'Lapsed',
};

function drawPass(l: FlowLayout, w: Weld, p: Weld['passes'][number], answer: QualifiedOnAnswer | undefined): void {
  l.heading(`${p.welder.stamp} ${p.welder.name} · ${p.process} · ${weldLayerNames[p.layer]}`, 80);
  l.text(
    p.qualified
      ? `Qualified for this joint and in continuity on ${formatDate(w.weldedOn)}${p.qualificationNumber ? ` under ${p.qualificationNumber}` : ''}.`
      : `Not qualified for this joint on ${formatDate(w.weldedOn)}.`,
    { size: 10, bold: true, color: p.qualified ? INK : WARN },
  );
  l.text(p.countedForContinuity ? 'This weld counts as documented use of the process.' : 'This weld does not count as documented use of the process.', { size: 8.5, color: MUTED });
  if (p.reasons.length) {
    l.gap(4);
    l.table(
      [
        { header: 'Reason', share: 75 },
        { header: 'Clause', share: 25 },
      ],
      p.reasons.map((r) => ({ cells: [r.message, { text: r.clause, bold: true }] })),
      { size: 8.5 },
    );
  }
  const quals = answer?.evidence.qualifications ?? [];
  for (const q of quals) {
    if (p.qualificationId && q.id !== p.qualificationId && p.qualified) continue;
    l.gap(6);
    l.text(
      `${q.number} · ${q.codeName} ${q.process} · certified ${formatDate(q.certifiedOn)} by ${q.certifiedBy} · coupon tested ${formatDate(q.coupon.testedOn)} (${q.coupon.testPosition}, WPS ${q.coupon.wps}; ${q.coupon.examination})`,
      { size: 9, bold: true },
    );
    if (q.limits.length)
      l.table(
        [
          { header: 'Limit qualified', share: 75 },
          { header: 'Clause', share: 25 },
        ],
        q.limits.map((lim) => ({ cells: [lim.text, { text: lim.clause, bold: true }] })),
        { size: 8 },
      );
    const c = q.continuity;
    l.gap(3);
    l.text(
      `Continuity on ${formatDate(w.weldedOn)}: ${STATE_WORDS[c.state] ?? c.state}${c.lapsesOn ? `; in force until ${formatDate(c.lapsesOn)} on the evidence up to that day` : ''} (${c.clause}: ${c.rule})`,
      { size: 8.5, color: c.inForce ? INK : WARN },
    );
    const ev: Row[] = c.evidence.map((e) => ({
      cells: [
        e.date,
        e.kind === 'test' ? 'Test' : e.source === 'continuity-log' ? 'Logged use' : e.source === 'weld-log' ? 'Production weld' : 'Use',
        [e.job ? `job ${e.job}` : '', e.weldNumber ? `weld ${e.weldNumber}` : '', e.shop ?? ''].filter(Boolean).join(', ') || '—',
        [e.loggedBy ?? '', e.loggedAt ? formatDate(e.loggedAt.slice(0, 10)) : ''].filter(Boolean).join(', ') || '—',
        e.counted ? (e.renewal ? 'Counted (renewal)' : 'Counted') : `Not counted${e.note ? `: ${e.note}` : ''}`,
      ],
    }));
    if (ev.length)
      l.table(
        [
          { header: 'Date', share: 14 },
          { header: 'Evidence', share: 14 },
          { header: 'Where', share: 26 },
          { header: 'Logged by', share: 20 },
          { header: 'Verdict', share: 26 },
        ],
        ev,
        { size: 8 },
      );
    if (q.revocation)
      l.text(`Revoked on ${formatDate(q.revocation.revokedOn)}: ${q.revocation.reason}${q.revocation.by ? ` (${q.revocation.by})` : ''}`, { size: 8.5, bold: true, color: WARN });
  }
}

/** One production weld with the proof of each welder, as a PDF (Letter, portrait). */
export function renderWeldPdf(d: WeldDocumentData): Promise<Buffer> {
  const w = d.weld;
  const doc = createDocument({
    size: 'LETTER',
    margins: { top: 44, bottom: 60, left: 46, right: 46 },
    bufferPages: true,
    info: { Title: `Weld ${w.weldNumber}, job ${w.jobReference}`, Author: d.company.name, Creator: 'Beadroll', Subject: 'Production weld record' },
  });
  return documentBuffer(doc, () => {
    const l = new FlowLayout(doc, (layout) => {
      layout.style({ size: 8, color: MUTED }).text(`Weld ${w.weldNumber}, job ${w.jobReference} · ${d.company.name} (continued)`, layout.left, layout.y, { width: layout.width, lineBreak: false });
      layout.y += 14;
    });
    drawDocumentHeader(l, 'Production weld record', d.company.name, `Job ${w.jobReference} · weld ${w.weldNumber}`);
    drawFieldGrid(
      l,
      [
        ['Job', w.jobReference],
        ['Weld', w.weldNumber],
        ['Date welded', formatDate(w.weldedOn)],
        ['Shop', w.shop.name],
        ['WPS', w.procedure ? `${w.procedure.number} rev ${w.procedure.revision}` : '—'],
        ['Examination', examinationText(w.examination)],
        ['Check on entry', checkText(w)],
        ['Logged by', `${w.loggedBy ?? '—'}, ${formatDate(w.createdAt.slice(0, 10))}`],
      ],
      4,
    );
    l.text(`Joint: ${jointText(w.joint)}`, { size: 9.5 });
    if (w.note) l.text(`Note: ${w.note}`, { size: 9 });
    for (const p of w.passes) drawPass(l, w, p, d.proof.get(p.id));
    if (w.disposition) {
      l.heading('Disposition', 30);
      l.text(`${weldDispositionNames[w.disposition.decision]}: ${w.disposition.reason}`, { size: 9.5, bold: true });
      l.text(`by ${w.disposition.by ?? '—'}, ${formatDate(w.disposition.at.slice(0, 10))}`, { size: 8.5, color: MUTED });
    }
    drawCautionBox(l, wpqCaution(d.company.name, w.rulesVersion));
    footer(doc, l, `Beadroll rules version ${w.rulesVersion} · checked ${formatDate(w.checkedAt.slice(0, 10))} · printed ${formatDate(d.printedOn)}`);
  });
}

/** Every weld of a job with its welders and check, as a PDF (Letter, landscape). */
export function renderJobSummaryPdf(d: JobSummaryData): Promise<Buffer> {
  const doc = createDocument({
    size: 'LETTER',
    layout: 'landscape',
    margins: { top: 40, bottom: 56, left: 40, right: 40 },
    bufferPages: true,
    info: { Title: `Job ${d.job}: production welds`, Author: d.company.name, Creator: 'Beadroll', Subject: 'Job summary' },
  });
  return documentBuffer(doc, () => {
    const l = new FlowLayout(doc, (layout) => {
      layout.style({ size: 8, color: MUTED }).text(`Job ${d.job} · ${d.company.name} (continued)`, layout.left, layout.y, { width: layout.width, lineBreak: false });
      layout.y += 14;
    });
    drawDocumentHeader(l, `Job ${d.job}: production welds`, d.company.name, `${d.welds.length} welds · ${d.welds.filter((w) => w.flagged).length} flagged`);
    l.table(
      [
        { header: 'Weld', share: 8 },
        { header: 'Welded', share: 10 },
        { header: 'Shop', share: 8 },
        { header: 'WPS', share: 9 },
        { header: 'Welders (process, part): check', share: 30 },
        { header: 'Joint', share: 22 },
        { header: 'Result', share: 13 },
      ],
      d.welds.map((w) => ({
        cells: [
          { text: w.weldNumber, bold: true },
          w.weldedOn,
          w.shop.code,
          w.procedure ? `${w.procedure.number} rev ${w.procedure.revision}` : '—',
          w.passes
            .map((p) => `${p.welder.stamp} ${p.process} (${weldLayerNames[p.layer].toLowerCase()}): ${p.qualified ? `qualified${p.qualificationNumber ? `, ${p.qualificationNumber}` : ''}` : `not qualified — ${p.reasons.map((r) => `${r.message} (${r.clause})`).join(' ')}`}`)
            .join('\n'),
          jointText(w.joint),
          { text: checkText(w), bold: w.flagged, color: w.flagged && !w.disposition ? WARN : INK },
        ],
      })),
      { size: 8 },
    );
    drawCautionBox(l, wpqCaution(d.company.name, d.rulesVersion));
    footer(doc, l, `Beadroll rules version ${d.rulesVersion} · printed ${formatDate(d.printedOn)}`);
  });
}

/** The job summary as CSV: one row per welder of each weld. */
export function jobSummaryCsv(d: JobSummaryData): string {
  const head = ['Job', 'Weld', 'Date welded', 'Shop', 'WPS', 'Stamp', 'Welder', 'Process', 'Part', 'Qualified', 'WPQ', 'Reasons and clauses', 'Check', 'Disposition', 'Rules version'];
  const rows = d.welds.flatMap((w) =>
    w.passes.map((p) => [
      w.jobReference,
      w.weldNumber,
      w.weldedOn,
      w.shop.code,
      w.procedure ? `${w.procedure.number} rev ${w.procedure.revision}` : '',
      p.welder.stamp,
      p.welder.name,
      p.process,
      weldLayerNames[p.layer],
      p.qualified ? 'yes' : 'no',
      p.qualificationNumber ?? '',
      p.reasons.map((r) => `${r.message} (${r.clause})`).join(' '),
      checkText(w),
      w.disposition ? `${weldDispositionNames[w.disposition.decision]}: ${w.disposition.reason}` : '',
      w.rulesVersion,
    ]),
  );
  return toCsv(head, rows);
}
