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

async function parse(dir: string, id: string): Promise<MailDetail> {
  const mail = await simpleParser(await readFile(path.join(dir, `${id}.eml`)));
  return {
    id,
    date: (mail.date ?? new Date(0)).toISOString(),
    from: addresses(mail.from),
    to: addresses(mail.to),
    subject: mail.subject ?? '',
    text: mail.text ?? '',
    html: typeof mail.html === 'string' ? mail.html : '',
  };
}

export async function listMail(dir: string): Promise<{ items: MailSummary[] }> {
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
    .reverse()
    .slice(0, LIST_LIMIT);
  const items = await Promise.all(
    ids.map((id) => parse(dir, id).then(({ text: _t, html: _h, ...summary }) => summary)),
  );
  return { items };
}

export async function getMail(dir: string, id: string): Promise<MailDetail> {
  if (!ID.test(id)) throw AppError.notFound('message');
  try {
    return await parse(dir, id);
  } catch (err) {
    if ((err as { code?: string }).code === 'ENOENT') throw AppError.notFound('message');
    throw err;
  }
}
