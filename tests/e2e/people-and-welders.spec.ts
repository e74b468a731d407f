// Journeys of the QA manager's daily work: invite a foreman and follow the e-mailed link to a first
// sign-in; add a welder and meet a concurrent edit (409) instead of overwriting it; a duplicate stamp
// is named next to the Stamp field.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { baseUrl, consoleProblems, launchBrowser, newSession, pageErrors } from '../support/browser.js';
import { demo, mainNavigation, signIn, signOut } from '../support/e2e-demo.js';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const runId = Date.now().toString(36).slice(-5).toUpperCase();

describe('people and welders', () => {
  it('invites a foreman for one shop; the e-mailed link sets a password and signs them in', async () => {
    const email = `foreman-${runId.toLowerCase()}@beadroll-demo.example`;
    const qa = await newSession(browser);
    await signIn(qa.page, demo.qa.email);
    await qa.page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'People' }).click();
    await qa.page.getByRole('button', { name: 'Invite person' }).click();
    const dialog = qa.page.getByRole('dialog', { name: 'Invite a person' });
    await dialog.getByLabel('Role').selectOption('foreman');
    await dialog.getByLabel('Name').fill(`Test Foreman ${runId}`);
    await dialog.getByLabel('E-mail').fill(email);
    // Without a shop the form says so next to the shop list, before anything is sent.
    await dialog.getByRole('button', { name: 'Send invitation' }).click();
    await dialog.getByText('Assign the foreman to at least one shop').waitFor();
    await dialog.getByLabel('ST · Structural Hall').check();
    await dialog.getByRole('button', { name: 'Send invitation' }).click();
    await dialog.waitFor({ state: 'hidden' });
    const row = qa.page.getByRole('row', { name: new RegExp(email) });
    await row.getByText('Invited').waitFor();
    expect(await row.getByRole('cell', { name: 'ST', exact: true }).count()).toBe(1);
    await signOut(qa.page);
    await qa.context.close();

    // The invitee opens the mail from the development inbox and follows the link.
    const invitee = await newSession(browser);
    const page = invitee.page;
    await page.goto('/sign-in');
    await page.getByRole('link', { name: 'Development mail' }).click();
    await page.getByRole('link', { name: new RegExp(email) }).first().click();
    const link = page.getByRole('link', { name: /\/set-password\?token=/ });
    const href = (await link.getAttribute('href')) ?? '';
    expect(href.startsWith(`${baseUrl()}/set-password?token=`) || href.includes('/set-password?token=')).toBe(true);
    await page.goto(href.slice(href.indexOf('/set-password')));
    await page.getByText(email).waitFor();
    await page.getByLabel('New password').fill('short');
    await page.getByLabel('Repeat the password').fill('short');
    await page.getByRole('button', { name: 'Set password and sign in' }).click();
    await page.getByText('Use at least 10 characters').waitFor();
    await page.getByLabel('New password').fill('shop-floor-2026');
    await page.getByLabel('Repeat the password').fill('shop-floor-2026');
    await page.getByRole('button', { name: 'Set password and sign in' }).click();
    await page.getByRole('button', { name: 'Sign out' }).waitFor();
    expect(await mainNavigation(page)).toEqual(['Overview', 'Welders', 'Continuity log', 'Weld log', 'Crew finder', 'Procedures']);
    await page.getByText('Structural Hall').first().waitFor();
    expect(await page.getByText('Vessel Bay').count()).toBe(0);

    // The link is single use.
    await page.goto(href.slice(href.indexOf('/set-password')));
    await page.getByText('This link cannot be used').waitFor();
    expect(pageErrors(page).join('\n')).toBe('');
    // Neither setting the password nor reopening the used link logs a failed request.
    expect(consoleProblems(page)).toEqual([]);
    await invitee.context.close();
  });

  it('adds a welder, names a duplicate stamp at the field, and shows a concurrent change as a conflict', async () => {
    const stamp = `E2E-${runId}`;
    const { page, context } = await newSession(browser);
    await signIn(page, demo.qa.email);
    await page.goto('/welders');
    await page.getByRole('button', { name: 'Add welder' }).click();
    const dialog = page.getByRole('dialog', { name: 'Add a welder' });
    await dialog.getByLabel('Stamp').fill(demo.welder.stamp);
    await dialog.getByLabel('Name').fill(`Test Welder ${runId}`);
    await dialog.getByLabel('Home shop').selectOption({ label: 'PV · Vessel Bay' });
    await dialog.getByRole('button', { name: 'Add welder' }).click();
    // The API's 400 names the stamp; the form shows it under the Stamp field.
    await dialog.getByText(new RegExp(`Stamp ${demo.welder.stamp} is already used`)).waitFor();
    expect(await dialog.getByLabel('Stamp').getAttribute('aria-invalid')).toBe('true');

    await dialog.getByLabel('Stamp').fill(stamp.toLowerCase());
    await dialog.getByRole('button', { name: 'Add welder' }).click();
    await page.waitForURL(/\/welders\/[0-9a-f-]{36}$/);
    await page.getByRole('heading', { name: new RegExp(stamp) }).waitFor();
    const welderId = new URL(page.url()).pathname.split('/').pop() ?? '';

    // Open the editor, then let "someone else" save first through the API with the same version.
    await page.getByRole('button', { name: 'Edit' }).click();
    const edit = page.getByRole('dialog', { name: new RegExp(`Edit ${stamp}`) });
    await edit.getByLabel('Name').fill(`Test Welder ${runId} (mine)`);
    const other = await page.request.patch(`/api/welders/${welderId}`, { data: { name: `Test Welder ${runId} (theirs)`, version: 1 } });
    expect(other.status()).toBe(200);
    await edit.getByRole('button', { name: 'Save changes' }).click();
    await edit.getByText('Someone else changed this welder; reload to see their change').waitFor();
    await edit.getByRole('button', { name: 'Reload their change' }).click();
    await expect.poll(() => edit.getByLabel('Name').inputValue()).toBe(`Test Welder ${runId} (theirs)`);
    await edit.getByLabel('Home shop').selectOption({ label: 'ST · Structural Hall' });
    await edit.getByText('Moving the welder to another home shop is recorded in the audit trail.').waitFor();
    await edit.getByRole('button', { name: 'Save changes' }).click();
    await edit.waitFor({ state: 'hidden' });
    await page.getByText('Structural Hall').first().waitFor();
    // The move shows in the record's history.
    await page.getByRole('cell', { name: 'Welder moved' }).waitFor();

    await signOut(page);
    expect(pageErrors(page).join('\n')).toBe('');
    await context.close();
  });
});
