// Reads what the mail catcher stored as .eml files under $DATA_DIR/mail, for assertions on sent e-mail.
import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import { simpleParser, type AddressObject } from 'mailparser';

export interface CaughtMail {
  file: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
}

const cache = new Map<string, CaughtMail>();

const addressesOf = (a: AddressObject | AddressObject[] | undefined) =>
  (Array.isArray(a) ? a : a ? [a] : []).flatMap((x) => x.value.map((v) => (v.address ?? '').toLowerCase()));

/** Every message in the folder addressed to `to`, in arrival order. */
export async function mailsTo(dir: string, to: string): Promise<CaughtMail[]> {
  let names: string[] = [];
  try {
    names = (await readdir(dir)).filter((n) => n.endsWith('.eml')).sort();
  } catch (err) {
    if ((err as { code?: string }).code !== 'ENOENT') throw err;
  }
  const out: CaughtMail[] = [];
  for (const name of names) {
    let mail = cache.get(`${dir}/${name}`);
    if (!mail) {
      const parsed = await simpleParser(await readFile(path.join(dir, name)));
      mail = {
        file: name,
        to: addressesOf(parsed.to),
        subject: parsed.subject ?? '',
        text: parsed.text ?? '',
        html: typeof parsed.html === 'string' ? parsed.html : '',
      };
      cache.set(`${dir}/${name}`, mail);
    }
    if (mail.to.includes(to.toLowerCase())) out.push(mail);
  }
  return out;
}

/** Waits until the `count`-th message to `to` has arrived and returns it. */
export async function waitForMail(
  dir: string,
  to: string,
  opts: { count?: number; timeoutMs?: number } = {},
): Promise<CaughtMail> {
  const count = opts.count ?? 1;
  const deadline = Date.now() + (opts.timeoutMs ?? 10_000);
  for (;;) {
    const mails = await mailsTo(dir, to);
    const mail = mails[count - 1];
    if (mail) return mail;
    if (Date.now() > deadline)
      throw new Error(`no e-mail #${count} to ${to} in ${dir} (found ${mails.length})`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** The set-password token of a link e-mail. */
export function linkToken(mail: CaughtMail): string {
  const m = /\/set-password\?token=([A-Za-z0-9_-]+)/.exec(mail.text);
  if (!m?.[1]) throw new Error(`no set-password link in: ${mail.text}`);
  return m[1];
}
