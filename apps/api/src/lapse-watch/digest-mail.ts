// The digest e-mail of one lapse-watch run to one recipient: every qualification they are told about,
// soonest lapse first, in plain text and HTML, each with a link to the welder's file.
import { addDays, daysBetween, displayName } from '@beadroll/rules';
import { escapeHtml, type Mail } from '../lib/mailer.js';

export interface DigestItem {
  welderId: string;
  stamp: string;
  name: string;
  process: string;
  code: string;
  /** 'lapsed', a lead time in days, or 'restored' (the lapse moved away again). */
  threshold: string;
  lapsesOn: string;
  lastUse: string | null;
}

/** The code in the trade's words (the rules package's one list of names). */
export const codeName = (code: string) => displayName('codes', code);

const GOVERNS =
  'Dates are computed from the continuity log and passing tests. The code edition in force, the ' +
  "company's quality manual and the responsible inspector govern.";

function when(item: DigestItem, asOf: string): string {
  const days = daysBetween(asOf, item.lapsesOn);
  if (item.threshold === 'restored')
    return `back in continuity after a correction of the records; now lapses on ${item.lapsesOn} (${days} days left)`;
  if (days > 0) return `lapses on ${item.lapsesOn} (${days} day${days === 1 ? '' : 's'} left)`;
  // lapsesOn is the first day without qualification; the last qualified day is the day before.
  const ago = -days;
  return `lapsed on ${item.lapsesOn} (${ago === 0 ? 'today' : `${ago} day${ago === 1 ? '' : 's'} ago`}; last qualified day ${addDays(item.lapsesOn, -1)})`;
}

export function digestMail(p: {
  to: string;
  recipientName: string;
  companyName: string;
  asOf: string;
  appUrl: string;
  items: DigestItem[];
}): Mail {
  const restored = p.items.filter((i) => i.threshold === 'restored').length;
  const lapsed = p.items.filter((i) => i.threshold !== 'restored' && i.lapsesOn <= p.asOf).length;
  const lapsing = p.items.length - lapsed - restored;
  const parts = [
    lapsing > 0 ? `${lapsing} lapsing` : '',
    lapsed > 0 ? `${lapsed} lapsed` : '',
    restored > 0 ? `${restored} back in continuity` : '',
  ].filter(Boolean);
  const subject = `${p.companyName} lapse watch ${p.asOf}: ${parts.join(', ')}`;
  const link = (i: DigestItem) => `${p.appUrl}/welders/${i.welderId}`;
  const lastUse = (i: DigestItem) => (i.lastUse ? `last logged use or test ${i.lastUse}` : 'no logged use');

  const text = [
    `Hello ${p.recipientName},`,
    '',
    `Lapse watch for ${p.companyName} on ${p.asOf}: ${restored === p.items.length ? 'a correction of the records changed what you were told about these welders.' : 'these welders need documented use of the process (or a new test) to stay qualified.'}`,
    '',
    ...p.items.map(
      (i) =>
        `- ${i.stamp} ${i.name} · ${i.process} · ${codeName(i.code)} · ${when(i, p.asOf)} · ${lastUse(i)}\n  ${link(i)}`,
    ),
    '',
    GOVERNS,
    '',
    '— Beadroll',
  ].join('\n');

  const rows = p.items
    .map((i) => {
      const days = daysBetween(p.asOf, i.lapsesOn);
      return `<tr><td>${escapeHtml(i.stamp)}</td><td><a href="${escapeHtml(link(i))}">${escapeHtml(i.name)}</a></td><td>${escapeHtml(i.process)}</td><td>${escapeHtml(codeName(i.code))}</td><td>${i.lapsesOn}</td><td>${i.threshold === 'restored' ? `back in continuity (${days})` : days > 0 ? String(days) : 'lapsed'}</td><td>${i.lastUse ?? '—'}</td></tr>`;
    })
    .join('\n');
  const html = `<!doctype html><html><body style="font-family: sans-serif">
<p>Hello ${escapeHtml(p.recipientName)},</p>
<p>Lapse watch for ${escapeHtml(p.companyName)} on ${p.asOf}: these welders need documented use of the process (or a new test) to stay qualified.</p>
<table cellpadding="4" style="border-collapse: collapse">
<thead><tr><th align="left">Stamp</th><th align="left">Welder</th><th align="left">Process</th><th align="left">Code</th><th align="left">Lapses on</th><th align="left">Days left</th><th align="left">Last logged use</th></tr></thead>
<tbody>
${rows}
</tbody></table>
<p style="color: #555">${escapeHtml(GOVERNS)}</p>
</body></html>`;
  return { to: p.to, subject, text, html };
}
