// Journey: each demo role signs in, sees its own navigation and none of the others' screens, signs out.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, newSession, pageErrors } from '../support/browser.js';
import { demo, mainNavigation, signIn, signOut } from '../support/e2e-demo.js';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe('signing in as each demo role', () => {
  it('refuses a wrong password with a message and stays on the sign-in page', async () => {
    const { page, context } = await newSession(browser);
    await page.goto('/sign-in');
    await page.getByLabel('E-mail').fill(demo.qa.email);
    await page.getByLabel('Password', { exact: true }).fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => page.getByRole('alert').textContent()).toContain('E-mail or password is wrong');
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await context.close();
  });

  it('QA manager: Overview · Welders · Continuity log · Coupons · Procedures · Shops · People · Lapse watch · Settings · Audit trail, each screen opens, sign-out ends the session', async () => {
    const { page, context } = await newSession(browser);
    await signIn(page, demo.qa.email);
    expect(await mainNavigation(page)).toEqual(['Overview', 'Welders', 'Continuity log', 'Weld log', 'Crew finder', 'Coupons', 'Procedures', 'Shops', 'People', 'Lapse watch', 'Reports', 'Imports', 'Settings', 'API tokens', 'Audit trail']);
    await page.getByRole('heading', { name: 'Overview' }).waitFor();
    await page.getByRole('banner').getByText(demo.qa.name, { exact: true }).waitFor();

    const nav = page.getByRole('navigation', { name: 'Main' });
    await nav.getByRole('link', { name: 'Shops' }).click();
    await page.getByRole('cell', { name: 'Vessel Bay', exact: true }).waitFor();
    await nav.getByRole('link', { name: 'People' }).click();
    await page.getByRole('cell', { name: demo.foreman.email, exact: true }).waitFor();
    await nav.getByRole('link', { name: 'Audit trail' }).click();
    await page.getByRole('heading', { name: 'Audit trail' }).waitFor();
    await nav.getByRole('link', { name: 'Coupons' }).click();
    await page.getByRole('heading', { name: 'Coupons' }).waitFor();
    await nav.getByRole('link', { name: 'Procedures' }).click();
    await page.getByRole('heading', { name: 'Procedures' }).waitFor();
    await nav.getByRole('link', { name: 'Continuity log' }).click();
    await page.getByRole('heading', { name: 'Continuity log' }).waitFor();
    await nav.getByRole('link', { name: 'Lapse watch' }).click();
    await page.getByRole('heading', { name: 'Lapse watch' }).waitFor();
    await nav.getByRole('link', { name: 'Settings' }).click();
    await page.getByRole('heading', { name: 'Settings' }).waitFor();
    await nav.getByRole('link', { name: 'Welders' }).click();
    await page.getByRole('columnheader', { name: 'Stamp' }).waitFor();

    await signOut(page);
    // The session is gone: a signed-in address sends the visitor back to sign in, keeping the way back.
    await page.goto('/welders');
    await page.waitForURL((url) => url.pathname === '/sign-in');
    expect(new URL(page.url()).searchParams.get('redirect')).toBe('/welders');
    expect(pageErrors(page).join('\n')).toBe('');
    await context.close();
  });

  it("foreman: Overview · Welders · Continuity log · Procedures, the QA manager's screens refuse, and only their two shops' welders show", async () => {
    const { page, context } = await newSession(browser);
    await signIn(page, demo.foreman.email);
    expect(await mainNavigation(page)).toEqual(['Overview', 'Welders', 'Continuity log', 'Weld log', 'Crew finder', 'Procedures']);

    for (const [path, heading] of [
      ['/shops', 'Shops'],
      ['/people', 'People'],
      ['/audit', 'Audit trail'],
      ['/coupons', 'Coupons'],
      ['/coupons/new', 'Record a coupon'],
    ] as const) {
      await page.goto(path);
      await page.getByRole('heading', { name: heading }).waitFor();
      await page.getByText('Not available for your role').waitFor();
      expect(await page.getByRole('table').count()).toBe(0);
    }

    await page.goto('/welders?pageSize=100');
    await page.getByRole('columnheader', { name: 'Home shop' }).waitFor();
    await page.locator('tbody tr td:nth-child(3)').first().waitFor();
    const shopOptions = (await page.getByLabel('Shop', { exact: true }).locator('option').allTextContents()).map((t) => t.trim());
    expect(shopOptions[0]).toBe('All shops');
    expect(shopOptions.slice(1).sort()).toEqual(['PV · Vessel Bay', 'ST · Structural Hall']);
    const homeShops = await page.locator('tbody tr td:nth-child(3)').allTextContents();
    expect(homeShops.length).toBeGreaterThan(0);
    for (const shop of homeShops) expect(shop).toMatch(/Vessel Bay|Structural Hall/);

    await signOut(page);
    expect(pageErrors(page)).toEqual([]);
    await context.close();
  });

  it('welder: My qualifications and their own Welder file, nothing else', async () => {
    const { page, context } = await newSession(browser);
    await signIn(page, demo.welder.email);
    await page.waitForURL((url) => url.pathname === '/my-qualifications');
    expect(await mainNavigation(page)).toEqual(['My qualifications', 'Welder file']);
    await page.getByRole('heading', { name: 'My qualifications' }).waitFor();
    await page.getByText(/Ask your QA manager/).waitFor();

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Welder file' }).click();
    await page.getByRole('heading', { name: new RegExp(`${demo.welder.stamp}.*${demo.welder.name}`) }).waitFor();
    expect(await page.getByRole('button', { name: 'Edit' }).count()).toBe(0);
    expect(await page.getByText('History of this record').count()).toBe(0);

    await page.goto('/welders');
    await page.getByText('Not available for your role').waitFor();
    expect(await page.getByRole('table').count()).toBe(0);
    await page.goto('/people');
    await page.getByText('Not available for your role').waitFor();

    await signOut(page);
    expect(pageErrors(page)).toEqual([]);
    await context.close();
  });
});
