// Journey of a qualification from the test coupon to the inspector's check: the QA manager enters a WPS,
// records a coupon for the demo welder PV-07 with discontinuities typed as fractions and watches the live
// verdict turn to Reject and back, attaches a photo of the specimen, saves, certifies, downloads the WPQ
// PDF from the welder file and issues the verify link; the welder sees the new qualification; an
// inspector without an account opens the verify link and sees the welder current today.
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { PNG } from 'pngjs';
import type { Browser, Page } from 'playwright-core';
import { formatDay } from '@beadroll/rules';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, newSession, pageErrors } from '../support/browser.js';
import { demo, signIn, signOut } from '../support/e2e-demo.js';

let browser: Browser;
let dir: string;
let photoPath: string;

/** A plain drawing of a bent specimen (a grey bar on white), made here so no real photo is involved. */
function specimenPng(): Buffer {
  const png = new PNG({ width: 48, height: 24 });
  for (let y = 0; y < png.height; y += 1)
    for (let x = 0; x < png.width; x += 1) {
      const i = (png.width * y + x) << 2;
      const bar = y > 8 && y < 16;
      png.data[i] = bar ? 120 : 255;
      png.data[i + 1] = bar ? 120 : 255;
      png.data[i + 2] = bar ? 130 : 255;
      png.data[i + 3] = 255;
    }
  return PNG.sync.write(png);
}

beforeAll(async () => {
  browser = await launchBrowser();
  dir = await mkdtemp(path.join(tmpdir(), 'beadroll-e2e-'));
  photoPath = path.join(dir, 'side-bend-1.png');
  await writeFile(photoPath, specimenPng());
});
afterAll(async () => {
  await browser?.close();
  if (dir) await rm(dir, { recursive: true, force: true });
});

const runId = Date.now().toString(36).slice(-5).toUpperCase();
const today = new Date().toISOString().slice(0, 10);
const wps = `E2E-WPS-${runId}`;

/** The live verdict panel's result word (the panel is a polite live region named "Evaluation"). */
const verdictOf = (page: Page) => page.getByRole('region', { name: 'Evaluation' });

let verifyUrl = '';

