// The QA manager prepares the audit report for a shop and the last twelve months: the figures on screen,
// the PDF and the CSV to hand to the auditor.
import type { Browser } from 'playwright-core';
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

describe('reports', () => {
  it('shows the audit report’s figures for one shop and downloads its PDF and CSV', async () => {
    const { page, context } = await newSession(browser);
    await signIn(page, demo.qa.email);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Reports' }).click();
    const form = page.getByRole('form', { name: 'Audit report' });
    const shop = form.getByLabel('Shop');
    await shop.selectOption((await shop.locator('option', { hasText: 'Vessel Bay' }).getAttribute('value')) ?? '');
    await form.getByRole('button', { name: 'Show the report' }).click();
    const figures = page.getByRole('region', { name: 'Report figures' });
    await figures.getByRole('heading', { name: /Vessel Bay/ }).waitFor({ timeout: 30_000 });
    const welders = Number(await figures.getByText('Welders', { exact: true }).locator('xpath=following-sibling::dd').textContent());
    expect(welders).toBeGreaterThan(0);

    const pdfHref = (await figures.getByRole('link', { name: 'Download the PDF' }).getAttribute('href'))!;
    const pdf = await page.request.get(pdfHref);
    expect(pdf.status()).toBe(200);
    expect((await pdf.body()).subarray(0, 5).toString()).toBe('%PDF-');
    const csvHref = (await figures.getByRole('link', { name: 'Download the CSV' }).getAttribute('href'))!;
    const csv = await page.request.get(csvHref);
    expect(csv.status()).toBe(200);
    expect((await csv.text()).split('\r\n')[0]).toBe('section,stamp,welder,code,process,record,date,status,detail,clauses');
    expect(pageErrors(page).join('\n')).toBe('');
    await context.close();
  });
});
