// The examinations a coupon can take, recorded by a QA manager in Chromium and judged live and again by
// the server: a 6G pipe coupon short of bends is shown incomplete and refused; radiography in place of
// bends is judged by its indications and accepted; a fillet coupon is judged by its fillet weld break and
// macro-etch. Each saved coupon shows its examination part by part.
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

const verdictOf = (page: Page) => page.getByRole('region', { name: 'Evaluation' });

/** The form with the demo welder PV-07, ASME IX, SMAW on WPS HPF-S101 rev 3, the examiner named. */
async function startCoupon(page: Page) {
  await signIn(page, demo.qa.email);
  await page.goto('/coupons/new');
  await page.getByRole('heading', { name: 'Record a coupon' }).waitFor();
  await page.getByLabel('Welder').selectOption({ label: `${demo.welder.stamp} · ${demo.welder.name}` });
  await page.getByLabel('Code').selectOption('asme-ix');
  await page.getByLabel('Process').selectOption('SMAW');
  await page.getByLabel('WPS', { exact: true }).selectOption({ label: 'HPF-S101 rev 3' });
  await page.getByLabel('Examiner name').fill('Test Examiner');
}

describe('the examinations of a coupon', () => {
  it('shows a 6G pipe coupon on one face and one root bend as incomplete, never Accept, and the server refuses it (from memory: ASME IX QW-452.1(a), four bends for 6G)', async () => {
    const { page } = await newSession(browser, { width: 1366, height: 1000 });
    const errors = pageErrors(page);
    await startCoupon(page);
    await page.getByLabel('Plate or pipe').selectOption('pipe');
    await page.getByLabel('Test position').selectOption('6G');
    await page.getByLabel('Backing').selectOption('without');
    await page.getByLabel('NPS').fill('2');
    await page.getByLabel('Schedule').fill('80');
    await page.getByLabel('Vertical progression').selectOption('uphill');
    await page.getByLabel('Visual examination').selectOption('accept');
    // The proposal is two face and two root bends; the QA manager records only one of each.
    await page.getByRole('group', { name: 'Specimen 4 (root)' }).waitFor();
    await page.getByRole('button', { name: 'Remove Specimen 4 (root)' }).click();
    await page.getByRole('button', { name: 'Remove Specimen 2 (face)' }).click();
    await page.getByRole('checkbox', { name: 'Specimen 1 (face) examined' }).check();
    await page.getByRole('checkbox', { name: 'Specimen 2 (root) examined' }).check();
    await verdictOf(page).getByText(/incomplete/i).first().waitFor();
    await verdictOf(page).getByText(/QW-452\.1/).first().waitFor();
    expect(await verdictOf(page).getByText('Accept', { exact: true }).count()).toBe(0);

    await page.getByRole('button', { name: 'Save coupon' }).click();
    await page.getByText(/The examination the code calls for is incomplete/).first().waitFor();
    expect(new URL(page.url()).pathname).toBe('/coupons/new');
    expect(errors).toEqual([]);
  });

  it('accepts radiography in place of bends, judged by its indications, and shows it on the coupon (from memory: ASME IX QW-191.1.2.2, rounded indications up to 1/8 in or 20 % of t)', async () => {
    const { page } = await newSession(browser, { width: 1366, height: 1000 });
    const errors = pageErrors(page);
    await startCoupon(page);
    await page.getByLabel('Test position').selectOption('3G');
    await page.getByLabel('Backing').selectOption('with');
    await page.getByLabel('Coupon thickness').fill('3/8');
    await page.getByLabel('Vertical progression').selectOption('uphill');
    await page.getByLabel('Visual examination').selectOption('accept');
    await page.getByLabel('Examined by').selectOption('radiography');
    await page.getByRole('button', { name: 'Add an indication' }).click();
    await page.getByLabel('Type of indication 1').selectOption('rounded');
    await page.getByLabel('Size of indication 1').fill('1/16');
    await verdictOf(page).getByText('Not yet examined').waitFor();
    await page.getByRole('checkbox', { name: /Radiographs examined/ }).check();
    await verdictOf(page).getByText('Accept', { exact: true }).waitFor();
    // A crack of any size rejects; measured again as rounded, it is Accept again.
    await page.getByLabel('Type of indication 1').selectOption('crack');
    await verdictOf(page).getByText('Reject', { exact: true }).waitFor();
    await verdictOf(page).getByText('QW-191.1.2.2').first().waitFor();
    await page.getByLabel('Type of indication 1').selectOption('rounded');
    await verdictOf(page).getByText('Accept', { exact: true }).waitFor();
    await page.getByLabel('Examination report number').fill('RT-E2E-1');

    await page.getByRole('button', { name: 'Save coupon' }).click();
    await page.waitForURL(/\/coupons\/[0-9a-f-]{36}$/);
    await page.getByRole('region', { name: 'Stored verdict' }).getByText('Accept', { exact: true }).waitFor();
    const rt = page.getByRole('region', { name: 'Radiography' });
    await rt.getByText('Accept', { exact: true }).waitFor();
    await rt.getByText(/Rounded indication \(porosity\), 1\/16 in/).waitFor();
    await rt.getByText('RT-E2E-1').waitFor();
    expect(await page.getByRole('region', { name: 'Guided bend tests' }).count()).toBe(0);
    expect(errors).toEqual([]);
  });

  it('judges a fillet coupon by its fillet weld break and macro-etch (from memory: ASME IX QW-182, QW-184)', async () => {
    const { page } = await newSession(browser, { width: 1366, height: 1000 });
    const errors = pageErrors(page);
    await startCoupon(page);
    await page.getByLabel('Groove or fillet').selectOption('fillet');
    await page.getByLabel('Test position').selectOption('2F');
    await page.getByLabel('Backing').selectOption('with');
    await page.getByLabel('Coupon thickness').fill('3/8');
    await page.getByLabel('Visual examination').selectOption('accept');
    expect(await page.getByLabel('Examined by').count()).toBe(0);
    await verdictOf(page).getByText(/fillet weld break examined/).waitFor();

    const brk = page.getByRole('group', { name: 'Fillet weld break' });
    await brk.getByLabel('Bent flat upon itself without fracture').selectOption('no');
    await brk.getByLabel('Inclusions and pores on the fracture').fill('1/16, 1/8');
    await brk.getByLabel('Fillet weld break examined').check();
    const macro = page.getByRole('group', { name: 'Macro-etch' });
    await macro.getByLabel('Complete fusion on the etched section').selectOption('yes');
    await macro.getByLabel('First leg').fill('3/8');
    await macro.getByLabel('Second leg').fill('5/16');
    await macro.getByLabel('Macro-etch examined').check();
    await verdictOf(page).getByText('Accept', { exact: true }).waitFor();
    // A crack on the fracture rejects, with its clause.
    await brk.getByLabel('Crack on the fracture surface').check();
    await verdictOf(page).getByText('Reject', { exact: true }).waitFor();
    await verdictOf(page).getByText('QW-181.2, QW-182').first().waitFor();
    await brk.getByLabel('Crack on the fracture surface').uncheck();
    await verdictOf(page).getByText('Accept', { exact: true }).waitFor();

    await page.getByRole('button', { name: 'Save coupon' }).click();
    await page.waitForURL(/\/coupons\/[0-9a-f-]{36}$/);
    await page.getByRole('region', { name: 'Fillet weld break' }).getByText('Accept', { exact: true }).waitFor();
    await page.getByRole('region', { name: 'Macro-etch' }).getByText(/3\/8 in .* and 5\/16 in/).waitFor();
    expect(errors).toEqual([]);
  });
});
