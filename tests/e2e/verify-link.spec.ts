// A printed card or WPQ never carries a dead QR code: downloading either one never issues a verify link
// (a GET writes nothing), the panel always shows the link in force, and reissuing it warns first, naming
// the documents whose printed QR code it kills. The old link then reads "no longer valid" for an inspector.
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

interface ListedWelder {
  id: string;
  stamp: string;
  name: string;
  qualifications?: { id: string }[];
}

async function api<T>(page: Page, path: string): Promise<T> {
  return page.evaluate(async (p) => {
    const res = await fetch(p, { headers: { accept: 'application/json' } });
    return (await res.json()) as T;
  }, path);
}

async function panelState(page: Page): Promise<string | null> {
  const panel = page.getByTestId('verify-link-state');
  await panel.waitFor();
  return panel.getAttribute('data-active');
}

async function downloadBoth(page: Page): Promise<void> {
  const card = page.waitForEvent('download');
  await page.getByRole('link', { name: 'Download the wallet card (PDF)' }).click();
  await (await card).path();
  const wpq = page.waitForEvent('download');
  await page.getByRole('link', { name: 'Download the WPQ PDF' }).first().click();
  await (await wpq).path();
}

describe('verify link and printed documents', () => {
  let session: Awaited<ReturnType<typeof newSession>>;
  let w: ListedWelder;
  let first = '';

  it('downloading the card and a WPQ issues no link: the panel still says none is active', async () => {
    session = await newSession(browser);
    const { page } = session;
    await signIn(page, demo.qa.email);
    // A welder of the demo with certified qualifications and no link yet (the seed issues one for PV-07 only).
    const list = await api<{ items: ListedWelder[] }>(page, '/api/welders?pageSize=200&sort=stamp');
    let found: ListedWelder | undefined;
    for (const x of list.items.filter((y) => y.stamp !== demo.welder.stamp && (y.qualifications?.length ?? 0) > 0)) {
      if (!(await api<{ active: boolean }>(page, `/api/welders/${x.id}/verify-token`)).active) {
        found = x;
        break;
      }
    }
    expect(found, 'a demo welder with qualifications and no verify link').toBeDefined();
    w = found!;
    await page.goto(`/welders/${w.id}`);
    expect(await panelState(page)).toBe('false');
    await page.getByText('a wallet card or WPQ downloaded now prints without a QR code').waitFor();
    await downloadBoth(page);
    await page.reload();
    expect(await panelState(page)).toBe('false');
    expect((await api<{ active: boolean }>(page, `/api/welders/${w.id}/verify-token`)).active).toBe(false);
  });

  it('issues the link visibly; the panel shows the same link after downloads and a reload', async () => {
    const { page } = session;
    await page.getByRole('button', { name: 'Issue verify link' }).click();
    await page.getByRole('dialog', { name: /verify link/ }).getByRole('button', { name: 'Issue link' }).click();
    await page.getByRole('dialog').waitFor({ state: 'hidden' });
    first = (await page.getByTestId('verify-url').getAttribute('href')) ?? '';
    expect(first).toMatch(/\/verify\/[A-Za-z0-9_-]{43}$/);
    await downloadBoth(page);
    await page.reload();
    expect(await panelState(page)).toBe('true');
    expect(await page.getByTestId('verify-url').getAttribute('href')).toBe(first);
  });

  it('warns before a reissue, naming the card and each WPQ record it kills; the old link then reads no longer valid', async () => {
    const { page, context } = session;
    await page.getByRole('button', { name: 'Reissue verify link' }).click();
    const dialog = page.getByRole('dialog', { name: /Reissue .*verify link/ });
    const killed = await dialog.getByTestId('verify-killed-documents').getByRole('listitem').allTextContents();
    expect(killed[0]).toBe('the wallet card');
    expect(killed.length).toBeGreaterThanOrEqual(1 + (w.qualifications?.length ?? 0));
    expect(killed.slice(1).every((d) => d.startsWith('the WPQ record'))).toBe(true);
    await dialog.getByRole('button', { name: 'Reissue link' }).click();
    await dialog.waitFor({ state: 'hidden' });
    await expect.poll(async () => page.getByTestId('verify-url').getAttribute('href')).not.toBe(first);
    expect(pageErrors(page).join('\n')).toBe('');
    await context.close();

    const inspector = await newSession(browser);
    await inspector.page.goto(new URL(first).pathname);
    await inspector.page.getByText(/no longer valid/i).first().waitFor();
    await inspector.context.close();
  });
});
