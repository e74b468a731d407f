// The demo accounts the seed creates (see README) and the steps every journey shares.
import type { Page } from 'playwright-core';

export const DEMO_PASSWORD = 'demo-weld-2026';
export const demo = {
  qa: { email: 'qa@beadroll-demo.example', name: 'Morgan Adeyemi-Clarke' },
  foreman: { email: 'foreman@beadroll-demo.example', name: 'Rowan Castellanos' },
  welder: { email: 'welder@beadroll-demo.example', name: 'Jesse Okonkwo-Lind', stamp: 'PV-07' },
} as const;

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('button', { name: 'Sign out' }).waitFor();
}

export async function signOut(page: Page): Promise<void> {
  await page.getByRole('button', { name: 'Sign out' }).click();
  await page.waitForURL((url) => url.pathname === '/sign-in');
  await page.getByRole('button', { name: 'Sign in' }).waitFor();
}

export async function mainNavigation(page: Page): Promise<string[]> {
  const nav = page.getByRole('navigation', { name: 'Main' });
  await nav.waitFor();
  return (await nav.getByRole('link').allTextContents()).map((t) => t.trim());
}

/** The texts of one column of the Welders table, in the order shown. */
export async function columnTexts(page: Page, header: string): Promise<string[]> {
  const table = page.getByRole('table');
  const headers = (await table.locator('thead th').allTextContents()).map((t) => t.trim());
  const index = headers.indexOf(header);
  if (index < 0) throw new Error(`No column "${header}" in ${headers.join(', ')}`);
  return (await table.locator(`tbody tr td:nth-child(${index + 1})`).allTextContents()).map((t) => t.trim());
}

/** Waits until the table shows the data for the current URL (no placeholder rows from the last view). */
export async function tableSettled(page: Page): Promise<void> {
  await page.getByRole('table').waitFor();
  await page.locator('table[aria-busy="true"]').waitFor({ state: 'detached' });
}
