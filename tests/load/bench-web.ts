// `npm run bench:web`: Lighthouse (mobile emulation, the default) against Debian's Chromium on the
// sign-in page, each role's landing page, the coupon form and the continuity log of a running Beadroll
// (BENCH_URL, default http://127.0.0.1:$PORT, with the demo data), and the desktop time from pressing
// "Sign in" to the first screen's heading. Targets: performance ≥ 90, accessibility 100, best practices
// ≥ 95 on every page; first screen after sign-in < 1 s. Prints a table and the machine's load; exits 1
// when a target is missed. Not a test: the machine is shared, so read the figures with the load.
import { loadavg, cpus } from 'node:os';
import * as chromeLauncher from 'chrome-launcher';
import lighthouse from 'lighthouse';
import { chromium } from 'playwright-core';

const CHROMIUM = '/usr/bin/chromium';
const FLAGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];
const base = (process.env.BENCH_URL ?? `http://127.0.0.1:${process.env.PORT ?? 8080}`).replace(/\/$/, '');
const PASSWORD = 'demo-weld-2026';
const accounts = {
  qa: 'qa@beadroll-demo.example',
  foreman: 'foreman@beadroll-demo.example',
  welder: 'welder@beadroll-demo.example',
} as const;
type Who = keyof typeof accounts | null;

const pages: { name: string; path: string; who: Who }[] = [
  { name: 'sign-in', path: '/sign-in', who: null },
  { name: 'QA manager: Overview', path: '/', who: 'qa' },
  { name: 'foreman: Overview', path: '/', who: 'foreman' },
  { name: 'welder: My qualifications', path: '/my-qualifications', who: 'welder' },
  { name: 'coupon form', path: '/coupons/new', who: 'qa' },
  { name: 'continuity log', path: '/continuity', who: 'foreman' },
];

async function sessionCookie(who: Who): Promise<string | undefined> {
  if (!who) return undefined;
  const res = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: accounts[who], password: PASSWORD }),
  });
  if (!res.ok) throw new Error(`sign-in as ${accounts[who]} failed (${res.status}): is the demo data loaded?`);
  return (res.headers.get('set-cookie') ?? '').split(';')[0];
}

async function lighthouseRuns() {
  const chrome = await chromeLauncher.launch({ chromePath: CHROMIUM, chromeFlags: FLAGS });
  const rows: { name: string; performance: number; accessibility: number; bestPractices: number; lcp: number; cls: number; tbt: number }[] = [];
  try {
    for (const page of pages) {
      const cookie = await sessionCookie(page.who);
      const result = await lighthouse(
        `${base}${page.path}`,
        {
          port: chrome.port,
          output: 'json',
          logLevel: 'error',
          onlyCategories: ['performance', 'accessibility', 'best-practices'],
          extraHeaders: cookie ? { Cookie: cookie } : undefined,
          disableStorageReset: false,
        },
      );
      if (!result) throw new Error(`Lighthouse gave no result for ${page.path}`);
      const { categories, audits } = result.lhr;
      const score = (id: string) => Math.round((categories[id]?.score ?? 0) * 100);
      rows.push({
        name: page.name,
        performance: score('performance'),
        accessibility: score('accessibility'),
        bestPractices: score('best-practices'),
        lcp: audits['largest-contentful-paint']?.numericValue ?? NaN,
        cls: audits['cumulative-layout-shift']?.numericValue ?? NaN,
        tbt: audits['total-blocking-time']?.numericValue ?? NaN,
      });
    }
  } finally {
    chrome.kill();
  }
  return rows;
}

/** Desktop, no throttling: from the press of "Sign in" to the landing page's heading, median of five. */
async function firstScreenAfterSignIn(): Promise<number[]> {
  const browser = await chromium.launch({ executablePath: CHROMIUM, args: FLAGS, headless: true });
  const times: number[] = [];
  try {
    for (let i = 0; i < 5; i++) {
      const context = await browser.newContext({ viewport: { width: 1366, height: 860 } });
      const page = await context.newPage();
      await page.goto(`${base}/sign-in`);
      await page.getByLabel('E-mail').fill(accounts.qa);
      await page.getByLabel('Password').fill(PASSWORD);
      const started = performance.now();
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.getByRole('heading', { level: 1, name: 'Overview' }).waitFor();
      times.push(Math.round(performance.now() - started));
      await context.close();
    }
  } finally {
    await browser.close();
  }
  return times.sort((a, b) => a - b);
}

const load = () => `${loadavg().map((l) => l.toFixed(2)).join(' ')} on ${cpus().length} cores`;
console.log(`bench:web against ${base}, load ${load()}`);
const rows = await lighthouseRuns();
const times = await firstScreenAfterSignIn();
let ok = true;
console.log(`\nLighthouse 12, mobile emulation (load ${load()})`);
console.log('page'.padEnd(30) + 'perf'.padStart(6) + 'a11y'.padStart(6) + 'b.p.'.padStart(6) + 'LCP ms'.padStart(8) + 'TBT ms'.padStart(8) + 'CLS'.padStart(7) + '  verdict');
for (const r of rows) {
  const misses: string[] = [];
  if (r.performance < 90) misses.push('performance < 90');
  if (r.accessibility < 100) misses.push('accessibility < 100');
  if (r.bestPractices < 95) misses.push('best practices < 95');
  if (misses.length) ok = false;
  console.log(
    r.name.padEnd(30) +
      String(r.performance).padStart(6) +
      String(r.accessibility).padStart(6) +
      String(r.bestPractices).padStart(6) +
      r.lcp.toFixed(0).padStart(8) +
      r.tbt.toFixed(0).padStart(8) +
      r.cls.toFixed(3).padStart(7) +
      `  ${misses.length ? `MISS (${misses.join(', ')})` : 'ok'}`,
  );
}
const median = times[Math.floor(times.length / 2)]!;
if (median >= 1000) ok = false;
console.log(`\ndesktop, sign-in to the Overview heading: median ${median} ms (runs ${times.join(', ')}) ${median < 1000 ? 'ok' : 'MISS (≥ 1 s)'}`);
process.exit(ok ? 0 : 1);
