// The crew finder on the demo data: the QA manager describes a 6G pipe joint (NPS 2 Sch 80, SMAW, open
// root, uphill) by keyboard, is told which field is missing first, then finds the crew in force through
// today — longest in force first, each with the qualification and the day it stays in force until — and
// the near misses with their reason and clause; the search sits in the URL. The foreman has the screen too.
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

describe('crew finder', () => {
  it('finds who may weld a 6G pipe joint, with the near misses and their clauses', async () => {
    const { page, context } = await newSession(browser);
    await signIn(page, demo.qa.email);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Crew finder' }).click();
    await page.getByRole('heading', { name: 'Crew finder' }).waitFor();
    await page.getByText('Describe the joint to find a crew').waitFor();
    const form = page.getByRole('form', { name: 'Joint to weld' });

    // Nothing of the pipe's size given: the answer names the field.
    await form.getByLabel('Process').selectOption('SMAW');
    await form.getByLabel('Position').selectOption('6G');
    await form.getByRole('button', { name: 'Find the crew' }).click();
    await page.getByRole('alert').getByText('Check the joint').waitFor({ timeout: 30_000 });
    expect(await form.getByLabel('Thickness').getAttribute('aria-invalid')).toBe('true');

    // Typed by keyboard, sent with Enter.
    await form.getByLabel('NPS').fill('2');
    await form.getByLabel('Schedule').fill('80');
    await form.getByLabel('F-No.').fill('4');
    await form.getByLabel('Backing').selectOption('without');
    await form.getByLabel('Progression').selectOption('uphill');
    await form.getByRole('group', { name: 'Quick choices for the last day' }).getByRole('button', { name: 'Today' }).click();
    await form.getByLabel('F-No.').press('Enter');

    const crew = page.getByRole('region', { name: /^Crew/ });
    await crew.getByRole('table').waitFor({ timeout: 30_000 });
    const heading = (await crew.getByRole('heading').textContent()) ?? '';
    expect(Number(/(\d+)/.exec(heading)?.[1])).toBeGreaterThan(0);
    const rows = crew.getByRole('row');
    expect(await rows.count()).toBeGreaterThan(1);
    const headers = (await crew.getByRole('columnheader').allTextContents()).map((t) => t.trim());
    expect(headers).toEqual(['Stamp', 'Name', 'Home shop', 'Qualification', 'In force until']);
    // Longest in force first.
    const until = (await crew.locator('tbody tr td:nth-child(5)').allTextContents()).map((t) => t.slice(0, 10));
    expect(until).toEqual([...until].sort().reverse());
    expect(await crew.locator('tbody tr').first().textContent()).toMatch(/ASME/);

    const near = page.getByRole('region', { name: /^Near misses/ });
    await near.getByRole('heading').waitFor();
    if ((await near.getByRole('table').count()) > 0) {
      const clause = (await near.locator('tbody tr td:nth-child(5)').first().textContent()) ?? '';
      expect(clause.trim()).not.toBe('');
    }
    await page.getByText(/responsible inspector/).first().waitFor();
    expect(page.url()).toContain('nps=2');
    expect(page.url()).toContain('position=6G');

    // The search opens the same way from its address.
    await page.reload();
    await crew.getByRole('table').waitFor({ timeout: 30_000 });
    expect(await page.getByRole('form', { name: 'Joint to weld' }).getByLabel('Schedule').inputValue()).toBe('80');
    expect(pageErrors(page).join('\n')).toBe('');
    await context.close();
  });

  it('is on the foreman’s navigation', async () => {
    const { page, context } = await newSession(browser);
    await signIn(page, demo.foreman.email);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Crew finder' }).click();
    await page.getByRole('form', { name: 'Joint to weld' }).getByLabel('Shop').waitFor();
    expect(await page.getByRole('form', { name: 'Joint to weld' }).getByLabel('Shop').locator('option').first().textContent()).toBe('All my shops');
    await context.close();
  });
});
