// Journey: the QA manager works the Welders table: sorts it by clicking headers, filters it by shop and
// by text, pages through it, and the view survives a reload because it lives in the URL.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, newSession, pageErrors } from '../support/browser.js';
import { columnTexts, demo, signIn, signOut, tableSettled } from '../support/e2e-demo.js';

let browser: Browser;
let page: Page;

beforeAll(async () => {
  browser = await launchBrowser();
  ({ page } = await newSession(browser));
  await signIn(page, demo.qa.email);
});
afterAll(async () => {
  await browser?.close();
});

/** Runs `act` and waits for the welders request it causes to be answered and shown. */
async function andWaitForList(act: () => Promise<void>, check: (url: URL) => boolean = () => true): Promise<void> {
  await Promise.all([
    page.waitForResponse((r) => {
      const url = new URL(r.url());
      return url.pathname === '/api/welders' && r.request().method() === 'GET' && check(url);
    }),
    act(),
  ]);
  await tableSettled(page);
}

const search = () => new URL(page.url()).searchParams;

describe('the Welders table', () => {
  it('opens from the navigation with the columns a QA manager scans, sorted by stamp', async () => {
    await andWaitForList(() => page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Welders' }).click());
    const headers = (await page.locator('thead th').allTextContents()).map((t) => t.trim());
    // The QA manager's last column holds the Edit buttons; its header is for screen readers only.
    expect(headers).toEqual(['Stamp', 'Name', 'Home shop', 'E-mail', 'Status', 'Qualifications', 'Soonest lapse', 'Actions']);
    expect(await page.locator('thead th').last().locator('.sr-only').count()).toBe(1);
    expect(await page.getByRole('columnheader', { name: 'Stamp' }).getAttribute('aria-sort')).toBe('ascending');
    await page.getByText(/^1–25 of \d+ welders$/).waitFor();

    await page.screenshot({ path: '/tmp/beadroll-welders.png', fullPage: true });
  });

  it('sorts by stamp both ways and by name, changing the order of the rows', async () => {
    await andWaitForList(() => page.goto('/welders?pageSize=100').then(() => undefined));
    const ascending = await columnTexts(page, 'Stamp');
    expect(ascending.length).toBeGreaterThan(30);
    expect(ascending).toEqual([...ascending].sort());

    await andWaitForList(() => page.getByRole('button', { name: 'Stamp' }).click(), (u) => u.searchParams.get('dir') === 'desc');
    expect(search().get('dir')).toBe('desc');
    expect(await page.getByRole('columnheader', { name: 'Stamp' }).getAttribute('aria-sort')).toBe('descending');
    expect(await columnTexts(page, 'Stamp')).toEqual([...ascending].reverse());

    await andWaitForList(() => page.getByRole('button', { name: 'Name' }).click(), (u) => u.searchParams.get('sort') === 'name');
    expect(search().get('sort')).toBe('name');
    expect(search().get('dir')).toBeNull(); // a newly chosen column starts ascending, the default
    const byName = await columnTexts(page, 'Name');
    expect(byName).not.toEqual(await columnTexts(page, 'Stamp'));
    expect((byName[0] ?? '').localeCompare(byName.at(-1) ?? '', 'en', { sensitivity: 'base' })).toBeLessThan(0);

    await andWaitForList(() => page.getByRole('button', { name: 'Name' }).click(), (u) => u.searchParams.get('dir') === 'desc');
    expect(await columnTexts(page, 'Name')).toEqual([...byName].reverse());

    await andWaitForList(() => page.getByRole('button', { name: 'Home shop' }).click(), (u) => u.searchParams.get('sort') === 'homeShop');
    const shops = (await columnTexts(page, 'Home shop')).map((s) => s.replace(/^\S+\s+/, ''));
    // Each shop's welders come together in one block.
    const blocks = shops.filter((s, i) => i === 0 || s !== shops[i - 1]);
    expect(new Set(blocks).size).toBe(blocks.length);
    expect(blocks.length).toBe(3);
  });

  it('filters by shop and by text, and keeps the view in the URL across a reload', async () => {
    await andWaitForList(() => page.goto('/welders?pageSize=100').then(() => undefined));
    const everyone = (await columnTexts(page, 'Stamp')).length;

    await andWaitForList(() => page.getByLabel('Shop', { exact: true }).selectOption({ label: 'PV · Vessel Bay' }).then(() => undefined), (u) => u.searchParams.has('shopId'));
    const vessel = await columnTexts(page, 'Home shop');
    expect(vessel.length).toBeGreaterThan(0);
    expect(vessel.length).toBeLessThan(everyone);
    for (const shop of vessel) expect(shop).toBe('PV Vessel Bay');

    await andWaitForList(() => page.getByLabel('Search welders').fill('okonkwo'), (u) => u.searchParams.get('q') === 'okonkwo');
    expect(await columnTexts(page, 'Stamp')).toEqual([demo.welder.stamp]);
    expect(await columnTexts(page, 'Name')).toEqual([demo.welder.name]);

    await andWaitForList(() => page.reload().then(() => undefined));
    expect(await page.getByLabel('Search welders').inputValue()).toBe('okonkwo');
    expect(await page.getByLabel('Shop', { exact: true }).locator('option:checked').textContent()).toBe('PV · Vessel Bay');
    expect(await columnTexts(page, 'Stamp')).toEqual([demo.welder.stamp]);

    // Text matches stamps too: a stamp of another shop finds nothing while the shop filter holds.
    await andWaitForList(() => page.getByLabel('Search welders').fill('ST-'), (u) => u.searchParams.get('q') === 'ST-');
    await page.getByText('No welder matches these filters.').waitFor();
    await andWaitForList(() => page.getByLabel('Shop', { exact: true }).selectOption({ label: 'All shops' }).then(() => undefined), (u) => !u.searchParams.has('shopId'));
    const stamps = await columnTexts(page, 'Stamp');
    const names = await columnTexts(page, 'Name');
    expect(stamps.filter((s) => s.startsWith('ST-')).length).toBeGreaterThan(5);
    // Every row matches "st-" in its stamp or its name, ignoring case.
    stamps.forEach((stamp, i) => expect(`${stamp} ${names[i] ?? ''}`.toLowerCase()).toContain('st-'));
  });

  it('pages through the list on the server', async () => {
    await andWaitForList(() => page.goto('/welders').then(() => undefined));
    const first = await columnTexts(page, 'Stamp');
    expect(first).toHaveLength(25);
    await andWaitForList(() => page.getByRole('button', { name: 'Next page' }).click(), (u) => u.searchParams.get('page') === '2');
    const second = await columnTexts(page, 'Stamp');
    expect(second.length).toBeGreaterThan(0);
    expect(second.some((s) => first.includes(s))).toBe(false);
    expect((second[0] ?? '') > (first.at(-1) ?? '')).toBe(true);
  });

  it('signs out', async () => {
    await signOut(page);
    expect(pageErrors(page)).toEqual([]);
  });
});