/** A one-page PDF written by hand (header, catalog, page, xref): enough for a check of its bytes. */
function tinyPdf(): Buffer {
  const objects = ['<< /Type /Catalog /Pages 2 0 R >>', '<< /Type /Pages /Kids [3 0 R] /Count 1 >>', '<< /Type /Page /Parent 2 0 R /MediaBox [0 0 200 200] >>'];
  let body = '%PDF-1.4\n';
  const offsets: number[] = [];
  objects.forEach((o, i) => {
    offsets.push(body.length);
    body += `${i + 1} 0 obj\n${o}\nendobj\n`;
  });
  const xref = body.length;
  body += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n${offsets.map((o) => `${String(o).padStart(10, '0')} 00000 n \n`).join('')}`;
  body += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  return Buffer.from(body, 'latin1');
}

describe('from the coupon to the Verify page', () => {
  it('QA manager: records a coupon with a live verdict, certifies it and downloads the WPQ PDF', async () => {
    const { page, context } = await newSession(browser, { width: 1366, height: 1000 });
    await signIn(page, demo.qa.email);

    // A WPS to weld the coupon to, entered in the register.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Procedures' }).click();
    await page.getByRole('heading', { name: 'Procedures' }).waitFor();
    await page.getByRole('button', { name: 'Add WPS' }).click();
    const wpsDialog = page.getByRole('dialog', { name: 'Add a WPS' });
    await wpsDialog.getByLabel('WPS number').fill(wps);
    await wpsDialog.getByLabel('Revision').fill('A');
    await wpsDialog.getByLabel('Code').selectOption('asme-ix');
    await wpsDialog.getByRole('button', { name: 'Add WPS' }).click();
    // The register's schema names the missing process before anything is sent.
    await wpsDialog.getByText('Choose at least one process').waitFor();
    await wpsDialog.getByLabel('SMAW').check();
    await wpsDialog.getByLabel('F-No.').fill('4');
    await wpsDialog.getByLabel('Thickness from').fill('3/16');
    await wpsDialog.getByText('Reads as 3/16 in (4.76 mm)').waitFor();
    await wpsDialog.getByLabel('Thickness to').fill('3/4');
    await wpsDialog.getByRole('button', { name: 'Add WPS' }).click();
    await wpsDialog.waitFor({ state: 'hidden' });
    const wpsRow = page.getByRole('row', { name: new RegExp(wps) });
    await wpsRow.getByText('Active').waitFor();
    expect(await wpsRow.getByRole('cell', { name: '3/16 in to 3/4 in' }).count()).toBe(1);

    // The demo welder's file, and a coupon recorded from it (the welder preselected).
    await page.goto(`/welders?q=${demo.welder.stamp}`);
    await page.getByRole('link', { name: demo.welder.stamp, exact: true }).click();
    await page.getByRole('heading', { name: new RegExp(`${demo.welder.stamp}.*${demo.welder.name}`) }).waitFor();
    await page.getByRole('link', { name: `Record a coupon for ${demo.welder.stamp}` }).click();
    await page.getByRole('heading', { name: 'Record a coupon' }).waitFor();
    expect(await page.getByLabel('Welder').locator('option:checked').textContent()).toContain(demo.welder.stamp);

    await page.getByLabel('Code').selectOption('asme-ix');
    await page.getByLabel('Process').selectOption('SMAW');
    await page.getByLabel('WPS', { exact: true }).selectOption({ label: `${wps} rev A` });
    await page.getByLabel('Test position').selectOption('3G');
    await page.getByLabel('Backing').selectOption('with');
    await page.getByLabel('Coupon thickness').fill('3/8');
    await page.getByText('Reads as 3/8 in (9.52 mm)').waitFor();
    await page.getByLabel('F-No.').fill('4');
    await page.getByLabel('Vertical progression').selectOption('uphill');
    await page.getByLabel('Examiner name').fill('Test Examiner');
    await page.getByLabel('Examiner certificate number').fill(`EX-${runId}`);
    await page.getByLabel('Visual examination').selectOption('accept');

    // 3/8 in deposited: ASME IX QW-452.1(a) asks for two side bends, proposed by the form.
    await page.getByRole('group', { name: 'Specimen 2 (side)' }).waitFor();
    // Nothing is judged before each specimen is marked examined.
    await verdictOf(page).getByText('Not yet examined').waitFor();
    await page.getByRole('checkbox', { name: 'Specimen 1 (side) examined' }).check();
    await page.getByRole('checkbox', { name: 'Specimen 2 (side) examined' }).check();
    // The ranges preview names the clause behind its limits.
    await page.getByText('Qualified ranges if this coupon passes').waitFor();
    await page.getByText('QW-461.9', { exact: true }).first().waitFor();

    const first = 'Specimen 1 (side)';
    await page.getByRole('button', { name: `Add a discontinuity to ${first}` }).click();
    const size = (n: number) => page.getByLabel(`Size of ${first}, discontinuity ${n}`);
    await size(1).fill('1/16');
    await page.getByText('Reads as 1/16 in (1.59 mm)').waitFor();
    // Enter in a size field adds the next discontinuity and puts the cursor in it.
    await size(1).press('Enter');
    await page.keyboard.type('1/32');
    await page.getByText('Reads as 1/32 in (0.79 mm)').waitFor();
    await verdictOf(page).getByText('Accept', { exact: true }).waitFor();
    expect(await verdictOf(page).getByText('Reject', { exact: true }).count()).toBe(0);

    // Typing a size that does not read says so at the field.
    await size(2).press('Enter');
    await size(3).fill('3/');
    await page.getByText(/"3\/" is not a length/).waitFor();
    // A third over 1/8 in (ASME IX QW-163) turns the live verdict to Reject, with the clause and reason.
    await size(3).fill('3/16');
    await verdictOf(page).getByText('Reject', { exact: true }).waitFor();
    await verdictOf(page).getByText(/larger than the largest single discontinuity allowed \(measured 3\/16 in, allowed 1\/8 in\)/).waitFor();
    await verdictOf(page).getByText('ASME IX QW-163').first().waitFor();
    await page.screenshot({ path: '/tmp/beadroll-coupon-reject.png', fullPage: true });

    // Measured again: 3/32 in is within the limit, and the verdict is Accept again.
    await size(3).fill('3/32');
    await verdictOf(page).getByText('Accept', { exact: true }).waitFor();
    expect(await verdictOf(page).getByText('Reject', { exact: true }).count()).toBe(0);

    // A photo of the bent specimen, checked by content on the server.
    await page.getByLabel(`Photo of ${first}`).setInputFiles(photoPath);
    await page.getByRole('link', { name: 'side-bend-1.png' }).waitFor();

    // The server's 400 lands at the field it names: a test date in the future is refused.
    const tomorrow = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);
    await page.getByLabel('Test date').fill(tomorrow);
    await page.getByRole('button', { name: 'Save coupon' }).click();
    await page.getByText('The test date cannot be in the future').first().waitFor();
    expect(await page.getByLabel('Test date').getAttribute('aria-invalid')).toBe('true');
    expect(new URL(page.url()).pathname).toBe('/coupons/new');
    await page.getByLabel('Test date').fill(today);
    expect(await page.getByLabel('Test date').getAttribute('aria-invalid')).toBeNull();

    await page.getByRole('button', { name: 'Save coupon' }).click();
    await page.waitForURL(/\/coupons\/[0-9a-f-]{36}$/);
    const stored = page.getByRole('region', { name: 'Stored verdict' });
    await stored.getByText('Accept', { exact: true }).waitFor();
    // The criteria are named in the trade's words with their clause, never by an internal code.
    await stored.getByText(/^Judged by ASME Section IX guided bend \(ASME IX QW-163\) · rules version /).waitFor();
    expect(await stored.getByText(/asme-ix/).count()).toBe(0);
    // The examination is shown part by part with the verdict on each.
    await page.getByRole('region', { name: 'Guided bend tests' }).getByText('Accept', { exact: true }).first().waitFor();
    // Specimens are stored with the marks stamped on them (S1, S2 for side bends).
    await page.getByRole('img', { name: /Photo of S1/ }).waitFor();

    await page.getByRole('button', { name: 'Certify' }).click();
    const certify = page.getByRole('dialog', { name: /Certify PV-07/ });
    expect(await certify.getByLabel('Certified on').inputValue()).toBe(today);
    await certify.getByRole('button', { name: 'Certify qualification' }).click();
    await certify.waitFor({ state: 'hidden' });
    await page.getByText('Certified.').waitFor();

    // The welder file: the new qualification with its ranges, status and the WPQ PDF.
    await page.getByRole('link', { name: 'See it in the welder file' }).click();
    await page.getByRole('heading', { name: 'Qualifications' }).waitFor();
    const qualification = page.getByRole('article', { name: 'Qualification ASME IX · SMAW · uphill' }).filter({ hasText: `Certified on ${formatDay(today, 'long')}` }).first();
    await qualification.getByText('Current', { exact: true }).waitFor();
    await qualification.getByText(/days left · lapses on/).waitFor();
    await qualification.getByText('F, V (flat, vertical)').first().waitFor();
    const [download] = await Promise.all([page.waitForEvent('download'), qualification.getByRole('link', { name: 'Download the WPQ PDF' }).click()]);
    const pdfPath = await download.path();
    const pdf = await readFile(pdfPath);
    expect(pdf.subarray(0, 4).toString('latin1')).toBe('%PDF');
    expect(pdf.byteLength).toBeGreaterThan(5_000);
    // The photo is listed with the welder's files.
    await page.getByRole('link', { name: 'side-bend-1.png' }).first().waitFor();

    // The verify link printed on the card, reissued and shown once. The panel shows the link in force, so
    // a demo welder who already has one shows the old link until the reissue lands: wait for the new one.
    const link = page.getByTestId('verify-url');
    const issueButton = page.getByRole('button', { name: /^(Issue|Reissue) verify link$/ });
    await issueButton.waitFor(); // the panel has read the link in force
    const before = (await link.count()) > 0 ? await link.getAttribute('href') : null;
    await issueButton.click();
    await page.getByRole('dialog', { name: /verify link/ }).getByRole('button', { name: /^(Issue|Reissue) link$/ }).click();
    await expect.poll(() => link.getAttribute('href'), { timeout: 15_000 }).not.toBe(before);
    verifyUrl = (await link.getAttribute('href')) ?? '';
    expect(verifyUrl).toMatch(/\/verify\/[A-Za-z0-9_-]{40,}$/);

    await signOut(page);
    expect(pageErrors(page)).toEqual([]);
    await context.close();
  }, 120_000);

  it('QA manager: attaches the WPS document, meets a concurrent edit as a plain conflict, and supersedes after confirming', async () => {
    const number = `E2E-DOC-${runId}`;
    const pdfPath = path.join(dir, `${number}.pdf`);
    await writeFile(pdfPath, tinyPdf());
    const { page, context } = await newSession(browser);
    await signIn(page, demo.qa.email);
    await page.goto('/procedures');
    await page.getByRole('button', { name: 'Add WPS' }).click();
    const add = page.getByRole('dialog', { name: 'Add a WPS' });
    await add.getByLabel('WPS number').fill(number);
    await add.getByLabel('Revision').fill('1');
    await add.getByLabel('Code').selectOption('aws-d1.1');
    await add.getByLabel('FCAW').check();
    await add.getByLabel('WPS document').setInputFiles(pdfPath);
    await add.getByRole('link', { name: `${number}.pdf` }).waitFor();
    await add.getByRole('button', { name: 'Add WPS' }).click();
    await add.waitFor({ state: 'hidden' });
    const row = page.getByRole('row', { name: new RegExp(number) });
    const [download] = await Promise.all([page.waitForEvent('download'), row.getByRole('link', { name: /Download/ }).click()]);
    expect(download.suggestedFilename()).toBe(`${number}.pdf`);
    expect((await readFile(await download.path())).subarray(0, 5).toString('latin1')).toBe('%PDF-');

    // Someone else saves the same WPS while the editor is open: the second save is refused, not lost.
    await row.getByRole('button', { name: `Edit ${number} rev 1` }).click();
    const edit = page.getByRole('dialog', { name: `Edit ${number} rev 1` });
    await edit.getByLabel('Notes').fill('mine');
    const listed = await page.request.get(`/api/procedures?q=${number}`);
    const id = ((await listed.json()) as { items: Array<{ id: string }> }).items[0]?.id ?? '';
    expect((await page.request.patch(`/api/procedures/${id}`, { data: { notes: 'theirs', version: 1 } })).status()).toBe(200);
    await edit.getByRole('button', { name: 'Save changes' }).click();
    await edit.getByText(/Someone else changed this WPS since you opened it/).waitFor();
    await edit.getByRole('button', { name: 'Close' }).click();

    await page.reload();
    await row.getByRole('button', { name: `Supersede ${number} rev 1` }).click();
    const confirm = page.getByRole('dialog', { name: `Supersede ${number} rev 1?` });
    await confirm.getByRole('button', { name: 'Supersede' }).click();
    await confirm.waitFor({ state: 'hidden' });
    // Active WPSs are the default view; the superseded one is under Status: All, marked as such.
    await expect.poll(() => page.getByRole('row', { name: new RegExp(number) }).count()).toBe(0);
    await page.getByLabel('Status').selectOption('all');
    await page.getByRole('row', { name: new RegExp(number) }).getByText('Superseded').waitFor();
    expect(pageErrors(page)).toEqual([]);
    await context.close();
  });

  it('welder: sees the new qualification on My qualifications', async () => {
    const { page, context } = await newSession(browser);
    await signIn(page, demo.welder.email);
    await page.waitForURL((url) => url.pathname === '/my-qualifications');
    const mine = page.getByRole('article', { name: 'Qualification ASME IX · SMAW · uphill' }).filter({ hasText: `Certified on ${formatDay(today, 'long')}` }).first();
    await mine.getByText('Current', { exact: true }).waitFor();
    await mine.getByRole('link', { name: 'Download the WPQ PDF' }).waitFor();
    await page.getByRole('link', { name: 'Download my wallet card (PDF)' }).waitFor();
    await page.getByText(/Ask your QA manager/).waitFor();
    await signOut(page);
    expect(pageErrors(page)).toEqual([]);
    await context.close();
  });

  it('inspector: the verify link opens without signing in and shows the welder current today', async () => {
    expect(verifyUrl).not.toBe('');
    const { page, context } = await newSession(browser, { width: 420, height: 860 });
    await page.goto(new URL(verifyUrl).pathname);
    await page.getByRole('heading', { name: demo.welder.name }).waitFor();
    await page.getByText(demo.welder.stamp, { exact: true }).waitFor();
    await page.getByText(`Status as of ${formatDay(today, 'long')}`).waitFor();
    await page.getByText('Current', { exact: true }).first().waitFor();
    expect(await page.getByRole('button', { name: 'Sign out' }).count()).toBe(0);
    expect(new URL(page.url()).pathname).toBe(new URL(verifyUrl).pathname);
    await page.screenshot({ path: '/tmp/beadroll-verify.png', fullPage: true });

    // A token that was never issued is not found — not reported as a revoked card.
    await page.goto('/verify/not-a-real-token-0000000000000000000000000');
    await page.getByText('No card was found for this link').waitFor();
    expect(await page.getByText('This card is no longer valid').count()).toBe(0);
    expect(pageErrors(page)).toEqual([]);
    await context.close();
  });
});
