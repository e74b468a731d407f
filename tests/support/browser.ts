// Drives Debian's Chromium through playwright-core for the browser journeys. Each test file launches
// one browser; each journey gets a fresh context (its own cookies), so roles never leak into each other.
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';

export const CHROMIUM_PATH = '/usr/bin/chromium';
export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

export function baseUrl(): string {
  const url = process.env.E2E_BASE_URL;
  if (!url)
    throw new Error(
      'E2E_BASE_URL is not set: start Beadroll and point the browser tests at it (npm test does both).',
    );
  return url.replace(/\/$/, '');
}

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM_PATH, args: CHROMIUM_ARGS, headless: true });
}

export interface Session {
  context: BrowserContext;
  page: Page;
}

export async function newSession(
  browser: Browser,
  viewport = { width: 1366, height: 860 },
): Promise<Session> {
  const context = await browser.newContext({
    baseURL: baseUrl(),
    viewport,
    locale: 'en-GB',
    timezoneId: 'UTC',
  });
  context.setDefaultTimeout(15_000);
  const page = await context.newPage();
  const problems: string[] = [];
  page.on('pageerror', (error) => problems.push(error.message));
  errorsByPage.set(page, problems);
  const logged: string[] = [];
  page.on('console', (message) => {
    if (message.type() === 'error' || message.type() === 'warning') logged.push(`${message.type()}: ${message.text()}`);
  });
  consoleByPage.set(page, logged);
  return { context, page };
}

const errorsByPage = new WeakMap<Page, string[]>();
const consoleByPage = new WeakMap<Page, string[]>();

/**
 * Errors and warnings the browser's console showed so far, including failed requests ("Failed to load
 * resource: … 400"): a page a newcomer opens should log nothing.
 */
export function consoleProblems(page: Page): string[] {
  return consoleByPage.get(page) ?? [];
}

/** Uncaught errors the page threw so far; a journey ends by checking there were none. */
export function pageErrors(page: Page): string[] {
  return errorsByPage.get(page) ?? [];
}
