// The audit report as a PDF, in the WPQ record's typography (Source Sans 3, the same flow layout, header
// band, section headings and tables): summary, register as of the period's end, continuity matrix,
// lapses, renewals, revocations, flagged use with its dispositions, lapse-watch notices sent.
import { matrixMarkLetters, type AuditReport } from '@beadroll/rules';
import { createDocument, documentBuffer } from './fonts.js';
import { ACCENT, FlowLayout, HAIRLINE, MUTED, WARN, stampPages, type Row } from './pdf-layout.js';
import { CODE_NAMES, STATE_WORDS, formatDate } from './document-format.js';

const codeName = (c: string) => CODE_NAMES[c as keyof typeof CODE_NAMES] ?? c;
const none = (what: string): Row[] => [{ span: { text: `No ${what} in this period.`, color: MUTED } }];

function header(l: FlowLayout, r: AuditReport): void {
  const top = l.y;
  l.style({ size: 8, bold: true, color: ACCENT }).text('BEADROLL', l.left, top, { characterSpacing: 2, lineBreak: false });
  l.style({ size: 17, bold: true }).text('Audit report', l.left, top + 12, { width: l.width * 0.6 });
  const rw = l.width * 0.4;
  l.style({ size: 11, bold: true }).text(r.company, l.right - rw, top + 2, { width: rw, align: 'right' });
  l.style({ size: 8.5, color: MUTED }).text(
    `${r.shop ? `Shop ${r.shop.code} — ${r.shop.name}` : 'Every shop'} · ${formatDate(r.from)} to ${formatDate(r.to)}`,
    l.right - rw,
    l.doc.y + 1,
    { width: rw, align: 'right' },
  );
  l.y = Math.max(l.doc.y, top + 36) + 8;
  l.doc.save().rect(l.left, l.y, l.width, 2).fill(ACCENT).restore();
  l.y += 10;
}

