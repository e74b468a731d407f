// The development mail page: what the local mail catcher stored under $DATA_DIR/mail, newest first.
// Never mounted in production.
import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import { simpleParser, type AddressObject } from 'mailparser';
import { AppError } from '../lib/errors.js';

export interface MailSummary {
  id: string;
  date: string;
  from: string;
  to: string;
  subject: string;
}
export interface MailDetail extends MailSummary {
  text: string;
  html: string;
}

const LIST_LIMIT = 200;
const ID = /^[A-Za-z0-9_-]{1,120}$/;

const addresses = (a: AddressObject | AddressObject[] | undefined) =>
  (Array.isArray(a) ? a : a ? [a] : []).map((x) => x.text).join(', ');

/** Who may read a message: a test on its recipients' addresses (lower case). */
export type MailFilter = (recipients: string[]) => boolean;
export const everyMail: MailFilter = () => true;

const addressesOf = (a: AddressObject | AddressObject[] | undefined) =>
  (Array.isArray(a) ? a : a ? [a] : []).flatMap((x) => x.value.map((v) => (v.address ?? '').toLowerCase()));

async function parse(dir: string, id: string): Promise<MailDetail & { recipients: string[] }> {
  const mail = await simpleParser(await readFile(path.join(dir, `${id}.eml`)));
  return {
    id,
    recipients: [...addressesOf(mail.to), ...addressesOf(mail.cc), ...addressesOf(mail.bcc)],
    date: (mail.date ?? new Date(0)).toISOString(),
    from: addresses(mail.from),
    to: addresses(mail.to),
    subject: mail.subject ?? '',
    text: mail.text ?? '',
    html: typeof mail.html === 'string' ? mail.html : '',
  };
}

export async function listMail(dir: string, may: MailFilter): Promise<{ items: MailSummary[] }> {
  let names: string[];
  try {
    names = await readdir(dir);
  } catch (err) {
    if ((err as { code?: string }).code === 'ENOENT') return { items: [] };
    throw err;
  }
  // File names start with the arrival time, so a reverse sort is newest first.
  const ids = names
    .filter((n) => n.endsWith('.eml'))
    .map((n) => n.slice(0, -4))
    .filter((id) => ID.test(id))
    .sort()
    .reverse();
  const items: MailSummary[] = [];
  for (let i = 0; i < ids.length && items.length < LIST_LIMIT; i += LIST_LIMIT) {
    const batch = await Promise.all(ids.slice(i, i + LIST_LIMIT).map((id) => parse(dir, id)));
    for (const { text: _t, html: _h, recipients, ...summary } of batch)
      if (may(recipients) && items.length < LIST_LIMIT) items.push(summary);
  }
  return { items };
}

export async function getMail(dir: string, id: string, may: MailFilter): Promise<MailDetail> {
  if (!ID.test(id)) throw AppError.notFound('message');
  try {
    const { recipients, ...mail } = await parse(dir, id);
    if (!may(recipients)) throw AppError.notFound('message');
    return mail;
  } catch (err) {
    if ((err as { code?: string }).code === 'ENOENT') throw AppError.notFound('message');
    throw err;
  }
}
