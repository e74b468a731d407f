// The digest e-mail of one lapse-watch run to one recipient: every qualification they are told about,
// soonest lapse first, then the welds a re-check has newly flagged (issue 12), in plain text and HTML,
// each with a link to the welder's file or the weld page.
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

/** A weld a re-check has flagged since the recipient's last digest, still waiting for a disposition. */
export interface DigestWeld {
  weldId: string;
  jobReference: string;
  weldNumber: string;
  weldedOn: string;
  shopName: string;
  cause: string;
  passes: { stamp: string; name: string; process: string; reasons: { message: string; clause: string }[] }[];
}

/** What made the re-check run, in plain words. */
const CAUSES: Record<string, string> = {
  'qualification.revoked': 'a qualification was revoked with an earlier date',
  'continuity-entry.removed': 'a continuity entry was removed or re-dated',
  'continuity-import': 'a continuity import moved or removed logged use',
};
const causeOf = (c: string) => CAUSES[c] ?? 'the records changed';

const reasonsOf = (p: DigestWeld['passes'][number]) =>
  p.reasons.map((r) => (r.clause ? `${r.message} (${r.clause})` : r.message)).join('; ');

/** The code in the trade's words (the rules package's one list of names). */
export const codeName = (code: string) => displayName('codes', code);

const GOVERNS =
  'Dates and weld checks are computed from the continuity log and passing tests. The code edition in force, the ' +
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
  welds?: DigestWeld[];
}): Mail {
  const welds = p.welds ?? [];
  const restored = p.items.filter((i) => i.threshold === 'restored').length;
  const lapsed = p.items.filter((i) => i.threshold !== 'restored' && i.lapsesOn <= p.asOf).length;
  const lapsing = p.items.length - lapsed - restored;
  const parts = [
    lapsing > 0 ? `${lapsing} lapsing` : '',
    lapsed > 0 ? `${lapsed} lapsed` : '',
    restored > 0 ? `${restored} back in continuity` : '',
    welds.length > 0 ? `${welds.length} weld${welds.length === 1 ? '' : 's'} flagged` : '',
  ].filter(Boolean);
  const subject = `${p.companyName} lapse watch ${p.asOf}: ${parts.join(', ')}`;
  const link = (i: DigestItem) => `${p.appUrl}/welders/${i.welderId}`;
  const lastUse = (i: DigestItem) => (i.lastUse ? `last logged use or test ${i.lastUse}` : 'no logged use');

  const weldLink = (w: DigestWeld) => `${p.appUrl}/welds/${w.weldId}`;
  const WELDS_INTRO =
    'Welds newly flagged by a re-check — the welder was not qualified for them on the day welded. Each waits for the QA manager\'s disposition:';
  const lapseText =
    p.items.length === 0
      ? []
      : [
          `Lapse watch for ${p.companyName} on ${p.asOf}: ${restored === p.items.length ? 'a correction of the records changed what you were told about these welders.' : 'these welders need documented use of the process (or a new test) to stay qualified.'}`,
          '',
          ...p.items.map(
            (i) =>
              `- ${i.stamp} ${i.name} · ${i.process} · ${codeName(i.code)} · ${when(i, p.asOf)} · ${lastUse(i)}\n  ${link(i)}`,
          ),
          '',
        ];
  const weldText =
    welds.length === 0
      ? []
      : [
          `${p.items.length === 0 ? `Lapse watch for ${p.companyName} on ${p.asOf}. ` : ''}${WELDS_INTRO}`,
          '',
          ...welds.map(
            (w) =>
              `- Job ${w.jobReference} weld ${w.weldNumber} · welded ${w.weldedOn} · ${w.shopName} · re-checked because ${causeOf(w.cause)}\n` +
              w.passes.map((x) => `  ${x.stamp} ${x.name} · ${x.process}: ${reasonsOf(x)}\n`).join('') +
              `  ${weldLink(w)}`,
          ),
          '',
        ];
  const text = [
    `Hello ${p.recipientName},`,
    '',
    ...lapseText,
    ...weldText,
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
  const weldRows = welds
    .flatMap((w) =>
      w.passes.map(
        (x) =>
          `<tr><td>${escapeHtml(w.jobReference)}</td><td><a href="${escapeHtml(weldLink(w))}">${escapeHtml(w.weldNumber)}</a></td><td>${w.weldedOn}</td><td>${escapeHtml(w.shopName)}</td><td>${escapeHtml(`${x.stamp} ${x.name}`)} · ${escapeHtml(x.process)}</td><td>${escapeHtml(reasonsOf(x))}; re-checked because ${escapeHtml(causeOf(w.cause))}</td></tr>`,
      ),
    )
    .join('\n');
  const html = `<!doctype html><html><body style="font-family: sans-serif">
<p>Hello ${escapeHtml(p.recipientName)},</p>
${
  p.items.length === 0
    ? `<p>Lapse watch for ${escapeHtml(p.companyName)} on ${p.asOf}.</p>`
    : `<p>Lapse watch for ${escapeHtml(p.companyName)} on ${p.asOf}: these welders need documented use of the process (or a new test) to stay qualified.</p>
<table cellpadding="4" style="border-collapse: collapse">
<thead><tr><th align="left">Stamp</th><th align="left">Welder</th><th align="left">Process</th><th align="left">Code</th><th align="left">Lapses on</th><th align="left">Days left</th><th align="left">Last logged use</th></tr></thead>
<tbody>
${rows}
</tbody></table>`
}${
  welds.length === 0
    ? ''
    : `
<p>${escapeHtml(WELDS_INTRO)}</p>
<table cellpadding="4" style="border-collapse: collapse">
<thead><tr><th align="left">Job</th><th align="left">Weld</th><th align="left">Welded</th><th align="left">Shop</th><th align="left">Welder</th><th align="left">Why flagged</th></tr></thead>
<tbody>
${weldRows}
</tbody></table>`
}
<p style="color: #555">${escapeHtml(GOVERNS)}</p>
</body></html>`;
  return { to: p.to, subject, text, html };
}