export function renderAuditReportPdf(r: AuditReport): Promise<Buffer> {
  const doc = createDocument({
    size: 'LETTER',
    layout: 'landscape',
    margins: { top: 40, bottom: 56, left: 40, right: 40 },
    bufferPages: true,
    info: { Title: `Audit report ${r.from} to ${r.to} — ${r.company}`, Author: r.company, Creator: 'Beadroll' },
  });
  return documentBuffer(doc, () => {
    const l = new FlowLayout(doc, (layout) => {
      layout.style({ size: 8, color: MUTED }).text(`Audit report · ${r.company} · ${r.from} to ${r.to} (continued)`, layout.left, layout.y, {
        width: layout.width,
        lineBreak: false,
      });
      layout.y += 14;
      layout.rule(HAIRLINE);
      layout.y += 6;
    });
    header(l, r);
    const s = r.summary;
    l.heading('In figures');
    l.table(
      [
        { header: 'Welders', share: 10 },
        { header: `Qualifications on ${formatDate(r.to)}`, share: 34 },
        { header: 'Lapses', share: 10 },
        { header: 'Renewals', share: 10 },
        { header: 'Revocations', share: 10 },
        { header: 'Flagged use (waiting / reviewed)', share: 16 },
        { header: 'Notices sent', share: 10 },
      ],
      [
        {
          cells: [
            String(s.welders),
            (['current', 'lapsing', 'lapsed', 'revoked'] as const).map((k) => `${s.qualifications[k] ?? 0} ${STATE_WORDS[k].toLowerCase()}`).join(', '),
            String(s.lapses),
            String(s.renewals),
            String(s.revocations),
            `${s.flaggedUse.pending} / ${s.flaggedUse.reviewed}`,
            String(s.noticesSent),
          ],
        },
      ],
      { size: 9 },
    );

    l.heading(`Qualification register on ${formatDate(r.to)}`);
    l.table(
      [
        { header: 'Stamp', share: 7 },
        { header: 'Welder', share: 13 },
        { header: 'Record', share: 10 },
        { header: 'Code · process', share: 12 },
        { header: 'Certified', share: 8 },
        { header: 'Status', share: 13 },
        { header: 'Ranges qualified', share: 22 },
        { header: 'Clauses', share: 15 },
      ],
      r.register.length
        ? r.register.map((x) => ({
            cells: [
              x.stamp,
              x.name,
              x.number,
              `${codeName(x.code)} · ${x.process}`,
              x.certifiedOn,
              {
                text: x.state === 'revoked' ? STATE_WORDS.revoked : `${STATE_WORDS[x.state]} (lapses ${x.lapsesOn})`,
                color: x.state === 'current' ? undefined : WARN,
                bold: x.state !== 'current',
              },
              x.ranges,
              x.clauses,
            ],
          }))
        : none('qualifications'),
      { size: 7.5 },
    );

    l.heading('Continuity by month (T tested · U used · F flagged use · L lapsed)');
    const months = r.matrix.months;
    l.table(
      [{ header: 'Welder · process', share: 16 }, ...months.map((m) => ({ header: m.slice(2), share: 84 / Math.max(months.length, 1) }))],
      r.matrix.rows.length
        ? r.matrix.rows.map((x) => ({
            cells: [`${x.stamp} · ${x.process}`, ...x.cells.map((c) => ({ text: c.map((m) => matrixMarkLetters[m]).join(' '), bold: c.includes('lapsed') || c.includes('flagged'), color: c.includes('lapsed') || c.includes('flagged') ? WARN : undefined }))],
          }))
        : none('continuity'),
      { size: 7 },
    );

    l.heading('Lapses in the period');
    l.table(
      [{ header: 'Stamp', share: 12 }, { header: 'Welder', share: 30 }, { header: 'Code · process', share: 30 }, { header: 'Lapsed on', share: 28 }],
      r.lapses.length ? r.lapses.map((x) => ({ cells: [x.stamp, x.name, `${codeName(x.code)} · ${x.process}`, x.lapsedOn] })) : none('lapses'),
      { size: 8 },
    );
    l.heading('Renewals in the period (from memory: QW-322.2(a) — a passing test renews a lapsed qualification)');
    l.table(
      [{ header: 'Stamp', share: 12 }, { header: 'Welder', share: 30 }, { header: 'Code · process', share: 30 }, { header: 'Renewed on', share: 28 }],
      r.renewals.length ? r.renewals.map((x) => ({ cells: [x.stamp, x.name, `${codeName(x.code)} · ${x.process}`, x.renewedOn] })) : none('renewals'),
      { size: 8 },
    );
    l.heading('Revocations in the period');
    l.table(
      [{ header: 'Stamp', share: 8 }, { header: 'Welder', share: 18 }, { header: 'Record', share: 12 }, { header: 'Code · process', share: 17 }, { header: 'Revoked on', share: 10 }, { header: 'Reason', share: 35 }],
      r.revocations.length ? r.revocations.map((x) => ({ cells: [x.stamp, x.name, x.number, `${codeName(x.code)} · ${x.process}`, x.revokedOn, x.reason] })) : none('revocations'),
      { size: 8 },
    );
    l.heading('Use logged while out of continuity, and what was decided');
    l.table(
      [{ header: 'Stamp', share: 8 }, { header: 'Welder', share: 15 }, { header: 'Process', share: 7 }, { header: 'Used on', share: 9 }, { header: 'Job · shop', share: 14 }, { header: 'Review', share: 11 }, { header: 'Decision', share: 16 }, { header: 'Note', share: 20 }],
      r.flaggedUse.length
        ? r.flaggedUse.map((x) => ({ cells: [x.stamp, x.name, x.process, x.usedOn, `${x.job} · ${x.shop}`, x.review, x.decision, x.note] }))
        : none('flagged use'),
      { size: 8 },
    );
    l.heading('Lapse-watch notices sent');
    l.table(
      [{ header: 'Stamp', share: 8 }, { header: 'Welder', share: 17 }, { header: 'Record · process', share: 17 }, { header: 'Notice', share: 14 }, { header: 'Lapses on', share: 10 }, { header: 'Sent to', share: 20 }, { header: 'Sent at (UTC)', share: 14 }],
      r.notices.length
        ? r.notices.map((x) => ({
            cells: [x.stamp, x.name, `${x.number} · ${x.process}`, x.threshold === 'lapsed' ? 'lapsed' : `${x.threshold} days before`, x.lapsesOn, x.recipient, x.sentAt.replace('T', ' ')],
          }))
        : none('notices sent'),
      { size: 8 },
    );
    l.gap(10);
    l.text(r.notice, { size: 8, color: MUTED });

    stampPages(doc, (page, pages) => {
      const y = doc.page.height - 40;
      l.style({ size: 7, color: MUTED }).text(`Generated ${r.generatedAt.slice(0, 16).replace('T', ' ')} UTC by Beadroll`, l.left, y, {
        width: l.width - 80,
        lineBreak: false,
      });
      l.style({ size: 7, color: MUTED }).text(`Page ${page} of ${pages}`, l.right - 80, y, { width: 80, align: 'right', lineBreak: false });
      l.style({ size: 6.5, color: MUTED }).text(
        'The code edition in force, the company quality manual and the responsible inspector govern every range and status in this report.',
        l.left,
        y + 11,
        { width: l.width, lineBreak: false },
      );
    });
  });
}
