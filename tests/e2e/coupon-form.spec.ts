// The coupon form's rough edges, as a QA manager meets them in Chromium: choosing a WPS fills the base
// metal P-Nos. and the F-No.; a plate coupon is offered only plate positions; a typing slip in a size is
// refused at its field (and by the API, through the same schema); the live verdict says "Not yet
// examined" until the visual examination and every specimen are examined; in-house criteria only add to the code's.
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
const optionValues = async (page: Page, label: string) =>
  (await page.getByLabel(label, { exact: true }).locator('option').evaluateAll((os) => os.map((o) => (o as HTMLOptionElement).value))).filter(Boolean);

describe('the coupon form', () => {
  it('fills from the WPS, offers only what fits a plate, refuses implausible sizes and waits for every specimen to be examined', async () => {
    const { page } = await newSession(browser, { width: 1366, height: 1000 });
    const errors = pageErrors(page);
    await signIn(page, demo.qa.email);
    await page.goto('/coupons/new');
    await page.getByRole('heading', { name: 'Record a coupon' }).waitFor();

    await page.getByLabel('Welder').selectOption({ index: 1 });
    await page.getByLabel('Code').selectOption('asme-ix');
    await page.getByLabel('Process').selectOption('SMAW');
    // The demo register's HPF-S101 rev 3 states P-No. 1 and F-No. 4.
    await page.getByLabel('WPS', { exact: true }).selectOption({ label: 'HPF-S101 rev 3' });
    expect(await page.getByLabel('Base metal P-Nos.').inputValue()).toBe('1');
    expect(await page.getByLabel('F-No.').inputValue()).toBe('4');

    // Plate: no pipe positions (5G, 6G); pipe: no 3G or 4G (ASME IX QW-461 test positions, from memory).
    const plate = await optionValues(page, 'Test position');
    expect(plate).toEqual(expect.arrayContaining(['1G', '2G', '3G', '4G', '3G+4G']));
    for (const pipeOnly of ['5G', '6G', '6GR', '2G+5G']) expect(plate).not.toContain(pipeOnly);
    await page.getByLabel('Plate or pipe').selectOption('pipe');
    const pipe = await optionValues(page, 'Test position');
    expect(pipe).toEqual(expect.arrayContaining(['1G', '2G', '5G', '6G', '2G+5G']));
    for (const plateOnly of ['3G', '4G', '3G+4G']) expect(pipe).not.toContain(plateOnly);
    await page.getByLabel('Plate or pipe').selectOption('plate');
    await page.getByLabel('Test position').selectOption('1G');
    await page.getByLabel('Backing').selectOption('with');

    // Typing slips are refused with the field named (common practice (no source) bounds from @beadroll/rules).
    const thickness = page.getByLabel('Coupon thickness');
    await thickness.fill('99999999');
    await page.getByText('The coupon thickness of 99999999 in is not a plausible size: enter 0.01 in to 12 in').waitFor();
    expect(await thickness.getAttribute('aria-invalid')).toBe('true');
    await thickness.fill('0');
    await page.getByText(/The coupon thickness of 0 in is not a plausible size/).waitFor();
    await thickness.fill('1/4');
    await page.getByText('Reads as 1/4 in (6.35 mm)').waitFor();

    // The code's criteria always apply; in-house criteria only in addition, in the trade's words.
    const criteria = await page.getByLabel('In-house criteria').locator('option').allTextContents();
    expect(criteria).toEqual(["None: the code's criteria only", "Shop practice, in addition to the code's"]);
    for (const c of criteria) expect(c).not.toMatch(/asme-ix|shop-general/);

    // Under 3/8 in: a face and a root bend are proposed; nothing is judged yet.
    await page.getByRole('group', { name: 'Specimen 2 (root)' }).waitFor();
    await verdictOf(page).getByText('Not yet examined').waitFor();
    await verdictOf(page).getByText('Record the visual examination; it comes first.').waitFor();
    await page.getByLabel('Visual examination').selectOption('accept');
    await verdictOf(page).getByText(/Specimen 1 \(face\) is not/).waitFor();
    await page.getByRole('checkbox', { name: 'Specimen 1 (face) examined' }).check();
    await verdictOf(page).getByText(/Specimen 2 \(root\) is not/).waitFor();
    expect(await verdictOf(page).getByText('Accept', { exact: true }).count()).toBe(0);
    await page.getByRole('checkbox', { name: 'Specimen 2 (root) examined' }).check();
    await verdictOf(page).getByText('Accept', { exact: true }).waitFor();
    expect(await verdictOf(page).getByText('Not yet examined').count()).toBe(0);

    // A zero-size discontinuity is a slip too.
    await page.getByRole('button', { name: 'Add a discontinuity to Specimen 1 (face)' }).click();
    await page.getByLabel('Size of Specimen 1 (face), discontinuity 1').fill('0');
    await page.getByText(/A discontinuity of 0 in is not a plausible size/).first().waitFor();
    expect(errors).toEqual([]);
  });
});
