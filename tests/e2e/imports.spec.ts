// The QA manager brings paper WPQs and a continuity spreadsheet in: choose the kind, upload, the columns
// mapped from their headers, check (the dry run's report, row by row), commit with its progress, and
// settle a paper record whose stated ranges differ from the rules'.
import { readFileSync } from 'node:fs';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, newSession, pageErrors } from '../support/browser.js';
import { demo, signIn } from '../support/e2e-demo.js';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function uploadFile(page: Page, kind: string, name: string, mimeType: string, buffer: Buffer) {
  await page.goto('/imports');
  await page.getByLabel('What the file holds').selectOption({ label: kind });
  await page.getByLabel('File', { exact: true }).setInputFiles({ name, mimeType, buffer });
  await page.getByRole('button', { name: 'Upload' }).click();
  await page.getByRole('heading', { name: `Columns of ${name}` }).waitFor();
}

async function checkAndCommit(page: Page) {
  await page.getByLabel('How the file writes dates').selectOption('iso');
  await page.getByRole('button', { name: 'Check the file' }).click();
  await page.getByRole('heading', { name: 'Check report' }).waitFor();
  page.once('dialog', (d) => void d.accept());
  await page.getByRole('button', { name: 'Commit' }).click();
  await page.getByText('Committed: the records are in the registry.').waitFor({ timeout: 60_000 });
}

const day = (daysAgo: number) => new Date(Date.now() - daysAgo * 86_400_000).toISOString().slice(0, 10);

describe('imports', () => {
  it('imports a paper WPQ whose stated positions differ, reports a bad row first, and settles the difference by narrowing', async () => {
    const { page, context } = await newSession(browser);
    await signIn(page, demo.qa.email);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Imports' }).click();
    const tested = day(100 + (Date.now() % 300));
    const header = 'Stamp,Code,Process,Test date,WPS,Plate or pipe,Groove or fillet,Test position,Thickness,Backing,F-No.,Paper: groove positions';
    const bad = `${header}\nPV-07,ASME IX,SMAW,${tested},HPF-S101,plate,groove,2G,3/8 parsec,yes,4,All\n`;
    await uploadFile(page, 'Existing qualifications (paper WPQs: stamp, code, process, test date, the coupon’s variables)', 'binder.csv', 'text/csv', Buffer.from(bad));
    await expect.poll(() => page.getByLabel(/^Test position/).inputValue()).toBe('Test position');
    await page.getByLabel('How the file writes dates').selectOption('iso');
    await page.getByRole('button', { name: 'Check the file' }).click();
    const report = page.getByRole('region', { name: 'Check report' });
    await report.getByRole('cell', { name: /"3\/8 parsec" is not a length/ }).waitFor();
    expect(await page.getByRole('button', { name: 'Commit' }).isDisabled()).toBe(true);

    await uploadFile(page, 'Existing qualifications (paper WPQs: stamp, code, process, test date, the coupon’s variables)', 'binder fixed.csv', 'text/csv', Buffer.from(bad.replace('3/8 parsec', '3/8')));
    await checkAndCommit(page);
    const open = page.getByRole('region', { name: 'Paper records to settle' });
    const item = open.getByRole('listitem', { name: `PV-07 SMAW ${tested}` });
    await item.getByRole('row', { name: /Groove positions F, H All/ }).waitFor();
    await item.getByRole('button', { name: 'Narrow to what both allow' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByRole('button', { name: 'Settle' }).click();
    await dialog.getByLabel('Why (kept in the audit trail)').fill('The signed paper record governs');
    await dialog.getByRole('button', { name: 'Settle' }).click();
    await item.waitFor({ state: 'detached' });
    expect(pageErrors(page).join('\n')).toBe('');
    await context.close();
  });

  it('imports continuity from an .xlsx saved by LibreOffice Calc, with a progress bar while it commits', async () => {
    const { page, context } = await newSession(browser);
    await signIn(page, demo.qa.email);
    const xlsx = readFileSync(new URL('./fixtures/continuity-libreoffice.xlsx', import.meta.url));
    await uploadFile(page, 'Continuity history (stamp, process, date or month, job)', 'continuity-libreoffice.xlsx', 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet', xlsx);
    await page.getByLabel('How the file writes dates').selectOption('iso');
    await page.getByRole('button', { name: 'Check the file' }).click();
    await page.getByRole('heading', { name: 'Check report' }).waitFor();
    await expect.poll(async () => (await page.getByRole('region', { name: 'Check report' }).getByRole('status').textContent()) ?? '').toMatch(/ 0 with problems|rows: \d+ new/);
    page.once('dialog', (d) => void d.accept());
    await page.getByRole('button', { name: 'Commit' }).click();
    // The progress bar shows while it runs (it may be brief), then the commit is reported.
    await Promise.race([
      page.getByRole('progressbar', { name: 'Import progress' }).waitFor({ timeout: 60_000 }),
      page.getByText('Committed: the records are in the registry.').waitFor({ timeout: 60_000 }),
    ]);
    await page.getByText('Committed: the records are in the registry.').waitFor({ timeout: 60_000 });
    expect(pageErrors(page).join('\n')).toBe('');
    await context.close();
  });
});
