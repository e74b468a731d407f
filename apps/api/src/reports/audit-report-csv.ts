// The audit report as one CSV: a row per fact, the section named in the first column, so a spreadsheet
// filter shows one section at a time. Written through the one CSV writer (lib/csv.ts).
import { matrixMarkLetters, type AuditReport } from '@beadroll/rules';
import { toCsv, type CsvCell } from '../lib/csv.js';

const HEADER = ['section', 'stamp', 'welder', 'code', 'process', 'record', 'date', 'status', 'detail', 'clauses'];

export function auditReportCsv(r: AuditReport): string {
  const rows: CsvCell[][] = [];
  for (const x of r.register)
    rows.push(['register', x.stamp, x.name, x.code, x.process, x.number, x.certifiedOn, x.state, `lapses ${x.lapsesOn}; ${x.ranges}`, x.clauses]);
  for (const x of r.matrix.rows)
    x.cells.forEach((c, i) => {
      if (c.length) rows.push(['continuity', x.stamp, x.name, '', x.process, '', r.matrix.months[i], c.join(' '), c.map((m) => matrixMarkLetters[m]).join(''), '']);
    });
  for (const x of r.lapses) rows.push(['lapse', x.stamp, x.name, x.code, x.process, '', x.lapsedOn, 'lapsed', '', '']);
  for (const x of r.renewals) rows.push(['renewal', x.stamp, x.name, x.code, x.process, '', x.renewedOn, 'renewed', '', 'QW-322.2(a) (from memory)']);
  for (const x of r.revocations) rows.push(['revocation', x.stamp, x.name, x.code, x.process, x.number, x.revokedOn, 'revoked', x.reason, '']);
  for (const x of r.flaggedUse)
    rows.push(['flagged use', x.stamp, x.name, '', x.process, '', x.usedOn, x.review, [x.decision, x.note, `job ${x.job}`, `shop ${x.shop}`].filter(Boolean).join('; '), '']);
  for (const x of r.notices)
    rows.push(['notice sent', x.stamp, x.name, '', x.process, x.number, x.sentAt, x.threshold === 'lapsed' ? 'lapsed' : `${x.threshold} days`, `to ${x.recipient}; lapses ${x.lapsesOn}`, '']);
  rows.push(['notice', '', '', '', '', '', r.to, '', r.notice, '']);
  return toCsv(HEADER, rows);
}
