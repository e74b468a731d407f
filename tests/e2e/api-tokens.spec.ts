// The QA manager gives another system a key: an API token, read-only and limited to one shop, shown once;
// the system reads welders with it (curl, as an integrator would); the list shows its last use; revoking
// it (confirmed) stops it at once.
import { execFile } from 'node:child_process';
import { promisify } from 'node:util';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { baseUrl, launchBrowser, newSession, pageErrors } from '../support/browser.js';
import { demo, signIn } from '../support/e2e-demo.js';

const run = promisify(execFile);
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** GET with the token as curl sends it; the status code and body. */
async function curl(token: string, path: string): Promise<{ status: number; body: string }> {
  const { stdout } = await run('curl', ['-s', '-w', '\n%{http_code}', '-H', `Authorization: Bearer ${token}`, `${baseUrl()}${path}`]);
  const i = stdout.lastIndexOf('\n');
  return { status: Number(stdout.slice(i + 1)), body: stdout.slice(0, i) };
}

describe('API tokens', () => {
  it('creates a read-only token for one shop, shown once; curl reads that shop’s welders; last use is listed; revoking stops it', async () => {
    const name = `ERP sync ${Date.now().toString(36)}`;
    const { page, context } = await newSession(browser);
    await signIn(page, demo.qa.email);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'API tokens' }).click();
    await page.getByRole('heading', { name: 'API tokens' }).waitFor();
    const form = page.getByRole('form', { name: 'New API token' });
    // Nothing typed: the name is asked for at its field.
    await form.getByRole('button', { name: 'Create token' }).click();
    await form.getByLabel('Name (what uses it)').fill(name);
    await form.getByLabel('Read only').check();
    await form.getByLabel(/Vessel Bay/).check();
    await form.getByRole('button', { name: 'Create token' }).click();
    const secret = (await page.getByLabel('Token secret').textContent())!.trim();
    expect(secret.length).toBeGreaterThan(20);

    const row = page.getByRole('row', { name: new RegExp(name) });
    await row.getByRole('cell', { name: 'Read only' }).waitFor();
    await row.getByRole('cell', { name: 'never' }).waitFor();

    const read = await curl(secret, '/api/welders?pageSize=100');
    expect(read.status).toBe(200);
    const welders = (JSON.parse(read.body) as { items: { homeShop: { name: string } | null }[] }).items;
    expect(welders.length).toBeGreaterThan(0);
    expect(new Set(welders.map((w) => w.homeShop?.name))).toEqual(new Set(['Vessel Bay']));
    // Read-only: a write is refused.
    const { stdout: write } = await run('curl', ['-s', '-o', '/dev/null', '-w', '%{http_code}', '-X', 'POST', '-H', `Authorization: Bearer ${secret}`, '-H', 'Content-Type: application/json', '-d', '{}', `${baseUrl()}/api/shops`]);
    expect(write).toBe('403');

    // Shown once: after a reload the secret is gone, the last use is there.
    await page.reload();
    await page.getByRole('heading', { name: 'API tokens' }).waitFor();
    expect(await page.getByLabel('Token secret').count()).toBe(0);
    await expect.poll(async () => (await page.getByRole('row', { name: new RegExp(name) }).textContent()) ?? '').not.toMatch(/never\s*Revoke/);

    await page.getByRole('button', { name: `Revoke ${name}` }).click();
    const dialog = page.getByRole('dialog', { name: `Revoke “${name}”?` });
    await dialog.getByRole('button', { name: 'Cancel' }).click();
    expect((await curl(secret, '/api/welders')).status).toBe(200);
    await page.getByRole('button', { name: `Revoke ${name}` }).click();
    await dialog.getByRole('button', { name: 'Revoke token' }).click();
    await page.getByRole('row', { name: new RegExp(name) }).getByText(/Revoked/).waitFor();
    expect((await curl(secret, '/api/welders')).status).toBe(401);
    expect(pageErrors(page).join('\n')).toBe('');
    await context.close();
  });
});
